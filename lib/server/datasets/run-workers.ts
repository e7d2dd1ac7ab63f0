/**
 * Starts DATASET_WORKERS dataset audit worker processes (run-worker.ts) on this machine and keeps
 * them running: a worker that dies is started again (its batch is retried by the queue). Stops them
 * all on SIGINT/SIGTERM. Prints "workers ready" once every one has said it is ready.
 *
 * Usage: `node --conditions=react-server --import tsx lib/server/datasets/run-workers.ts`, with the
 * same DATABASE_URL and S3_* settings as the web server; run it on as many machines as you like.
 */
import { fork, type ChildProcess } from "node:child_process";
import { fileURLToPath } from "node:url";
import { datasetEnv } from "./config";

const script = fileURLToPath(new URL("./run-worker.ts", import.meta.url));
const count = datasetEnv().DATASET_WORKERS;
const children = new Set<ChildProcess>();
let stopping = false;
let ready = 0;

function start(): void {
  const child = fork(script, [], {
    execArgv: ["--conditions=react-server", "--import", "tsx"],
    stdio: ["ignore", "pipe", "inherit", "ipc"],
  });
  children.add(child);
  child.stdout?.on("data", (chunk: Buffer) => {
    process.stdout.write(chunk);
    if (chunk.toString().includes("ready") && ++ready === count) console.log(`[datasets] ${count} workers ready`);
  });
  child.on("exit", (code, signal) => {
    children.delete(child);
    if (stopping) return;
    console.error(`[datasets] worker ${child.pid} ended (${signal ?? code}); starting another`);
    start();
  });
}

for (let i = 0; i < count; i++) start();

const shutdown = () => {
  stopping = true;
  for (const child of children) child.kill("SIGTERM");
  const timer = setTimeout(() => process.exit(0), 10_000);
  const check = setInterval(() => {
    if (children.size === 0) {
      clearInterval(check);
      clearTimeout(timer);
      process.exit(0);
    }
  }, 100);
};
process.on("SIGINT", shutdown);
process.on("SIGTERM", shutdown);
