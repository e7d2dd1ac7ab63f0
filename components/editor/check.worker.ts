/// <reference lib="webworker" />
/**
 * The full live check off the main thread: the arm model's checks (effort along the moves,
 * clearance, tool speed) can take more than a frame on a long plan. This worker only checks, so an
 * edit's report never waits behind the quick fixes of an earlier edit (fixes.worker.ts finds those).
 */
import { check } from "@/kinematics";
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
  } catch (err) {
    self.postMessage({ id, error: err instanceof Error ? err.message : String(err) });
  }
};
