/**
 * Benchmark (not a test): episodes per second through the dataset audit workers, with one and with
 * two worker processes (three alternating runs each, the median kept), on the bench dataset (600 invented episodes, bench/dataset-generate.ts).
 * Needs PostgreSQL and the object store (DATABASE_URL, S3_*): run it with `bash bench/dataset-workers.sh`,
 * which starts a private cluster and the fakes. Writes bench/tmp/dataset-workers.json, which
 * bench/dataset-audit.ts adds to bench/results.json.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { mkdirSync, writeFileSync } from "node:fs";
import { loadavg } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { datasets, users } from "@/db/schema";
import { createArm } from "@/db/queries/arms";
import { createDataset, startDatasetAudit } from "@/db/queries/datasets";
import { createProject } from "@/db/queries/projects";
import { writeEpisodesParquet } from "@/kinematics";
import { enqueueDatasetBatches, stopDatasetBoss } from "@/lib/server/datasets/queue";
import { putObject } from "@/lib/server/storage";
import { datasetArm, datasetArmDocument, generateDataset } from "./dataset-generate";

const here = dirname(fileURLToPath(import.meta.url));
const EPISODES = 600;

/** Every worker process started, so that a failed run stops them instead of leaving them behind. */
const started = new Set<ChildProcess>();

/** Starts `count` worker processes and waits for each to say "ready"; fails if one exits first or takes over 30 s. */
function startWorkers(count: number): Promise<ChildProcess[]> {
  return Promise.all(
    Array.from({ length: count }, () => {
      const child = spawn(
        process.execPath,
        ["--conditions=react-server", "--import", "tsx", "lib/server/datasets/run-worker.ts"],
        { env: process.env, stdio: ["ignore", "pipe", "inherit"] },
      );
      started.add(child);
      child.once("exit", () => started.delete(child));
      return new Promise<ChildProcess>((resolve, reject) => {
        const timer = setTimeout(() => {
          child.kill("SIGTERM");
          reject(new Error("a dataset worker did not get ready within 30 s"));
        }, 30_000);
        child.once("exit", (code) => {
          clearTimeout(timer);
          reject(new Error(`a dataset worker exited (${code}) before it was ready`));
        });
        child.stdout?.on("data", (d: Buffer) => {
          if (!d.toString().includes("ready")) return;
          clearTimeout(timer);
          child.removeAllListeners("exit");
          resolve(child);
        });
      });
    }),
  );
}

async function main() {
  const [user] = await db
    .insert(users)
    .values({ email: `bench-${Date.now()}@example.com`, name: "Bench", passwordHash: "x", siteRole: "researcher" })
    .returning();
  const project = await createProject({ userId: user.id, name: "Worker bench", kind: "research" });
  const arm = await createArm({
    projectId: project.id,
    name: "Copy arm",
    description: datasetArmDocument,
    userId: user.id,
  });
  if (!arm) throw new Error("arm");
  const bytes = writeEpisodesParquet(datasetArm(), generateDataset({ episodes: EPISODES }));
  const key = `datasets/${project.id}/bench.parquet`;
  await putObject(key, bytes, "application/octet-stream");
  const dataset = await createDataset({
    projectId: project.id,
    name: "bench",
    objectKey: key,
    fileKind: "parquet",
    sizeBytes: bytes.byteLength,
    sha256: "0".repeat(64),
    armRevisionId: arm.revision.id,
    mapping: {},
    createdBy: user.id,
  });
  const results: Record<string, unknown> = {
    episodes: EPISODES,
    batchSize: Number(process.env.DATASET_BATCH_SIZE ?? 25),
  };
  // three runs of each, alternating, so a change in the machine's load falls on both alike
  const seconds: Record<number, number[]> = { 1: [], 2: [] };
  for (const count of [1, 2, 1, 2, 1, 2]) {
    const workers = await startWorkers(count);
    const start = performance.now();
    const started = await startDatasetAudit({
      datasetId: dataset.id,
      userId: user.id,
      episodeCount: EPISODES,
      batchSize: Number(process.env.DATASET_BATCH_SIZE ?? 25),
    });
    await enqueueDatasetBatches(
      started!.batches.map((batch) => ({ datasetId: dataset.id, generation: started!.dataset.generation, batch })),
    );
    // an audit that does not finish is a finding, not a figure: stop with what is known
    const deadline = performance.now() + 120_000;
    for (;;) {
      const [row] = await db.select({ status: datasets.status }).from(datasets).where(eq(datasets.id, dataset.id));
      if (row.status === "audited") break;
      if (performance.now() > deadline) throw new Error(`the audit with ${count} worker(s) did not finish in 120 s`);
      await new Promise((r) => setTimeout(r, 50));
    }
    const s = (performance.now() - start) / 1000;
    await Promise.all(workers.map((w) => new Promise((r) => (w.once("exit", r), w.kill("SIGTERM")))));
    seconds[count].push(s);
    console.log(
      `${count} worker${count === 1 ? "" : "s"}: ${EPISODES} episodes in ${s.toFixed(2)} s (${Math.round(EPISODES / s)} episodes/s)`,
    );
    await new Promise((r) => setTimeout(r, 500));
  }
  for (const count of [1, 2]) {
    const sorted = [...seconds[count]].sort((a, b) => a - b);
    const median = sorted[Math.floor(sorted.length / 2)];
    results[`workers${count}`] = {
      runs: sorted.map((v) => Number(v.toFixed(2))),
      seconds: Number(median.toFixed(2)),
      episodesPerSecond: Math.round(EPISODES / median),
    };
  }
  results.loadAverage = loadavg().map((v) => Number(v.toFixed(2)));
  mkdirSync(join(here, "tmp"), { recursive: true });
  writeFileSync(
    join(here, "tmp", "dataset-workers.json"),
    JSON.stringify({ ...results, measuredAt: new Date().toISOString() }, null, 2) + "\n",
  );
  await stopDatasetBoss();
  process.exit(0);
}

await main().catch((err) => {
  // first the reason, then stop the workers: left running they keep the caller's output pipe open
  console.error(`dataset workers bench failed: ${err instanceof Error ? err.message : String(err)}`);
  for (const child of started) child.kill("SIGKILL");
  process.exit(1);
});
