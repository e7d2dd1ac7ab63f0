/**
 * A plan laid out in time: for each move its start time, start and goal poses, displacement, shape
 * and shape parameter, in flat typed arrays (stride = joint count) for the check and the sampler.
 *
 * @module
 */
import type { Plan } from "../plan/document";
import { moveBlend, shapeId } from "./shapes";

/** The plan's moves in flat arrays; pose arrays have stride `jointCount`. */
export interface Timeline {
  jointCount: number;
  moveCount: number;
  /** Start time of each move, s (moves run back to back; an instant move takes no time). */
  startS: Float64Array;
  /** Duration of each move, s (0 for an instant move). */
  durationS: Float64Array;
  /** Pose at the start of each move (the previous move's goal), rad or m, stride `jointCount`. */
  from: Float64Array;
  /** Goal pose of each move, rad or m, stride `jointCount`. */
  goal: Float64Array;
  /** Goal − start per move and joint, rad or m, stride `jointCount`. */
  delta: Float64Array;
  /** Shape identifier of each move (see `shapeIds`). */
  shape: Uint8Array;
  /** Trapezoid blend fraction of each move (0 for the polynomial shapes). */
  blend: Float64Array;
  /** The plan's start pose, rad or m. */
  start: Float64Array;
  /** Total duration of the plan, s. */
  totalS: number;
}

/** Lays a parsed plan out in time. */
export function timelineOf(plan: Plan): Timeline {
  const n = plan.arm.joints.length;
  const m = plan.moves.length;
  const t: Timeline = {
    jointCount: n,
    moveCount: m,
    startS: new Float64Array(m),
    durationS: new Float64Array(m),
    from: new Float64Array(m * n),
    goal: new Float64Array(m * n),
    delta: new Float64Array(m * n),
    shape: new Uint8Array(m),
    blend: new Float64Array(m),
    start: Float64Array.from(plan.start),
    totalS: 0,
  };
  let clockS = 0;
  let previous: readonly number[] = plan.start;
  for (let i = 0; i < m; i++) {
    const move = plan.moves[i];
    const base = i * n;
    for (let j = 0; j < n; j++) {
      t.from[base + j] = previous[j];
      t.goal[base + j] = move.goal[j];
      t.delta[base + j] = move.goal[j] - previous[j];
    }
    t.startS[i] = clockS;
    t.durationS[i] = move.duration;
    t.shape[i] = shapeId(move.shape);
    t.blend[i] = moveBlend(t.shape[i], t.delta.subarray(base, base + n), move.duration, plan.arm.joints);
    clockS += move.duration;
    previous = move.goal;
  }
  t.totalS = clockS;
  return t;
}
