/**
 * The duration sweep of one move: at each duration, the worst peak-to-limit ratio over every
 * timing-dependent check (speed, acceleration, effort with friction, tool speed), evaluated the
 * way the check and the shortest safe duration evaluate them (closed-form joint peaks, then the
 * move's path terms at the check's sample rate; an effort or tool-speed ratio may lie up to
 * peakSlack below the largest sample's, never across 1). A ratio of 1 is the fault limit. Clearance and
 * travel do not depend on the duration and are not part of the sweep.
 *
 * @module
 */
import type { Plan } from "../plan/document";
import { moveBlend } from "../motion/shapes";
import { timedPeaks } from "../motion/peaks";
import { timelineOf } from "../motion/timeline";
import { stateOf } from "./arm-state";
import { faultLevel } from "./report";
import { createPathPeaks, movePath, pathPeaks, type MovePath } from "./move-path";
import type { TimingCheck } from "./safe-duration";

/** One duration of a sweep: the worst ratio and the check it comes from. */
export interface TimingSweepPoint {
  durationS: number;
  /** Largest peak ÷ limit over the joints and the timing-dependent checks. */
  ratio: number;
  /** The check with that ratio (`null` when nothing has a limit to compare with). */
  check: TimingCheck | null;
  /** Its joint (−1 for the tool point or none). */
  joint: number;
}

/**
 * The worst timing ratio of move `index` of the plan at each of `durations` (s; values ≤ 0 are
 * skipped). Uses the plan's own arm, so a plan checked against a tightened arm sweeps against it.
 */
export function moveTimingSweep(plan: Plan, index: number, durations: readonly number[]): TimingSweepPoint[] {
  const joints = plan.arm.joints;
  const n = joints.length;
  const timeline = timelineOf(plan);
  const base = index * n;
  const from = timeline.from.subarray(base, base + n);
  const delta = timeline.delta.subarray(base, base + n);
  const shape = timeline.shape[index];
  const state = stateOf(plan);
  const v = new Float64Array(n);
  const a = new Float64Array(n);
  const peaks = state ? createPathPeaks(state.n) : null;
  // exact on the fault side of each limit (ratio 1), within peakSlack elsewhere: a chart needs no more
  const faultOnly = (limit: number | undefined) => (limit === undefined ? [] : [faultLevel(limit)]);
  const levels = state
    ? [...joints.slice(0, state.n).map((j) => faultOnly(j.maxEffort)), faultOnly(plan.maxToolSpeed)]
    : undefined;
  // the path depends on the duration only through a trapezoid's blend: one path per blend
  let path: MovePath | null = null;
  const out: TimingSweepPoint[] = [];
  for (const T of durations) {
    if (!(T > 0)) continue;
    const blend = moveBlend(shape, delta, T, joints);
    timedPeaks(shape, blend, delta, T, v, a);
    const worst: TimingSweepPoint = { durationS: T, ratio: 0, check: null, joint: -1 };
    const consider = (ratio: number, check: TimingCheck, joint: number) => {
      if (ratio > worst.ratio || worst.check === null) Object.assign(worst, { ratio, check, joint });
    };
    for (let j = 0; j < n; j++) {
      consider(v[j] / joints[j].maxVelocity, "speed", j);
      const maxA = joints[j].maxAcceleration;
      if (maxA !== undefined) consider(a[j] / maxA, "acceleration", j);
    }
    if (state && peaks) {
      if (!path || path.blend !== blend) path = movePath(state, from, delta, shape, blend);
      pathPeaks(state, path, T, state.rateHz, peaks, undefined, levels);
      for (let j = 0; j < state.n; j++) {
        const e = joints[j].maxEffort;
        if (e !== undefined) consider(peaks.effort[j] / e, "effort", j);
      }
      if (plan.maxToolSpeed !== undefined) consider(peaks.toolSpeed / plan.maxToolSpeed, "tool-speed", -1);
    }
    out.push(worst);
  }
  return out;
}
