/**
 * The shortest safe duration of a move: the least duration for its shape at which none of the
 * timing-dependent checks faults (speed, acceleration, effort with friction, tool speed), or `null`
 * when one faults at every duration (gravity alone above an effort limit somewhere on the path).
 *
 * Speed and acceleration come from the shapes' closed forms; effort and tool speed from the move's
 * path terms (move-path.ts): per path point the effort is a quadratic in 1/T and the tool speed is
 * linear in 1/T, so each gives its least duration in closed form. The candidate is then confirmed
 * with the same peak evaluation the check uses and raised until it passes.
 *
 * @module
 */
import type { Plan } from "../plan/document";
import { limitTolerance } from "./report";
import { moveBlend } from "../motion/shapes";
import { safeDuration, timedPeaks, withinLimits } from "../motion/peaks";
import type { ArmState } from "./arm-state";
import {
  movePath,
  pathGravityPeak,
  pathExceeds,
  pathOverLimits,
  shortestEffortDuration,
  shortestToolDuration,
} from "./move-path";

/** Which timing-dependent check sets a move's shortest safe duration. */
export type TimingCheck = "speed" | "acceleration" | "effort" | "tool-speed";

/** A move's shortest safe duration and what sets it. */
export interface SafeDuration {
  /** Shortest duration (s); 0 for a move where nothing moves and nothing faults; `null` when no duration passes. */
  durationS: number | null;
  /** The joint whose limit sets it (or, when `durationS` is null, the joint that faults at every duration); −1 for none or the tool point. */
  joint: number;
  /** The check that sets it, or that faults at every duration; `null` when nothing limits the move. */
  check: TimingCheck | null;
  /** When `durationS` is null: the smallest gravity-only effort (N·m or N) on the path that exceeds the limit. */
  gravityEffort?: number;
  /** When `durationS` is null: the move spans more than `joint`'s whole travel, so it leaves the travel at any duration. */
  beyondTravel?: true;
}

/** Confirmation rounds before giving up on a closed-form candidate (each raises it). */
const maxRounds = 60;

/** Relative width of the bracket at which the bisection of a shortest safe duration stops. */
const bisectionTolerance = 2 ** -14;

/** Longest duration considered (s): beyond it the move counts as unfixable by timing. */
export const longestTimingFixS = 1e7;

/**
 * The shortest safe duration of one move from `from` (all joints) by `delta` with shape `shape`,
 * within `limitScale` × every limit (1 = the fault limits, the arm's cautionRatio = the caution
 * threshold). `state` is the compiled arm model (null without a chain: speed and acceleration
 * only); `rateHz` the rate the sampled checks use (the refinement stops at one of its periods).
 */
