/**
 * Peak speed and acceleration of one move per joint, and its shortest safe duration verified against
 * the same comparison the check uses.
 *
 * @module
 */
import type { Joint } from "../plan/arm";
import { limitTolerance } from "../check/report";
import { accelerationFactor, moveBlend, shortestDuration, velocityFactor, type ShortestDuration } from "./shapes";

/**
 * Writes each joint's peak |q̇| (rad/s or m/s) into `outVelocity` and peak |q̈| (rad/s² or m/s²) into
 * `outAcceleration` for a timed move (`durationS` > 0) of displacement `delta`.
 * Peak |q̇ⱼ| = c_v·|Dⱼ|/T and peak |q̈ⱼ| = c_a·|Dⱼ|/T² (time scaling of a rest-to-rest shape, Lynch & Park §9.2.1).
 */
export function timedPeaks(
  shape: number,
  blend: number,
  delta: ArrayLike<number>,
  durationS: number,
  outVelocity: Float64Array,
  outAcceleration: Float64Array,
): void {
  const cv = velocityFactor(shape, blend) / durationS;
  const ca = accelerationFactor(shape, blend) / (durationS * durationS);
  for (let j = 0; j < outVelocity.length; j++) {
    const d = Math.abs(delta[j]);
    outVelocity[j] = cv * d;
    outAcceleration[j] = ca * d;
  }
}

/**
 * Writes each joint's peak |q̇| for an instant move: the step must be covered in one control period,
 * so |Δqⱼ| × controlRateHz (common practice: the controller reaches the target at its next cycle).
 */
export function instantPeaks(delta: ArrayLike<number>, controlRateHz: number, outVelocity: Float64Array): void {
  for (let j = 0; j < outVelocity.length; j++) outVelocity[j] = Math.abs(delta[j]) * controlRateHz;
}

/** True when a move of this shape and duration keeps every joint within `limitScale` × its limits. */
export function withinLimits(
  shape: number,
  delta: ArrayLike<number>,
  durationS: number,
  joints: readonly Joint[],
  limitScale: number,
  scratchV: Float64Array,
  scratchA: Float64Array,
): boolean {
  if (!(durationS > 0)) {
    for (let j = 0; j < joints.length; j++) if (delta[j] !== 0) return false;
    return true;
  }
  timedPeaks(shape, moveBlend(shape, delta, durationS, joints), delta, durationS, scratchV, scratchA);
  for (let j = 0; j < joints.length; j++) {
    const joint = joints[j];
    if (scratchV[j] > joint.maxVelocity * limitScale * (1 + limitTolerance)) return false;
    const maxA = joint.maxAcceleration;
    if (maxA !== undefined && scratchA[j] > maxA * limitScale * (1 + limitTolerance)) return false;
  }
  return true;
}

/**
 * The shortest duration (s) with this shape for which no joint exceeds `limitScale` × its speed or
 * acceleration limit (1 = the fault limits, cautionRatio = the caution threshold), with the joint
 * that sets it. The analytic value from `shortestDuration` is checked with the same comparison as the
 * report and raised by the least step that makes it pass if float rounding (or the trapezoid's blend floor) put
 * it a hair short.
 */
export function safeDuration(
  shape: number,
  delta: ArrayLike<number>,
  joints: readonly Joint[],
  limitScale = 1,
): ShortestDuration {
  const found = shortestDuration(shape, delta, joints, limitScale);
  if (found.joint < 0) return found;
  const v = new Float64Array(joints.length);
  const a = new Float64Array(joints.length);
  let durationS = found.durationS;
  for (let tries = 0; tries < 64 && !withinLimits(shape, delta, durationS, joints, limitScale, v, a); tries++) {
    durationS *= 1 + Number.EPSILON * 2 ** tries; // grows geometrically: 2⁻⁵² … up to 2¹¹
  }
  return { durationS, joint: found.joint };
}
