/**
 * Move shapes: rest-to-rest time scalings s(τ), τ = t/T ∈ [0, 1], s(0) = 0, s(1) = 1, ṡ(0) = ṡ(1) = 0.
 * A joint moving by D over T seconds is at q(t) = q₀ + D·s(τ), with q̇ = D·s′(τ)/T and q̈ = D·s″(τ)/T².
 *
 * - `cubic`: s = 3τ² − 2τ³; peak |q̇| = 1.5·|D|/T at τ = ½, peak |q̈| = 6·|D|/T² at τ = 0 and 1.
 * - `quintic` (minimum jerk): s = 10τ³ − 15τ⁴ + 6τ⁵; peak |q̇| = 1.875·|D|/T, peak |q̈| = (10/√3)·|D|/T².
 * - `trapezoid` (synchronised trapezoidal velocity): every joint shares one profile with constant
 *   acceleration for the blend fraction b of the move, constant speed, then constant deceleration for b.
 *   Peak |q̇| = |D|/(T(1−b)), peak |q̈| = |D|/(T²·b(1−b)), 0 < b ≤ ½ (b = ½ is the triangular profile).
 *   b is chosen from the joints' limits to use the smallest share of the tightest limit: with
 *   V = maxⱼ |Dⱼ|/maxVelocityⱼ and A = maxⱼ |Dⱼ|/maxAccelerationⱼ, b = min(½, A/(T·V)), which makes the
 *   speed and acceleration shares equal; for a single joint at its shortest duration this is the
 *   time-optimal trapezoid (acceleration phase v/a). When no joint with an acceleration limit moves,
 *   b = ⅓ (cruise at 1.5·D/T, a common textbook choice).
 *
 * Shapes are monotonic from start to goal, so a move never leaves the interval between its two poses.
 *
 * @module
 */
import type { Joint } from "../plan/arm";
import type { ShapeName } from "../plan/document";

/** Numeric shape identifiers used in typed arrays (index into {@link shapeIds}). */
export const shapeIds: readonly ShapeName[] = ["cubic", "quintic", "trapezoid"];

/** Numeric identifier of a shape name, for typed-array storage. */
export function shapeId(name: ShapeName): number {
  return shapeIds.indexOf(name);
}

/** Peak |s′| of the cubic scaling: at τ = ½, s′ = 6τ − 6τ² = 1.5 (Lynch & Park, Modern Robotics, §9.2.1). */
export const cubicVelocityFactor = 1.5;
/** Peak |s″| of the cubic scaling: at τ = 0 and 1, s″ = 6 − 12τ = ±6 (Lynch & Park, §9.2.1). */
export const cubicAccelerationFactor = 6;
/** Peak |s′| of the quintic scaling: at τ = ½, 30τ² − 60τ³ + 30τ⁴ = 1.875 (Lynch & Park, §9.2.1). */
export const quinticVelocityFactor = 1.875;
/** Peak |s″| of the quintic scaling: at τ = (3 ∓ √3)/6, s″ = 60τ − 180τ² + 120τ³ = ±10/√3 (derived: s‴ = 0). */
export const quinticAccelerationFactor = 10 / Math.sqrt(3);
/** Blend fraction of the trapezoid when no acceleration limit applies (cruise 1.5·D/T; Siciliano et al. §4.2.1). */
export const defaultTrapezoidBlend = 1 / 3;

/** Smallest blend fraction the trapezoid uses (a guard against rounding, far below any real profile). */
export const minTrapezoidBlend = 1e-9;

const CUBIC = 0;
const QUINTIC = 1;
const TRAPEZOID = 2;

/**
 * Writes the time scaling at τ into `out`: `out[0]` = s(τ), `out[1]` = ds/dτ, `out[2]` = d²s/dτ².
 * τ is clamped to [0, 1] (before the start the move has not begun, after the end it rests at the goal).
 * `blend` is the trapezoid's blend fraction b (ignored by the polynomial shapes).
 */
