/**
 * How much work a check of a plan is, counted before it runs, so that a service can refuse a plan
 * that would hold it: path points × joints summed over the moves. A timed move of an arm with a
 * chain has the path grid (for effort and tool speed) plus one point per control period (the
 * clearance scan samples the control rate); an instant move one point; an arm without a chain is
 * checked in closed form, one point per move.
 *
 * @module
 */
import type { Plan } from "../plan/document";
import { pathGridIntervals } from "./move-path";

/** Path points a timed move of duration `durationS` costs at `controlRateHz` on an arm with a chain. */
export function movePathPoints(durationS: number, controlRateHz: number): number {
  if (!(durationS > 0)) return 1;
  return pathGridIntervals + 1 + Math.floor(durationS * controlRateHz + 1e-9) + 2;
}

/** The work of checking `plan`: Σ over its moves of path points × joints (see the module comment). */
export function checkWork(plan: Plan): number {
  const joints = plan.arm.joints.length;
  const rate = plan.arm.controlRateHz;
  if (!plan.arm.chain) return Math.max(1, plan.moves.length) * joints;
  let points = 1; // the start pose
  for (const move of plan.moves) points += movePathPoints(move.duration, rate);
  return points * joints;
}
