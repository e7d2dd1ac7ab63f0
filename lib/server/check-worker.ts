/**
 * The check pool's worker entry (bundled by lib/server/check-pool.ts into one ESM file and run in a
 * worker thread): runs the engine's check on one plan. Imports nothing server-only, since a worker
 * thread has no React server condition.
 */
import { check, type Plan, type Report } from "@/kinematics";

/** One task: a parsed plan document. */
export interface CheckTask {
  plan: Plan;
}

/** What a task returns: the report and the milliseconds the engine took in the worker. */
export interface CheckTaskResult {
  report: Report;
  elapsedMs: number;
}

export default function runCheckTask(task: CheckTask): CheckTaskResult {
  const t0 = performance.now();
  const report = check(task.plan);
  return { report, elapsedMs: performance.now() - t0 };
}
