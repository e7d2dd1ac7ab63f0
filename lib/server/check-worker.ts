/**
 * The check pool's worker entry (bundled by lib/server/check-pool.ts into one ESM file and run in a
 * worker thread): runs the engine's check on one plan. Imports nothing server-only, since a worker
 * thread has no React server condition.
 */
import { check, type Plan, type Report } from "@/kinematics";
import lightArm from "@/kinematics/arm/presets/bench-arm-l.json";
import { checkDocumentBytes, type DocumentCheck } from "./check-document";
import { AppError } from "./errors";
import { lowerOwnThreadPriority } from "./thread-priority";

/** One task: a parsed plan document. */
export interface CheckTask {
  plan: Plan;
}

/** One task: the bytes of a request body holding a plan document, and the work budget. */
export interface DocumentTask {
  bytes: Uint8Array;
  budget: number;
}

/** A document task's answer: its check, or the refusal the route answers with (an AppError's parts). */
export type DocumentTaskResult =
  | DocumentCheck
  | {
      refused: {
        code: AppError["code"];
        message: string;
        issues: AppError["issues"];
        details?: Record<string, unknown>;
      };
    };

/** What a task returns: the report and the milliseconds the engine took in the worker. */
export interface CheckTaskResult {
  report: Report;
  elapsedMs: number;
}

export default function runCheckTask(task: CheckTask | DocumentTask): CheckTaskResult | DocumentTaskResult {
  if ("bytes" in task) {
    try {
      return checkDocumentBytes(task.bytes, task.budget);
    } catch (err) {
      if (!(err instanceof AppError)) throw err;
      return { refused: { code: err.code, message: err.message, issues: err.issues, details: err.details } };
    }
  }
  const t0 = performance.now();
  const report = check(task.plan);
  return { report, elapsedMs: performance.now() - t0 };
}

/**
 * A worker warms up as it starts (tinypool imports this module when the thread starts, before any
 * task): one small document parsed and checked, so the first real task does not pay for compiling
 * the schemas and the engine and run into its time limit.
 */
function warmUp(): void {
  const start = lightArm.joints.map(() => 0);
  const goal = lightArm.joints.map((j) => (j.min + j.max) / 2);
  const document = {
    format: "jointproof.plan",
    version: 1,
    arm: lightArm,
    start,
    moves: [{ goal, duration: 2, shape: "quintic" }],
  };
  try {
    checkDocumentBytes(new TextEncoder().encode(JSON.stringify(document)), Infinity);
  } catch {
    // a warm-up that fails changes nothing: the real tasks report their own errors
  }
}
// checks yield the cores to the request thread, so health and every page answer while the pool works
lowerOwnThreadPriority();
warmUp();
