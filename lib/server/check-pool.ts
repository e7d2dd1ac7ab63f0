/**
 * Checks off the request thread: a pool of worker threads (tinypool) sized to the machine, a work
 * budget refused up front with 422, and a time limit per check after which the worker is stopped
 * and the request answered 503 with Retry-After. Every route that runs the engine on a plan (check,
 * saving a version, submitting, exporting) goes through {@link runCheck}.
 *
 * The worker entry (lib/server/check-worker.ts) is bundled with esbuild into one ESM file under
 * node_modules/.cache/jointproof/ the first time the pool starts, and again whenever an engine
 * source is newer than the bundle, so it resolves the same way under `next start`, `next dev` and
 * the tests (Next's own server bundles do not contain a file a worker thread could load).
 */
import { existsSync, mkdirSync, readdirSync, statSync } from "node:fs";
import { availableParallelism } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { checkWork, type Plan, type Report } from "@/kinematics";
import { AppError } from "./errors";
import type { CheckTask, CheckTaskResult, DocumentTask, DocumentTaskResult } from "./check-worker";
import { budgetError, type DocumentCheck } from "./check-document";
import { CHECK_RETRY_AFTER_S, checkersBusyError, checkersFull, registerCheckersFull } from "./check-capacity";

export { CHECK_RETRY_AFTER_S } from "./check-capacity";

/** Most work (path points × joints, see kinematics/check/work.ts) one check may take. */
export const CHECK_WORK_BUDGET = positiveEnv("JP_CHECK_WORK_BUDGET", 3_000_000);

/** Longest a check may run in the pool (ms) before it is stopped. */
export const CHECK_TIME_LIMIT_MS = positiveEnv("JP_CHECK_TIME_LIMIT_MS", 10_000);

/** Checks that may wait per worker thread; beyond that a check is answered 503 at once. */
const QUEUE_PER_THREAD = 8;

function positiveEnv(name: string, fallback: number): number {
  const raw = process.env[name];
  const value = raw === undefined || raw === "" ? NaN : Number(raw);
  return Number.isFinite(value) && value > 0 ? value : fallback;
}

/** Worker threads: one per core but one, which stays free for requests (at least one). */
function threadCount(): number {
  return Math.max(1, Math.floor(positiveEnv("JP_CHECK_THREADS", Math.max(1, availableParallelism() - 1))));
}

const root = process.cwd();
const bundleDir = join(root, "node_modules", ".cache", "jointproof");
const bundlePath = join(bundleDir, "check-worker.mjs");

/** Newest modification time (ms) of the files the worker bundle is built from. */
function newestSource(): number {
  let newest = 0;
  const walk = (dir: string) => {
    for (const entry of readdirSync(dir, { withFileTypes: true })) {
      const path = join(dir, entry.name);
      if (entry.isDirectory()) walk(path);
      else if (/\.(ts|json)$/.test(entry.name)) newest = Math.max(newest, statSync(path).mtimeMs);
    }
  };
  // the engine, and the worker's own imports (check-document.ts, json-body.ts, the shared schemas …)
  walk(join(root, "kinematics"));
  walk(join(root, "lib", "server"));
  walk(join(root, "lib", "shared"));
  return newest;
}

/** Builds the worker bundle when it is missing or older than its sources. */
async function ensureBundle(): Promise<string> {
  const sourcesExist =
    existsSync(join(root, "kinematics")) && existsSync(join(root, "lib", "server", "check-worker.ts"));
  if (existsSync(bundlePath) && (!sourcesExist || statSync(bundlePath).mtimeMs >= newestSource())) return bundlePath;
  mkdirSync(bundleDir, { recursive: true });
  const esbuild = await import("esbuild");
  await esbuild.build({
    entryPoints: [join(root, "lib", "server", "check-worker.ts")],
    outfile: bundlePath,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    tsconfig: join(root, "tsconfig.json"),
    logLevel: "silent",
  });
  return bundlePath;
}

type Pool = {
  run(task: CheckTask | DocumentTask, options: { signal: AbortSignal }): Promise<CheckTaskResult | DocumentTaskResult>;
  destroy(): Promise<void>;
  readonly threads: number;
  readonly queueSize: number;
};

const globalForPool = globalThis as typeof globalThis & { jointproofCheckPool?: Promise<Pool> };

