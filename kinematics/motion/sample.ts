/**
 * Sampling a plan at a fixed rate (default: the arm's control rate) for plots, export and the viewer.
 *
 * Layout: `timeS[k]` is the time of sample k; `position`, `velocity` and `acceleration` hold sample k,
 * joint j at index k·jointCount + j (stride = joint count). Samples are taken at k/rateHz from 0 to the
 * plan's end; the last sample is always at exactly the end time (added, or moved there from a grid time
 * within 1 ns of it).
 * A sample on the boundary between two moves belongs to the later one; an instant move takes no time,
 * so its step shows in `position` between two samples (its velocity and acceleration are not sampled).
 *
 * @module
 */
import type { Plan } from "../plan/document";
import { scalingAt } from "./shapes";
import { timelineOf, type Timeline } from "./timeline";

/** A sampled plan; arrays have stride `jointCount`. */
export interface Samples {
  rateHz: number;
  jointCount: number;
  /** Number of samples. */
  count: number;
  /** Sample times, s. */
  timeS: Float64Array;
  /** Joint positions, rad or m. */
  position: Float64Array;
  /** Joint velocities, rad/s or m/s. */
  velocity: Float64Array;
  /** Joint accelerations, rad/s² or m/s². */
  acceleration: Float64Array;
}

/** Options for {@link samplePlan}. */
export interface SampleOptions {
  /** Sampling rate, Hz (default: the arm's control rate). */
  rateHz?: number;
}

const scratch = new Float64Array(3);

/**
 * Writes the pose, velocity and acceleration of move `i` of a timeline at `tS` seconds after the move's
 * start into `outPosition`, `outVelocity` and `outAcceleration` at `offset` (stride = joint count).
 * q = (1 − s)·q₀ + s·q₁ (so both ends are met exactly), q̇ = D·s′/T, q̈ = D·s″/T² (chain rule, τ = t/T).
 * No allocation.
 */
export function sampleMoveAt(
  timeline: Timeline,
  i: number,
  tS: number,
  outPosition: Float64Array,
  outVelocity: Float64Array,
  outAcceleration: Float64Array,
  offset: number,
): void {
  const n = timeline.jointCount;
  const base = i * n;
  const durationS = timeline.durationS[i];
  if (!(durationS > 0)) {
    // an instant move: at the goal, at rest
    for (let j = 0; j < n; j++) {
      outPosition[offset + j] = timeline.goal[base + j];
      outVelocity[offset + j] = 0;
      outAcceleration[offset + j] = 0;
    }
    return;
  }
  scalingAt(timeline.shape[i], timeline.blend[i], tS / durationS, scratch);
  const s = scratch[0];
  const ds = scratch[1] / durationS;
  const dds = scratch[2] / (durationS * durationS);
  const from = timeline.from;
  const goal = timeline.goal;
  const delta = timeline.delta;
  for (let j = 0; j < n; j++) {
    const q0 = from[base + j];
    outPosition[offset + j] = s === 0 ? q0 : s === 1 ? goal[base + j] : (1 - s) * q0 + s * goal[base + j];
    outVelocity[offset + j] = delta[base + j] * ds;
    outAcceleration[offset + j] = delta[base + j] * dds;
  }
}

/** Samples a parsed plan; see the module comment for the layout. */
export function samplePlan(plan: Plan, options: SampleOptions = {}): Samples {
  return sampleTimeline(timelineOf(plan), options.rateHz ?? plan.arm.controlRateHz);
}

/** Samples a timeline at `rateHz`; see the module comment for the layout. */
export function sampleTimeline(timeline: Timeline, rateHz: number): Samples {
  if (!(rateHz > 0)) throw new RangeError("rateHz must be greater than 0");
  const n = timeline.jointCount;
  const totalS = timeline.totalS;
  const gridCount = Math.floor(totalS * rateHz + 1e-9) + 1; // k/rate ≤ total, with a hair of slack for rounding
  const lastGridS = (gridCount - 1) / rateHz;
  // the last sample always sits exactly at the end (a grid time within rounding of it is moved onto it)
  const count = lastGridS < totalS - 1e-9 ? gridCount + 1 : gridCount;
  const timeS = new Float64Array(count);
  const position = new Float64Array(count * n);
  const velocity = new Float64Array(count * n);
  const acceleration = new Float64Array(count * n);
  let i = 0;
  const m = timeline.moveCount;
  for (let k = 0; k < count; k++) {
    const t = k < count - 1 ? k / rateHz : totalS;
    timeS[k] = t;
    // advance to the move that contains t: start ≤ t < end (instant moves contain no time)
    while (i < m && t >= timeline.startS[i] + timeline.durationS[i]) i++;
    const offset = k * n;
    if (i < m) {
      sampleMoveAt(timeline, i, t - timeline.startS[i], position, velocity, acceleration, offset);
    } else if (m > 0) {
      // after the last move: at rest at its goal
      sampleMoveAt(timeline, m - 1, timeline.durationS[m - 1], position, velocity, acceleration, offset);
      for (let j = 0; j < n; j++) {
        velocity[offset + j] = 0;
        acceleration[offset + j] = 0;
      }
    } else {
      for (let j = 0; j < n; j++) position[offset + j] = timeline.start[j];
    }
  }
  return { rateHz, jointCount: n, count, timeS, position, velocity, acceleration };
}

/** Copies joint `j`'s values out of a strided sample array (for plots that want one series per joint). */
export function jointSeries(values: Float64Array, jointCount: number, j: number): Float64Array {
  const count = Math.floor(values.length / jointCount);
  const out = new Float64Array(count);
  for (let k = 0; k < count; k++) out[k] = values[k * jointCount + j];
  return out;
}
