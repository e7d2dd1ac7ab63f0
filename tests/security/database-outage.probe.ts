/**
 * The test cluster the server uses, stopped and started again while a save loop runs against the
 * real server: every acknowledged save (201) is stored with the note it was sent with; every other
 * answer is a refusal the client can act on (503 with Retry-After while the database is away, or
 * 409 when a save whose answer was lost did commit); the server answers again by itself afterwards.
 * The cluster is stopped the way scripts/lib.sh stops it (pg_ctl -m fast, as the postgres user
 * when run as root), with PGBIN, PG_ROOT and PG_PORT as scripts/test.sh exported them.
 */
import "./_env";
import { execFileSync } from "node:child_process";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "@/db";
import { planVersions } from "@/db/schema";
import { demoArm, gentlePlan, http, makeUser, tokenFor, type Auth } from "./_probe";

const { PGBIN, PG_ROOT, PG_PORT } = process.env;
let auth: Auth;
let planId = "";
let stopped = false;

function pgCtl(...args: string[]): void {
  if (!PGBIN || !PG_ROOT || !PG_PORT)
    throw new Error("this probe needs PGBIN, PG_ROOT and PG_PORT from scripts/test.sh (run it through npm test)");
  const command = [`${PGBIN}/pg_ctl`, "-D", `${PG_ROOT}/pg`, ...args];
  const asRoot = process.getuid?.() === 0;
  execFileSync(asRoot ? "runuser" : command[0], asRoot ? ["-u", "postgres", "--", ...command] : command.slice(1), {
    stdio: "ignore",
    timeout: 60_000,
  });
}
const stopCluster = () => {
  pgCtl("-m", "fast", "-w", "-t", "30", "stop");
  stopped = true;
};
const startCluster = () => {
  pgCtl(
    "-l",
    `${PG_ROOT}/pg.log`,
    "-w",
    "-t",
    "30",
    "-o",
    `-c listen_addresses=127.0.0.1 -p ${PG_PORT} -c unix_socket_directories=${PG_ROOT}/run`,
    "start",
  );
  stopped = false;
};

/** A query through this process's own pool, retried while its old connections are discarded. */
async function retry<T>(fn: () => Promise<T>): Promise<T> {
  for (let i = 0; ; i++) {
    try {
      return await fn();
    } catch (err) {
      if (i >= 20) throw err;
      await new Promise((r) => setTimeout(r, 250));
    }
  }
}

beforeAll(async () => {
  const u = await makeUser("researcher", "outage");
  auth = { bearer: await tokenFor(u.id) };
  const project = await http("/api/v1/projects", { auth, json: { name: "Outage probe" } });
  const projectId = (project.body as { project: { id: string } }).project.id;
  const plan = await http(`/api/v1/projects/${projectId}/plans`, {
    auth,
    json: { name: "Saved through an outage", armId: demoArm.id },
  });
  planId = (plan.body as { plan: { id: string } }).plan.id;
});

afterAll(() => {
  // never leave the cluster down for the tests that follow
  if (stopped) startCluster();
});

describe("database stopped and started during a save loop", () => {
  it("every acknowledged save is stored; every other answer is 503 with Retry-After or 409; saves succeed again afterwards", async () => {
    const acknowledged: { number: number; note: string }[] = [];
    const statuses = new Map<number, number>();
    const unexpected: string[] = [];
    let base = 0;
    let savesAfterRestart = 0;
    const state: { phase: "before" | "down" | "after" } = { phase: "before" };
    let slowestMs = 0;

    const outage = (async () => {
      await new Promise((r) => setTimeout(r, 1500));
      stopCluster();
      state.phase = "down";
      await new Promise((r) => setTimeout(r, 3000));
      startCluster();
      state.phase = "after";
    })();

    for (let i = 0; state.phase !== "after" || savesAfterRestart < 20; i++) {
      if (i > 5000) throw new Error("the save loop did not finish");
      const note = `outage save ${i}`;
      const res = await http(`/api/v1/plans/${planId}/versions`, {
        auth,
        json: { baseVersion: base, document: gentlePlan(), note },
      });
      slowestMs = Math.max(slowestMs, res.ms);
      statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
      if (res.status === 201) {
        const number = (res.body as { version: { number: number } }).version.number;
        acknowledged.push({ number, note });
        base = number;
        if (state.phase === "after") savesAfterRestart++;
      } else if (res.status === 409) {
        base = (res.body as { error: { details: { latestVersion: number } } }).error.details.latestVersion;
      } else if (res.status === 503) {
        if (!(Number(res.headers.get("retry-after")) > 0)) unexpected.push(`#${i}: 503 without Retry-After`);
        await new Promise((r) => setTimeout(r, 100));
      } else {
        unexpected.push(`#${i}: ${res.status} ${res.text.slice(0, 160)}`);
      }
    }
    await outage;

    const stored = await retry(() =>
      db
        .select({ number: planVersions.number, note: planVersions.note })
        .from(planVersions)
        .where(eq(planVersions.planId, planId)),
    );
    const byNumber = new Map(stored.map((v) => [v.number, v.note]));
    const lost = acknowledged.filter((a) => byNumber.get(a.number) !== a.note);
    console.log(
      `[outage] ${acknowledged.length} saves acknowledged, ${stored.length} stored; statuses ${JSON.stringify(Object.fromEntries(statuses))}; ` +
        `slowest answer ${slowestMs.toFixed(0)} ms; ${lost.length} acknowledged and lost`,
    );
    expect(unexpected).toEqual([]);
    expect(lost).toEqual([]);
    // the outage was seen (some saves refused) and the server recovered by itself
    expect(statuses.get(503) ?? 0).toBeGreaterThan(0);
    expect(savesAfterRestart).toBe(20);
  }, 180_000);
});
