/// <reference lib="webworker" />
/**
 * The full live check off the main thread: the arm model's checks (effort along the moves,
 * clearance, tool speed) can take more than a frame on a long plan. This worker only checks, so an
 * edit's report never waits behind the quick fixes of an earlier edit (fixes.worker.ts finds those).
 * After the report it sends the effort plot's series (inverse dynamics at every plotted sample: about
 * 15 ms on a 10-move plan, which the page's main thread no longer spends).
 */
import { check } from "@/kinematics";
import { effortAlongPlot } from "@/components/plots/effort";
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
    const effort = effortAlongPlot(plan);
    if (effort) self.postMessage({ id, effort }, [effort.values.buffer]);
  } catch (err) {
    self.postMessage({ id, error: err instanceof Error ? err.message : String(err) });
  }
};
