/// <reference lib="webworker" />
/**
 * The full live check off the main thread: the arm model's checks (effort along the sampled moves,
 * clearance, tool speed) take tens of milliseconds on a plan of a few seconds, more than a frame.
 * The report goes back first; the quick fixes follow, since each is checked on a copy of the plan.
 */
import { check } from "@/kinematics";
import { quickFixes } from "./quick-fixes";
import type { BenchPlan } from "./plan-state";

export interface CheckRequest {
  id: number;
  plan: BenchPlan;
}

self.onmessage = (event: MessageEvent<CheckRequest>) => {
  const { id, plan } = event.data;
  const t0 = performance.now();
  try {
    const report = check(plan);
    self.postMessage({ id, report, elapsedMs: performance.now() - t0 });
    self.postMessage({ id, fixes: quickFixes(plan, report) });
  } catch (err) {
    self.postMessage({ id, error: err instanceof Error ? err.message : String(err) });
  }
};