export function moveSafeDuration(
  plan: Plan,
  state: ArmState | null,
  from: ArrayLike<number>,
  delta: ArrayLike<number>,
  shape: number,
  limitScale: number,
  rateHz: number,
): SafeDuration {
  const joints = plan.arm.joints;
  // A move longer than a joint's whole travel starts or ends outside it, at every duration (travel
  // does not depend on timing): no duration fixes it. Its path would also wind round many times,
  // which the path-term search below would evaluate at great cost for nothing.
  for (let j = 0; j < joints.length; j++) {
    if (Math.abs(delta[j]) > (joints[j].max - joints[j].min) * (1 + 1e-9))
      return { durationS: null, joint: j, check: null, beyondTravel: true };
  }
  const jointOnly = safeDuration(shape, delta, joints, limitScale);
  const limiting = (T: number): TimingCheck | null => {
    if (jointOnly.joint < 0 || !(T > 0)) return null;
    const v = new Float64Array(joints.length),
      a = new Float64Array(joints.length);
    timedPeaks(shape, moveBlend(shape, delta, T, joints), delta, T, v, a);
    const j = jointOnly.joint,
      maxA = joints[j].maxAcceleration;
    return maxA !== undefined && a[j] / maxA > v[j] / joints[j].maxVelocity ? "acceleration" : "speed";
  };
  if (!state) return { durationS: jointOnly.durationS, joint: jointOnly.joint, check: limiting(jointOnly.durationS) };

  const n = state.n;
  const toolLimit = plan.maxToolSpeed === undefined ? undefined : plan.maxToolSpeed * limitScale;
  const effortLimit = (j: number) => {
    const e = joints[j].maxEffort;
    return e === undefined ? undefined : e * limitScale;
  };
  // the path at each blend this search meets (one for the polynomial shapes), without rebuilding its cache key
  const paths = new Map<number, ReturnType<typeof movePath>>();
  const pathAt = (T: number) => {
    const blend = moveBlend(shape, delta, T > 0 ? T : 1, joints);
    let path = paths.get(blend);
    if (!path) paths.set(blend, (path = movePath(state, from, delta, shape, blend)));
    return path;
  };

  // Gravity alone over a limit anywhere on the path: no duration helps (the path does not depend on T).
  const first = pathAt(jointOnly.durationS);
  for (let j = 0; j < n; j++) {
    const limit = effortLimit(j);
    if (limit === undefined) continue;
    const g = pathGravityPeak(first, j);
    if (g.value > limit * (1 + limitTolerance))
      return { durationS: null, joint: j, check: "effort", gravityEffort: g.value };
  }
  let moving = false;
  for (let j = 0; j < joints.length; j++) if (delta[j] !== 0) moving = true;
  if (!moving) return { durationS: 0, joint: -1, check: null };

  // The limits per path channel (effort of each chain joint, then tool speed) for the path scans.
  const above = new Float64Array(n + 1);
  for (let j = 0; j < n; j++) {
    const limit = effortLimit(j);
    above[j] = limit === undefined ? Infinity : limit * (1 + limitTolerance);
  }
  above[n] = toolLimit === undefined ? Infinity : toolLimit * (1 + limitTolerance);
  // the refinement points of the last confirmation: the next closed form includes them
  const visited: number[] = [];
  const v = new Float64Array(joints.length),
    a = new Float64Array(joints.length);
  // peak ÷ limit of the last scan (NaN when unknown): only steers the bisection below
  const ratio = new Float64Array(1);
  /** What faults at T: null when nothing does. */
  const failing = (T: number): { check: TimingCheck; joint: number } | null => {
    ratio[0] = NaN;
    if (!withinLimits(shape, delta, T, joints, limitScale, v, a))
      return { check: limiting(T) ?? "speed", joint: jointOnly.joint };
    visited.length = 0;
    const c = pathOverLimits(state, pathAt(T), T, rateHz, above, visited, ratio);
    if (c < 0) return null;
    return c < n ? { check: "effort", joint: c } : { check: "tool-speed", joint: -1 };
  };
  const order = Array.from({ length: n + 1 }, (_, c) => c);
  /**
   * Whether anything faults at T: the answer of `failing(T) !== null`, with each channel's scan
   * stopped at its first sample over the limit (the refinement points are not needed here). The
   * channel that faulted last is scanned first, which changes the work, not the answer.
   */
  const faults = (T: number): boolean => {
    ratio[0] = NaN;
    if (!withinLimits(shape, delta, T, joints, limitScale, v, a)) return true;
    const c = pathExceeds(state, pathAt(T), T, rateHz, above, order, ratio);
    if (c >= 0 && order[0] !== c) {
      order.splice(order.indexOf(c), 1);
      order.unshift(c);
    }
    return c >= 0;
  };

  /**
   * The closed form bounds over the path grid, which lies between the control samples the check
   * evaluates; lower a passing duration to where the samples start to fault. `faulting`, when
   * known, is a shorter duration that faults (the bracket's lower end); `ratioHi` and `ratioLo` the
   * peak ÷ limit measured at both ends (NaN when unknown).
   *
   * Every probe is decided by `faults`; the peak ratios only choose where to probe: by regula falsi
   * with the Illinois modification (Dowell & Jarratt, BIT 11, 1971 — memory), which brackets like
   * bisection but needs a few probes where bisection needs ten, and each probe near the answer is
   * the expensive kind (the peak channel is refined down to its samples).
   */
  const lowest = (passing: number, faulting?: number, ratioHi = NaN, ratioLo = NaN): number => {
    let hi = passing;
    let lo: number;
    if (faulting !== undefined && faulting < hi && faulting >= jointOnly.durationS) lo = faulting;
    else {
      ratioLo = NaN;
      lo = Math.max(jointOnly.durationS, hi * (1 - 1 / 16));
      // step down while shorter still passes (a trapezoid's blend changes the path with T)
      while (lo < hi && !faults(lo)) {
        hi = lo;
        ratioHi = ratio[0];
        if (lo <= jointOnly.durationS) return hi;
        lo = Math.max(jointOnly.durationS, lo * (1 - 1 / 16));
      }
      ratioLo = ratio[0];
    }
    let gHi = ratioHi - 1,
      gLo = ratioLo - 1;
    let side = 0; // −1: the last probe moved lo, +1: hi
    while (hi - lo > hi * bisectionTolerance) {
      const width = hi - lo,
        tol = hi * bisectionTolerance;
      let mid = (lo + hi) / 2;
      if (gLo > 0 && gHi <= 0 && Number.isFinite(gLo - gHi)) {
        mid = lo + (width * gLo) / (gLo - gHi);
        // a probe within the tolerance of an end closes the bracket on the next probe
        mid = Math.min(Math.max(mid, lo + tol / 2), hi - tol / 2);
      }
      if (!(mid > lo && mid < hi)) break;
      if (faults(mid)) {
        lo = mid;
        gLo = ratio[0] - 1;
        if (side === -1) gHi /= 2; // Illinois: the other end's value halved when one end repeats
        side = -1;
      } else {
        hi = mid;
        gHi = ratio[0] - 1;
        if (side === 1) gLo /= 2;
        side = 1;
      }
    }
    return hi;
  };

  let T = jointOnly.durationS;
  let lastBlend = NaN;
  let setBy: { check: TimingCheck | null; joint: number } = { check: limiting(T), joint: jointOnly.joint };
  // the candidates that faulted, latest last (a trapezoid's are extrapolated, see below)
  const faulted: number[] = [];
  let faultedRatio = NaN;
  for (let round = 0; round < maxRounds; round++) {
    const path = pathAt(T);
    if (path.blend !== lastBlend) visited.length = 0; // refinement points of another path
    lastBlend = path.blend;
    let candidate = T;
    for (let j = 0; j < n; j++) {
      const limit = effortLimit(j);
      if (limit === undefined) continue;
      const te = shortestEffortDuration(state, path, j, limit, T, visited);
      if (!Number.isFinite(te))
        return { durationS: null, joint: j, check: "effort", gravityEffort: pathGravityPeak(path, j).value };
      if (te > candidate) {
        candidate = te;
        setBy = { check: "effort", joint: j };
      }
    }
    if (toolLimit !== undefined) {
      const tt = shortestToolDuration(state, path, toolLimit, visited);
      if (tt > candidate) {
        candidate = tt;
        setBy = { check: "tool-speed", joint: -1 };
      }
    }
    // the closed form made no progress on the points it knows (rounding): step on
    if (round > 0 && candidate <= T) candidate = Math.max(T * (1 + 1e-9), T + Number.EPSILON);
    // A trapezoid's path changes with its duration (the blend), so the closed form of one path
    // undershoots the next and the candidates creep up geometrically: after three, jump to their
    // Aitken Δ² limit (Burden & Faires, Numerical Analysis, §2.5 — memory). The jump is only a
    // guess; a jump that faults is one more faulting candidate, one that passes is lowered below.
    const k = faulted.length;
    if (path.blend > 0 && k >= 2) {
      const d1 = faulted[k - 1] - faulted[k - 2],
        d2 = candidate - faulted[k - 1];
      const ratio = d2 / d1;
      if (d1 > 0 && d2 > 0 && ratio < 0.95) candidate += (d2 * ratio) / (1 - ratio);
    }
    if (candidate > longestTimingFixS) return { durationS: null, joint: setBy.joint, check: setBy.check };
    const fault = failing(candidate);
    if (!fault)
      return {
        durationS: lowest(candidate, faulted[k - 1], ratio[0], faultedRatio),
        joint: setBy.joint,
        check: setBy.check,
      };
    setBy = fault;
    faulted.push(candidate);
    faultedRatio = ratio[0];
    // The next round works on the path at `candidate` (the same path for the polynomial shapes; for
    // a trapezoid, the path whose samples just faulted), so its closed form includes the points this
    // confirmation refined and the candidate grows past them.
    T = candidate;
  }
  // No convergence: double until it passes, then lower as above.
  for (let k = 0; k < 64 && T <= longestTimingFixS; k++, T *= 2)
    if (!faults(T))
      return { durationS: lowest(T, k > 0 ? T / 2 : faulted.at(-1)), joint: setBy.joint, check: setBy.check };
  return { durationS: null, joint: setBy.joint, check: setBy.check };
}