async function createPool(): Promise<Pool> {
  const filename = pathToFileURL(await ensureBundle()).href;
  const { Tinypool } = await import("tinypool");
  const threads = threadCount();
  const pool = new Tinypool({
    filename,
    minThreads: threads,
    maxThreads: threads,
    idleTimeout: 60_000,
    // at most a few waiting checks per thread; beyond that a check waits longer than its limit anyway
    maxQueue: threads * QUEUE_PER_THREAD,
    // a check that runs away with memory stops its worker, not the server
    resourceLimits: { maxOldGenerationSizeMb: 768 },
  });
  // every thread started and warmed up (check-worker.ts) before the first request is given a time limit
  await Promise.all(
    Array.from({ length: threads }, () => pool.run({ bytes: new TextEncoder().encode("{}"), budget: 0 })),
  );
  const full = () => pool.queueSize >= threads * QUEUE_PER_THREAD;
  registerCheckersFull(full);
  return {
    // Tinypool 2.2 arms a task's abort listener before it refuses the task for a full queue, and
    // never disarms it: when the signal fires later, the listener throws in a timer (an uncaught
    // exception in the server). So the pool is never handed a task it would refuse.
    run: (task, options) =>
      full()
        ? Promise.reject(new Error("queue is at limit"))
        : (pool.run(task, options) as Promise<CheckTaskResult | DocumentTaskResult>),
    destroy: () => pool.destroy(),
    threads,
    get queueSize() {
      return pool.queueSize;
    },
  };
}

function pool(): Promise<Pool> {
  if (!globalForPool.jointproofCheckPool) {
    globalForPool.jointproofCheckPool = createPool().catch((err) => {
      globalForPool.jointproofCheckPool = undefined;
      throw err;
    });
  }
  return globalForPool.jointproofCheckPool;
}

/** Stops the pool's workers (tests and shutdown). */
export async function closeCheckPool(): Promise<void> {
  const current = globalForPool.jointproofCheckPool;
  globalForPool.jointproofCheckPool = undefined;
  registerCheckersFull(undefined);
  if (current) await (await current).destroy();
}

/**
 * Refuses, with 422, a plan whose check would take more than {@link CHECK_WORK_BUDGET} (path points ×
 * joints); `pathPrefix` names the document in the request (e.g. "document").
 */
export function assertWithinBudget(plan: Plan, pathPrefix = ""): number {
  const work = checkWork(plan);
  const refused = budgetError(plan, work, CHECK_WORK_BUDGET, pathPrefix);
  if (refused) throw refused;
  return work;
}

/**
 * Runs the engine's check of a parsed plan in the worker pool: 422 over the work budget, 503 with
 * Retry-After when it runs past {@link CHECK_TIME_LIMIT_MS} (the worker is stopped) or the pool's
 * queue is full. Never answers with a partial report.
 */
export async function runCheck(plan: Plan, pathPrefix = ""): Promise<{ report: Report; elapsedMs: number }> {
  assertWithinBudget(plan, pathPrefix);
  const workers = await pool();
  try {
    const result = (await workers.run(
      { plan },
      { signal: AbortSignal.timeout(CHECK_TIME_LIMIT_MS) },
    )) as CheckTaskResult;
    return { report: result.report, elapsedMs: result.elapsedMs };
  } catch (err) {
    throw poolFailure(err);
  }
}

/**
 * Refuses (503, Retry-After) when every checker is busy and the queue is full, before a route reads
 * a request body it could not check anyway: under a flood of large documents the request thread
 * then spends nothing on bodies that would only be answered "busy".
 */
export async function assertCheckerFree(): Promise<void> {
  await pool();
  if (checkersFull()) throw checkersBusyError();
}

/**
 * Checks a plan document from the bytes of a request body entirely in the pool (parsing, the work
 * budget, the check and the response's JSON text), so that a large document never holds the request
 * thread; the same 400/422 as a route's own parsing, and the 503s of {@link runCheck}.
 */
export async function runDocumentCheck(bytes: Uint8Array): Promise<DocumentCheck> {
  const workers = await pool();
  let result: DocumentTaskResult;
  try {
    result = (await workers.run(
      { bytes, budget: CHECK_WORK_BUDGET },
      { signal: AbortSignal.timeout(CHECK_TIME_LIMIT_MS) },
    )) as unknown as DocumentTaskResult;
  } catch (err) {
    throw poolFailure(err);
  }
  if ("refused" in result) {
    const { code, message, issues, details } = result.refused;
    throw new AppError(code, message, { issues, details });
  }
  return result;
}

/** The answer for a check the pool could not finish: 503s for time, a full queue and memory. */
function poolFailure(err: unknown): unknown {
  const limitS = CHECK_TIME_LIMIT_MS / 1000;
  const name = err instanceof Error ? err.name : "";
  const message = err instanceof Error ? err.message : String(err);
  if (name === "AbortError" || name === "TimeoutError") {
    return new AppError(
      "unavailable:check-time-limit",
      `The check ran longer than its limit of ${limitS} s and was stopped; nothing was checked or saved. Try again in ${CHECK_RETRY_AFTER_S} s, or split the plan into shorter ones.`,
      {
        details: { retryAfterS: CHECK_RETRY_AFTER_S, timeLimitS: limitS },
      },
    );
  }
  if (/queue is at limit|No task queue/i.test(message)) return checkersBusyError();
  if (/memory|ERR_WORKER_OUT_OF_MEMORY/i.test(message)) {
    return new AppError(
      "unavailable:check-memory",
      `The check needed more memory than one checker has and was stopped; nothing was checked or saved. Split the plan into shorter ones.`,
      {
        details: { retryAfterS: CHECK_RETRY_AFTER_S },
      },
    );
  }
  return err;
}
