/**
 * Conservative bounds on how fast points of the arm move, used to skip samples that provably
 * cannot change a result: between two samples Δt apart a point moving at most V m/s travels at
 * most V·Δt, and a speed whose rate of change is at most A m/s² changes by at most A·Δt.
 *
 * The bounds come from the velocity of a point p on a serial chain, v = Σᵢ q̇ᵢ·zᵢ × (p − oᵢ) for
 * a revolute joint and q̇ᵢ·zᵢ for a prismatic one (Siciliano et al., Robotics: Modelling, Planning
 * and Control, 2009, §3.1, eq. 3.30), with |p − oᵢ| bounded by the triangle inequality over the
 * chain's fixed offsets (derived: rotations keep lengths, so the distance from joint i's axis
 * origin to a point on link m is at most the sum of the origin translations between them, the
 * prismatic travel in between and the point's distance from its own link origin).
 *
 * @module
 */
import type { CompiledChain } from "./chain";
import type { CollisionModel } from "./clearance";

/** Distance bounds (m) of a chain, compiled once per arm. */
export interface ReachBounds {
  /** Chain joint count n. */
  readonly n: number;
  /** `link[i·(n+1) + m]`: bound on the distance from joint i's axis origin to any collision point of link m (0 = base). */
  readonly link: Float64Array;
  /** `tool[i]`: bound on the distance from joint i's axis origin to the tool point. */
  readonly tool: Float64Array;
}

/**
 * Compiles the distance bounds. `travelM[i]` is max(|min|, |max|) of chain joint i (used for
 * prismatic joints, whose travel lengthens the chain).
 */
export function compileReachBounds(
  chain: CompiledChain,
  model: CollisionModel,
  travelM: ArrayLike<number>,
): ReachBounds {
  const n = chain.jointCount;
  // Extent of each link's collision shapes from its own frame origin.
  const extent = new Float64Array(n + 1);
  for (let s = 0; s < model.count; s++) {
    const m = model.link[s];
    const p1 = Math.hypot(model.p1[3 * s], model.p1[3 * s + 1], model.p1[3 * s + 2]);
    let e: number;
    if (model.kind[s] === 2)
      e = p1 + Math.hypot(model.half[3 * s], model.half[3 * s + 1], model.half[3 * s + 2]); // box: centre + half diagonal
    else if (model.kind[s] === 1)
      e = Math.max(p1, Math.hypot(model.p2[3 * s], model.p2[3 * s + 1], model.p2[3 * s + 2])) + model.radius[s]; // capsule
    else e = p1 + model.radius[s]; // sphere
    if (e > extent[m]) extent[m] = e;
  }
  // Length that chain joint k adds between frame k + 1 and frame k + 2: the next joint's origin offset plus its travel.
  const step = (k: number) => {
    const o = 16 * k;
    return (
      Math.hypot(chain.origin[o + 12], chain.origin[o + 13], chain.origin[o + 14]) +
      (chain.prismatic[k] ? Math.abs(travelM[k] ?? 0) : 0)
    );
  };
  const link = new Float64Array(n * (n + 1));
  const tool = new Float64Array(n);
  const toolOffset = Math.hypot(chain.tool[12], chain.tool[13], chain.tool[14]);
  for (let i = 0; i < n; i++) {
    // Joint i moves frame i + 1 (= link i + 1) and everything after it.
    let along = 0;
    for (let m = i + 1; m <= n; m++) {
      if (m > i + 1) along += step(m - 1);
      link[i * (n + 1) + m] = along + extent[m];
    }
    tool[i] = along + toolOffset;
  }
  return { n, link, tool };
}

/**
 * Upper bound (m/s) on the speed of any collision point of each link, given the largest |q̇ᵢ|
 * of each chain joint over a move (rad/s or m/s); writes n + 1 values (link 0, the base, is 0).
 */
export function linkSpeedBounds(
  bounds: ReachBounds,
  chain: CompiledChain,
  peakQd: ArrayLike<number>,
  out: Float64Array,
): Float64Array {
  const n = bounds.n;
  out[0] = 0;
  for (let m = 1; m <= n; m++) {
    let v = 0;
    for (let i = 0; i < m; i++) v += Math.abs(peakQd[i]) * (chain.prismatic[i] ? 1 : bounds.link[i * (n + 1) + m]);
    out[m] = v;
  }
  return out;
}

/**
 * Upper bound (m/s²) on |d/dt v_tool|, the rate of change of the tool point's velocity, from the
 * largest |q̇ᵢ| and |q̈ᵢ| over a move. Derived from a = Σ q̈ᵢwᵢ + Σ q̇ᵢẇᵢ with wᵢ = zᵢ × rᵢ:
 * |wᵢ| ≤ Rᵢ, |żᵢ| ≤ Ω = Σ|q̇ₖ| over revolute joints, |ṙᵢ| ≤ |v_p| + |v_oᵢ| ≤ 2S with S = Σ|q̇ₖ|Rₖ,
 * so |a| ≤ Σ|q̈ᵢ|Rᵢ + Ω·S + 2·S·Σ|q̇ᵢ| (prismatic joints count with Rᵢ = 1). The speed |v| changes
 * no faster than |a|.
 */
export function toolAccelerationBound(
  bounds: ReachBounds,
  chain: CompiledChain,
  peakQd: ArrayLike<number>,
  peakQdd: ArrayLike<number>,
): number {
  let accel = 0,
    omega = 0,
    s = 0,
    sumQd = 0;
  for (let i = 0; i < bounds.n; i++) {
    const r = chain.prismatic[i] ? 1 : bounds.tool[i];
    const qd = Math.abs(peakQd[i]),
      qdd = Math.abs(peakQdd[i]);
    accel += qdd * r;
    if (!chain.prismatic[i]) omega += qd;
    s += qd * r;
    sumQd += qd;
  }
  return accel + omega * s + 2 * s * sumQd;
}