export function scalingAt(shape: number, blend: number, tau: number, out: Float64Array): Float64Array {
  if (tau <= 0) {
    out[0] = 0;
    out[1] = 0;
    out[2] = shape === QUINTIC ? 0 : shape === CUBIC ? 6 : 1 / (blend * (1 - blend));
    return out;
  }
  if (tau >= 1) {
    out[0] = 1;
    out[1] = 0;
    out[2] = shape === QUINTIC ? 0 : shape === CUBIC ? -6 : -1 / (blend * (1 - blend));
    return out;
  }
  if (shape === CUBIC) {
    // s = 3τ² − 2τ³ (Lynch & Park, Modern Robotics, §9.2.1)
    out[0] = tau * tau * (3 - 2 * tau);
    out[1] = 6 * tau * (1 - tau);
    out[2] = 6 - 12 * tau;
  } else if (shape === QUINTIC) {
    // s = 10τ³ − 15τ⁴ + 6τ⁵ (Lynch & Park, §9.2.1), written in Horner form
    const t2 = tau * tau;
    out[0] = t2 * tau * (10 + tau * (-15 + 6 * tau));
    out[1] = 30 * t2 * (1 + tau * (-2 + tau));
    out[2] = 60 * tau * (1 + tau * (-3 + 2 * tau));
  } else {
    // trapezoid with blend b: parabolic blends of acceleration 1/(b(1−b)) around a linear cruise (derived)
    const b = blend;
    const acc = 1 / (b * (1 - b));
    if (tau < b) {
      out[0] = 0.5 * acc * tau * tau;
      out[1] = acc * tau;
      out[2] = acc;
    } else if (tau <= 1 - b) {
      out[0] = (tau - 0.5 * b) / (1 - b);
      out[1] = 1 / (1 - b);
      out[2] = 0;
    } else {
      const r = 1 - tau;
      out[0] = 1 - 0.5 * acc * r * r;
      out[1] = acc * r;
      out[2] = -acc;
    }
  }
  return out;
}

/**
 * The τ at which the trapezoid with blend fraction `blend` reaches s(τ) = `sigma` (0..1): the inverse
 * of {@link scalingAt}'s trapezoid, piecewise τ = √(2σ·b(1−b)) in the first blend, σ(1−b) + b/2 in
 * the cruise and 1 − √(2(1−σ)·b(1−b)) in the last blend (derived from the same three pieces).
 */
export function trapezoidTauAt(sigma: number, blend: number): number {
  if (sigma <= 0) return 0;
  if (sigma >= 1) return 1;
  const b = blend;
  const edge = b / (2 * (1 - b)); // s(b)
  if (sigma < edge) return Math.sqrt(2 * sigma * b * (1 - b));
  if (sigma <= 1 - edge) return sigma * (1 - b) + 0.5 * b;
  return 1 - Math.sqrt(2 * (1 - sigma) * b * (1 - b));
}

/** Peak |ds/dτ| of a shape (for the trapezoid, with blend fraction `blend`). */
export function velocityFactor(shape: number, blend: number): number {
  if (shape === CUBIC) return cubicVelocityFactor;
  if (shape === QUINTIC) return quinticVelocityFactor;
  return 1 / (1 - blend); // derived: cruise speed covers 1 − b of the move at full speed
}

/** Peak |d²s/dτ²| of a shape (for the trapezoid, with blend fraction `blend`). */
export function accelerationFactor(shape: number, blend: number): number {
  if (shape === CUBIC) return cubicAccelerationFactor;
  if (shape === QUINTIC) return quinticAccelerationFactor;
  return 1 / (blend * (1 - blend)); // derived: reach 1/(1−b) in time b
}

/**
 * The first τ at which a shape reaches its peak |ds/dτ|: ½ for the polynomial shapes (Lynch & Park,
 * §9.2.1), the start of the cruise b for the trapezoid (derived: speed is constant on [b, 1 − b]).
 */
export function velocityPeakTau(shape: number, blend: number): number {
  return shape === TRAPEZOID ? blend : 0.5;
}

/**
 * The first τ at which a shape reaches its peak |d²s/dτ²|: 0 for the cubic and the trapezoid (their
 * acceleration is largest from the start), (3 − √3)/6 for the quintic (derived: root of s‴ = 0).
 */
export function accelerationPeakTau(shape: number): number {
  return shape === QUINTIC ? (3 - Math.sqrt(3)) / 6 : 0;
}

/** The largest |Dⱼ|/maxVelocityⱼ over the joints (s) and the largest |Dⱼ|/maxAccelerationⱼ (s²). */
function limitShares(delta: ArrayLike<number>, joints: readonly Joint[]): { speedS: number; accelS2: number } {
  let speedS = 0;
  let accelS2 = 0;
  for (let j = 0; j < joints.length; j++) {
    const d = Math.abs(delta[j]);
    const joint = joints[j];
    const v = d / joint.maxVelocity;
    if (v > speedS) speedS = v;
    if (joint.maxAcceleration !== undefined) {
      const a = d / joint.maxAcceleration;
      if (a > accelS2) accelS2 = a;
    }
  }
  return { speedS, accelS2 };
}

/**
 * The trapezoid's blend fraction for a move of displacement `delta` (per joint) over `durationS` > 0:
 * b = min(½, A/(T·V)) (see the module comment); ½ for a zero-length move, ⅓ without acceleration limits.
 */
