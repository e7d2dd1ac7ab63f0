/**
 * The dataset audit worker: takes batch jobs from pg-boss, one at a time per process, and runs them
 * (audit-batch.ts). A sweep re-enqueues batches of a current audit that have no job left (the
 * enqueue after the API's commit failed, or pg-boss gave up), with a fresh job id.
 *
 * Workers on other machines join by running `lib/server/datasets/run-workers.ts` there with the same
 * DATABASE_URL and object-store settings (S3_*): the queue and the results are in PostgreSQL, the
 * files in the object store, and nothing is kept on the worker's disk.
 */
import "server-only";
import type PgBoss from "pg-boss";
import { listOpenDatasetBatchesForWorker } from "@/db/queries/datasets";
import { runDatasetBatch } from "./audit-batch";
import { datasetEnv } from "./config";
import { DATASET_QUEUE, enqueueDatasetBatches, getDatasetBoss, type DatasetJob } from "./queue";

export type DatasetWorker = { stop: () => Promise<void> };

/** Re-enqueues open batches of current audits (same job ids: a batch with a live job is not doubled). */
export async function sweepDatasetBatches({ fresh = false }: { fresh?: boolean } = {}): Promise<number> {
  const open = await listOpenDatasetBatchesForWorker();
  await enqueueDatasetBatches(open, { fresh });
  return open.length;
}

/** Starts working the dataset queue in this process; `stop` waits for the job in hand. */
export async function startDatasetWorker({
  pollingIntervalSeconds = 1,
}: { pollingIntervalSeconds?: number } = {}): Promise<DatasetWorker> {
  const boss = await getDatasetBoss({ supervise: true });
  let workerId = "";
  workerId = await boss.work<DatasetJob>(
    DATASET_QUEUE,
    { batchSize: 1, includeMetadata: true, pollingIntervalSeconds },
    async (jobs: PgBoss.JobWithMetadata<DatasetJob>[]) => {
      for (const job of jobs) await runDatasetBatch(job.data);
      // a job was found: look for the next at once instead of waiting out the polling interval
      if (jobs.length > 0 && workerId) boss.notifyWorker(workerId);
    },
  );
  const sweep = () => {
    sweepDatasetBatches().catch((err: unknown) =>
      console.error("[datasets] sweep failed:", err instanceof Error ? err.message : err),
    );
  };
  sweep();
  const timer = setInterval(sweep, datasetEnv().DATASET_SWEEP_S * 1000);
  return {
    stop: async () => {
      clearInterval(timer);
      await boss.offWork({ id: workerId });
    },
  };
}
