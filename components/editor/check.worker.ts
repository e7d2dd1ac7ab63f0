/// <reference lib="webworker" />
/**
 * The full live check off the main thread: the arm model's checks (effort along the sampled moves,
 * clearance, tool speed) take tens of milliseconds on a plan of a few seconds, more than a frame.
 */
import { check, type Plan } from "@/kinematics";

export interface CheckRequest {
  id: number;
  plan: Plan;
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