export function trapezoidBlend(delta: ArrayLike<number>, durationS: number, joints: readonly Joint[]): number {
  const { speedS, accelS2 } = limitShares(delta, joints);
  if (speedS === 0) return 0.5; // nothing moves: any blend gives zero speed
  if (accelS2 === 0) return defaultTrapezoidBlend;
  if (!(durationS > 0)) return 0.5;
  // derived: speed share = acceleration share; floored at 10⁻⁹ so rounding in tiny displacements cannot
  // drive the blend (and the acceleration 1/(b(1−b))) to zero or infinity
  return Math.min(0.5, Math.max(minTrapezoidBlend, accelS2 / (durationS * speedS)));
}

/** The blend fraction a move uses: the trapezoid's from {@link trapezoidBlend}, 0 for the polynomial shapes. */
export function moveBlend(
  shape: number,
  delta: ArrayLike<number>,
  durationS: number,
  joints: readonly Joint[],
): number {
  return shape === TRAPEZOID ? trapezoidBlend(delta, durationS, joints) : 0;
}

/** The shortest duration (s) for this shape and displacement, and the joint that sets it (−1 if none moves). */
export interface ShortestDuration {
  /** Shortest duration in seconds (0 for a zero-length move). */
  durationS: number;
  /** Index of the joint whose limit sets the duration, or −1 when no joint moves. */
  joint: number;
}

/**
 * The analytic shortest duration (s) for which every joint's peak speed is at most
 * `limitScale` × maxVelocity and its peak acceleration at most `limitScale` × maxAcceleration (when given).
 * Polynomial shapes: T ≥ c_v·|D|/v and T ≥ √(c_a·|D|/a) (time scaling: velocity ∝ 1/T, acceleration ∝ 1/T²).
 * Trapezoid: T = V + A/V when V² ≥ A, else 2√A (Nagarajan, Introduction to Industrial Robotics, eqs. 10.26–10.28),
 * with V and A the largest per-joint shares of the scaled limits.
 */
export function shortestDuration(
  shape: number,
  delta: ArrayLike<number>,
  joints: readonly Joint[],
  limitScale = 1,
): ShortestDuration {
  let durationS = 0;
  let joint = -1;
  if (shape === TRAPEZOID) {
    let speedS = 0;
    let accelS2 = 0;
    let speedJoint = -1;
    let accelJoint = -1;
    for (let j = 0; j < joints.length; j++) {
      const d = Math.abs(delta[j]);
      if (d === 0) continue;
      const v = d / (joints[j].maxVelocity * limitScale);
      if (v > speedS) {
        speedS = v;
        speedJoint = j;
      }
      const maxA = joints[j].maxAcceleration;
      if (maxA !== undefined) {
        const a = d / (maxA * limitScale);
        if (a > accelS2) {
          accelS2 = a;
          accelJoint = j;
        }
      }
    }
    if (speedJoint < 0) return { durationS: 0, joint: -1 };
    if (accelS2 === 0) return { durationS: speedS / (1 - defaultTrapezoidBlend), joint: speedJoint };
    if (speedS * speedS >= accelS2) {
      // cruise reached: T = D/v + v/a (Nagarajan eq. 10.27, in shares of the tightest limits)
      return { durationS: speedS + accelS2 / speedS, joint: speedJoint };
    }
    // triangular: T = 2√(D/a) (Nagarajan eq. 10.28)
    return { durationS: 2 * Math.sqrt(accelS2), joint: accelJoint };
  }
  const cv = velocityFactor(shape, 0);
  const ca = accelerationFactor(shape, 0);
  for (let j = 0; j < joints.length; j++) {
    const d = Math.abs(delta[j]);
    if (d === 0) continue;
    const tv = (cv * d) / (joints[j].maxVelocity * limitScale); // peak speed c_v·D/T ≤ v
    if (tv > durationS) {
      durationS = tv;
      joint = j;
    }
    const maxA = joints[j].maxAcceleration;
    if (maxA !== undefined) {
      const ta = Math.sqrt((ca * d) / (maxA * limitScale)); // peak acceleration c_a·D/T² ≤ a
      if (ta > durationS) {
        durationS = ta;
        joint = j;
      }
    }
  }
  return { durationS, joint };
}

/**
 * The largest |ds/dτ| of a shape on [a, b] as a share (0..1) of its peak {@link velocityFactor}:
 * every shape's s′ rises to its peak at τ = ½ and falls back symmetrically (the cubic and the quintic;
 * the trapezoid rises, cruises and falls), so on [a, b] it is s′ at the point of [a, b] nearest ½.
 * `scratch` (3 values) is overwritten.
 */
export function speedShareOn(shape: number, blend: number, a: number, b: number, scratch: Float64Array): number {
  scalingAt(shape, blend, Math.min(Math.max(0.5, a), b), scratch);
  return Math.min(1, Math.abs(scratch[1]) / velocityFactor(shape, blend));
}
