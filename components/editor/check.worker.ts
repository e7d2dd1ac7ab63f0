/// <reference lib="webworker" />
/**
 * The full live check off the main thread: the arm model's checks (effort along the moves,
 * clearance, tool speed) can take more than a frame on a long plan. This worker only checks, so an
 * edit's report never waits behind the quick fixes of an earlier edit (fixes.worker.ts finds those).
 * With the report it sends the selected move's duration sweep (duration-sweep.ts), swept while the
 * move's path terms are still in the engine's cache, in the same message; a request with
 * `reportWanted: false` (only the selection changed) answers with the sweep alone.
 */
import { check, type Report } from "@/kinematics";
import { sweepInputs, sweepOfMove, type MoveSweep } from "@/components/plots/duration-sweep";
import type { BenchPlan } from "./plan-state";

export interface CheckRequest {
  id: number;
  plan: BenchPlan;
  /** The move to sweep after the check (null: none), and the sweep's own request number. */
  sweep?: { index: number | null; id: number };
  /** False when the page already has this plan's report and wants only the sweep. */
  reportWanted?: boolean;
}

/** The sweep's answer: the sweep (null: nothing to sweep) or why it failed. */
export type SweepReply = { sweepId: number; sweep: MoveSweep | null } | { sweepId: number; sweepError: string };

/** The last sweep, answered again while its inputs are the same (an edit of another move). */
let lastSweep: MoveSweep | null = null;

function sweepOnce(plan: BenchPlan, report: Report, index: number): MoveSweep | null {
  const move = plan.moves[index];
  if (lastSweep && move && lastSweep.index === index && lastSweep.inputs === sweepInputs(plan, index, move.duration))
    return lastSweep;
  const sweep = sweepOfMove(plan, report, index);
  if (sweep) lastSweep = sweep;
  return sweep;
}

self.onmessage = (event: MessageEvent<CheckRequest>) => {
  const { id, plan, sweep, reportWanted = true } = event.data;
  const t0 = performance.now();
  let report: Report;
  try {
    report = check(plan);
  } catch (err) {
    if (reportWanted) self.postMessage({ id, error: err instanceof Error ? err.message : String(err) });
    if (sweep) self.postMessage({ sweepId: sweep.id, sweepError: "the check failed" } satisfies SweepReply);
    return;
  }
  const elapsedMs = performance.now() - t0;
  let reply: SweepReply | null = null;
  if (sweep) {
    try {
      reply = { sweepId: sweep.id, sweep: sweep.index === null ? null : sweepOnce(plan, report, sweep.index) };
    } catch (err) {
      reply = { sweepId: sweep.id, sweepError: err instanceof Error ? err.message : String(err) };
    }
  }
  // the report and the sweep in one message: the page draws them in one render
  if (reportWanted) self.postMessage({ id, report, elapsedMs, ...reply });
  else if (reply) self.postMessage(reply);
};
