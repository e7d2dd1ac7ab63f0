/**
 * One dataset audit worker process: `node --conditions=react-server --import tsx lib/server/datasets/run-worker.ts`.
 * Stops on SIGINT/SIGTERM after the job in hand. `run-workers.ts` starts DATASET_WORKERS of these.
 */
import { startDatasetWorker } from "./worker";
import { stopDatasetBoss } from "./queue";

const worker = await startDatasetWorker();
console.log(`[datasets] worker ${process.pid} ready`);
const shutdown = async () => {
  await worker.stop();
  await stopDatasetBoss();
  process.exit(0);
};
process.on("SIGINT", () => void shutdown());
process.on("SIGTERM", () => void shutdown());
