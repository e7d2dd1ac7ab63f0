/// <reference lib="webworker" />
/**
 * The quick fixes of the live check, in a worker of their own: each fix is checked on a copy of the
 * plan (up to `maxCandidates` checks), which can take longer than the check itself. Only the latest
 * plan is worked on: requests that arrive while a plan's fixes are being found replace each other,
 * and the newest is taken up next. Before the fixes it sends the effort plot's series (inverse dynamics
 * at up to 3,000 samples, effort.ts: work the page's main thread no longer does), while the check
 * worker finds the report.
 */
import { check } from "@/kinematics";
import { effortAlongPlot } from "@/components/plots/effort";
import { quickFixes } from "./quick-fixes";
import type { CheckRequest } from "./check.worker";

let pending: CheckRequest | null = null;
let scheduled = false;

function run(): void {
  scheduled = false;
  const request = pending;
  pending = null;
  if (!request) return;
  const { id, plan } = request;
  try {
    const effort = effortAlongPlot(plan);
    if (effort) self.postMessage({ id, effort }, [effort.values.buffer]);
    // the same engine check as the check worker's (deterministic), reusing this worker's own cache
    self.postMessage({ id, fixes: quickFixes(plan, check(plan)) });
  } catch (err) {
    self.postMessage({ id, error: err instanceof Error ? err.message : String(err) });
  }
}

self.onmessage = (event: MessageEvent<CheckRequest>) => {
  pending = event.data;
  if (!scheduled) {
    scheduled = true;
    setTimeout(run, 0); // after the messages already queued, so the newest plan wins
  }
};
