/**
 * The dataset audit queue on pg-boss (jobs in PostgreSQL). A job says "audit batch B of generation G
 * of dataset D"; the batch row in dataset_batches is the source of truth (done or not), so a job that
 * runs twice, or after a newer audit started, stores nothing. The job id is derived from the three,
 * so enqueueing the same batch twice creates one job.
 */
import { createHash } from "node:crypto";
import PgBoss from "pg-boss";
import { env } from "@/lib/server/env";
import { datasetEnv } from "./config";

export const DATASET_QUEUE = "dataset-audit";

export type DatasetJob = { datasetId: string; generation: number; batch: number };

const globalForBoss = globalThis as unknown as { jointproofDatasetBoss?: Promise<PgBoss> };

/** One started pg-boss client per process for the dataset queue. */
export function getDatasetBoss({ supervise = false }: { supervise?: boolean } = {}): Promise<PgBoss> {
  globalForBoss.jointproofDatasetBoss ??= (async () => {
    const boss = new PgBoss({
      connectionString: env().DATABASE_URL,
      max: 3,
      supervise,
      schedule: false,
      application_name: "jointproof-datasets",
      // expired jobs are found by maintenance: look often enough that a lost batch is retried soon
      ...(supervise
        ? {
            maintenanceIntervalSeconds: Math.max(1, Math.min(60, datasetEnv().DATASET_SWEEP_S)),
            monitorStateIntervalSeconds: 60,
          }
        : {}),
    });
    boss.on("error", (err) => console.error("[datasets] queue error:", err.message));
    await boss.start();
    await boss.createQueue(DATASET_QUEUE);
    return boss;
  })().catch((err: unknown) => {
    globalForBoss.jointproofDatasetBoss = undefined;
    throw err;
  });
  return globalForBoss.jointproofDatasetBoss;
}

/** Stops this process's dataset queue client. */
export async function stopDatasetBoss(): Promise<void> {
  const pending = globalForBoss.jointproofDatasetBoss;
  globalForBoss.jointproofDatasetBoss = undefined;
  if (pending) await (await pending).stop({ graceful: true, wait: true, timeout: 5_000 });
}

/** A UUID-shaped job id from the job's identity (pg-boss job ids are UUIDs). */
function jobId(job: DatasetJob): string {
  const h = createHash("sha256").update(`${job.datasetId}:${job.generation}:${job.batch}`).digest("hex");
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-4${h.slice(13, 16)}-a${h.slice(17, 20)}-${h.slice(20, 32)}`;
}

/** Enqueues batch jobs; a batch already queued is not queued twice. `fresh` gives lost jobs a new id. */
export async function enqueueDatasetBatches(
  jobs: DatasetJob[],
  { fresh = false }: { fresh?: boolean } = {},
): Promise<void> {
  if (jobs.length === 0) return;
  const boss = await getDatasetBoss();
  const e = datasetEnv();
  for (const job of jobs) {
    await boss.send(DATASET_QUEUE, job, {
      retryLimit: e.DATASET_RETRY_LIMIT,
      retryDelay: 1,
      retryBackoff: true,
      expireInSeconds: e.DATASET_JOB_EXPIRE_S,
      ...(fresh ? {} : { id: jobId(job) }),
    });
  }
}
