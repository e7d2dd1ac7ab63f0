/**
 * Entry point of the mail worker process: `tsx lib/server/mail/run-worker.ts` (started by `npm start`
 * and `npm test` next to the web server). Stops on SIGINT/SIGTERM after the job in hand.
 */
import { startMailWorker } from "./worker";
import { stopBoss } from "./queue";

const worker = await startMailWorker();
console.log("[mail] worker ready");
const shutdown = async () => {
  await worker.stop();
  await stopBoss();
  process.exit(0);
};
process.on("SIGINT", () => void shutdown());
process.on("SIGTERM", () => void shutdown());
