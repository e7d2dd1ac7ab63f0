/**
 * Conversion of Denavit–Hartenberg tables (standard and modified) into the chain form of
 * `arm.chain` (joint origins as xyz/rpy and a z axis, the URDF joint model).
 *
 * @module
 */
import type { ArmChain, Link } from "../plan/arm-model";
import * as mat4 from "./mat4";

/** One DH row: lengths in metres, angles in radians; `theta`/`d` are the joint's offsets. */
export interface DhRow {
  /** Link length a (m). */
  a: number;
  /** Link twist α (rad). */
  alpha: number;
  /** Link offset d (m); for a prismatic joint the joint value adds to it. */
  d: number;
  /** Joint angle offset θ (rad); for a revolute joint the joint value adds to it. */
  theta: number;
  /** Joint kind; defaults to revolute. */
  type?: "revolute" | "prismatic";
  /** Optional link description carried into the chain. */
  link?: Link;
}

function originOf(m: Float64Array) {
  const rpy = mat4.toRpy([0, 0, 0], m) as number[];
  return {
    xyz: [m[12], m[13], m[14]] as [number, number, number],
    rpy: [rpy[0], rpy[1], rpy[2]] as [number, number, number],
  };
}

function product(...ms: Float64Array[]): Float64Array {
  const out = mat4.create();
  for (const m of ms) mat4.multiply(out, out, m);
  return out;
}

/**
 * Standard DH, Aᵢ = Rz(θᵢ)·Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ) (Spong et al. / Siciliano et al. §2.8.2).
 * Writing Aᵢ = Rz(qᵢ)·Fᵢ with Fᵢ = Rz(θ-offset)·Tz(d)·Tx(a)·Rx(α) (and Tz(qᵢ)·Fᵢ for a
 * prismatic row, since Rz and Tz commute), the product A₁…Aₙ becomes joint 1 at the base
 * frame, joint i+1 at origin Fᵢ, and the tool at Fₙ·tool (derived).
 */
export function chainFromStandardDh(rows: readonly DhRow[], tool?: ArmChain["tool"]): ArmChain {
  const tmp = [mat4.create(), mat4.create(), mat4.create(), mat4.create()];
  const fixed = rows.map((r) =>
    product(
      mat4.fromRotationZ(tmp[0], r.theta),
      mat4.fromTranslation(tmp[1], 0, 0, r.d),
      mat4.fromTranslation(tmp[2], r.a, 0, 0),
      mat4.fromRotationX(tmp[3], r.alpha),
    ),
  );
  const toolM = tool ? mat4.fromXyzRpy(mat4.create(), tool.xyz, tool.rpy) : mat4.create();
  return {
    base: { name: "base", collision: [] },
    joints: rows.map((r, i) => ({
      origin: i === 0 ? { xyz: [0, 0, 0], rpy: [0, 0, 0] } : originOf(fixed[i - 1]),
      axis: [0, 0, 1],
      link: r.link ?? { collision: [] },
    })),
    tool: originOf(product(fixed[rows.length - 1], toolM)),
    gravity: [0, 0, -9.81],
  };
}

/**
 * Modified DH (Craig, Introduction to Robotics, 3rd ed., eq. 3.6):
 * Aᵢ = Rx(αᵢ₋₁)·Tx(aᵢ₋₁)·Rz(θᵢ)·Tz(dᵢ), where row i holds (aᵢ₋₁, αᵢ₋₁, dᵢ, θᵢ).
 * Since Rz(θ-offset + q)·Tz(d) = Rz(θ-offset)·Tz(d)·Rz(q), joint i's origin is
 * Rx(α)·Tx(a)·Rz(θ-offset)·Tz(d) with axis z; the tool is the given offset (derived).
 */
export function chainFromModifiedDh(rows: readonly DhRow[], tool?: ArmChain["tool"]): ArmChain {
  const tmp = [mat4.create(), mat4.create(), mat4.create(), mat4.create()];
  return {
    base: { name: "base", collision: [] },
    joints: rows.map((r) => ({
      origin: originOf(
        product(
          mat4.fromRotationX(tmp[0], r.alpha),
          mat4.fromTranslation(tmp[1], r.a, 0, 0),
          mat4.fromRotationZ(tmp[2], r.theta),
          mat4.fromTranslation(tmp[3], 0, 0, r.d),
        ),
      ),
      axis: [0, 0, 1],
      link: r.link ?? { collision: [] },
    })),
    tool: tool ?? { xyz: [0, 0, 0], rpy: [0, 0, 0] },
    gravity: [0, 0, -9.81],
  };
}
