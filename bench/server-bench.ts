/**
 * The benchmarks that need the running server (started by bench/server.sh at JP_BENCH_BASE_URL):
 * the bench page in Chromium, `/api/health` alone at 50 connections (the framework's floor),
 * `/api/v1/check` under 50 connections, and `/api/health` during a
 * flood of the worst documents the budget allows. Sets up one invented user with an API token in
 * the bench database, and writes bench/tmp/server-bench.json, which bench/run.ts adds to
 * bench/results.json.
 */
import { writeFileSync } from "node:fs";
import { loadavg } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { db } from "@/db";
import { users } from "@/db/schema";
import { createApiToken } from "@/db/queries/tokens";
import { generateToken } from "@/lib/server/tokens";
import { benchPageFigures } from "./bench-page";
import { checkLoad, healthFloor, healthUnderFlood } from "./server-load";

const here = dirname(fileURLToPath(import.meta.url));
const baseUrl = process.env.JP_BENCH_BASE_URL ?? "http://127.0.0.1:3190";

async function main() {
  const [user] = await db
    .insert(users)
    .values({ email: `bench-${Date.now()}@example.com`, name: "Bench", passwordHash: "x", siteRole: "researcher" })
    .returning();
  const { token, hash, prefix } = generateToken();
  await createApiToken({ userId: user.id, name: "bench", tokenHash: hash, prefix, expiresAt: null });

  const load = () => loadavg().map((v) => Number(v.toFixed(2)));
  const out: Record<string, unknown> = {};
  const loadBefore = load();
  out.benchPage = { ...(await benchPageFigures(baseUrl)), loadAverage: [loadBefore, load()] };
  console.log("bench page", JSON.stringify(out.benchPage));
  const beforeFloor = load();
  out.healthFloor = { ...(await healthFloor(baseUrl)), loadAverage: [beforeFloor, load()] };
  console.log("health floor", JSON.stringify(out.healthFloor));
  const before = load();
  out.checkApi = { ...(await checkLoad(baseUrl, token)), loadAverage: [before, load()] };
  console.log("check API", JSON.stringify(out.checkApi));
  const beforeFlood = load();
  out.healthUnderFlood = { ...(await healthUnderFlood(baseUrl, token)), loadAverage: [beforeFlood, load()] };
  console.log("health under flood", JSON.stringify(out.healthUnderFlood));
  out.measuredAt = new Date().toISOString();
  writeFileSync(join(here, "tmp", "server-bench.json"), JSON.stringify(out, null, 2) + "\n");
  process.exit(0);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
