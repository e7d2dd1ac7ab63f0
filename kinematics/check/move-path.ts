/**
 * A move's path apart from its timing. Along a fixed path q(τ) = q₀ + s(τ)·D, τ = t/T, the joint
 * velocity is D·s′/T and the acceleration D·s″/T², so the joint effort of a rigid chain splits
 * exactly by how it scales with the duration T:
 *
 *   τⱼ(τ, T) = Mⱼ(τ)/T² + F_vⱼ·Dⱼ·s′(τ)/T + gⱼ(τ) + F_cⱼ·sgn(Dⱼ·s′(τ)/T)
 *
 * with Mⱼ the inertial and Coriolis terms of the path at T = 1 and gⱼ gravity (time scaling of the
 * manipulator dynamics: Hollerbach, "Dynamic scaling of manipulator trajectories", ASME J. Dynamic
 * Systems, Measurement and Control, 1984 — memory; derived here from the Newton–Euler equations,
 * which are linear in q̈ and quadratic in q̇). The tool-point speed is |J(q(τ))·D·s′(τ)|/T, exactly
 * 1/T on the path (Siciliano et al. 2009, §3.1). A change of duration then costs a few multiply-adds
 * per path point.
 *
 * Every shape moves along the same straight joint-space segment q(σ) = q₀ + σ·D, σ = s(τ). A
 * trapezoid's blend changes with its duration, and with it where τ lands on the segment, so its
 * terms are kept per point σ of the segment, apart from the timing: Mⱼ = mⱼ(σ)·s″ + cⱼ(σ)·s′², with
 * m the inertial term per unit σ̈ and c the Coriolis and centripetal term per unit σ̇² (the
 * path-parameter form of the dynamics: Bobrow, Dubowsky & Gibson, "Time-optimal control of robotic
 * manipulators along specified paths", Int. J. Robotics Research 4(3), 1985 — memory), and the tool
 * speed u(σ)·s′/T with u = |J(q(σ))·D|. Its grid and split points are chosen by σ, so the segment's
 * points computed for one duration serve every other (only the blend ends and the control samples
 * are new). A polynomial shape's τ ↦ σ is fixed, so its path terms are evaluated at τ directly.
 *
 * Peaks are those of the control samples, as in the control-rate check, but only the samples that
 * could hold a peak are evaluated: a coarse grid of path points bounds each interval between them
 * with a curvature estimate (divided differences, safety factor 4), and only intervals whose bound
 * reaches the peak found so far are split down to their samples. The evaluated points are memoised
 * in the path.
 *
 * @module
 */
import { gravityEffortAtLastPose, inverseDynamics, toolSpeedAtLastPose } from "../arm/dynamics";
import { scalingAt, shapeId, trapezoidTauAt } from "../motion/shapes";
import type { ArmState } from "./arm-state";

/** Intervals of the coarse path grid (the trapezoid's blend ends are added as extra points). */
export const pathGridIntervals = 64;

/** Safety factor on the curvature estimate of the refinement bound. */
const curvatureSafety = 4;

/** Deepest bisection of one grid interval (2⁻³² of it: far below any control period). */
const maxRefineDepth = 32;

/** Most interval splits per channel and duration; past it an interval's bound stands for its peak. */
const maxSplitsPerChannel = 20_000;

/**
 * The arm's terms along one geometric segment q(σ) = q₀ + σ·D, per evaluated σ (stride `3n + 1`:
 * mⱼ, cⱼ, gⱼ, u; see the module comment), memoised by σ in one pool grown by doubling.
 */
export interface PathSegment {
  readonly n: number;
  readonly from: Float64Array;
  readonly delta: Float64Array;
  /** Slot of each evaluated σ (its terms at slot × stride in `terms`). */
  readonly slot: Map<number, number>;
  terms: Float64Array;
}

/** Path terms of one move, per evaluated point (stride `2n + 2`: Mⱼ, gⱼ, s′, tool speed at T = 1). */
export interface MovePath {
  /** Chain joint count. */
  readonly n: number;
  /** Grid τ values, ascending, from 0 to 1. */
  readonly tau: Float64Array;
  /** The segment position σ = s(τ) of each grid point. */
  readonly sigma: Float64Array;
  /** Per grid interval: 1 when the shape's acceleration jumps inside it (a trapezoid's blend end). */
  readonly jumps: Uint8Array;
  /** A trapezoid's segment terms, shared by its paths at every blend (null for the polynomial shapes). */
  readonly segment: PathSegment | null;
  /** Terms at the grid points, stride `2n + 2`. */
  readonly grid: Float64Array;
  /** Slot of each memoised refinement point, by τ (its terms at slot × stride in `extraTerms`). */
  readonly extraSlot: Map<number, number>;
  /** Terms at the memoised refinement points, stride `2n + 2` (one pool, grown by doubling). */
  extraTerms: Float64Array;
  /** Displacement of the chain joints (rad or m). */
  readonly delta: Float64Array;
  /** Start pose of the chain joints. */
  readonly from: Float64Array;
  readonly shape: number;
  readonly blend: number;
}

/** Largest number of cached paths per compiled arm (oldest dropped first). */
const maxCachedPaths = 512;

/** Largest number of cached segments per compiled arm, and of evaluated points per segment. */
const maxCachedSegments = 256;
const maxSegmentPoints = 16_384;

const TRAPEZOID = shapeId("trapezoid");

/** The segment of chain joints `from` + σ·`delta`, cached in the arm state. */
function segmentOf(s: ArmState, from: ArrayLike<number>, delta: ArrayLike<number>): PathSegment {
  const n = s.n;
  let key = "";
  for (let i = 0; i < n; i++) key += `${from[i]}|${delta[i]}|`;
  const cached = s.segments.get(key);
  if (cached) {
    s.segments.delete(key); // most recently used last
    s.segments.set(key, cached);
    return cached;
  }
  const segment: PathSegment = {
    n,
    from: Float64Array.from({ length: n }, (_, i) => from[i]),
    delta: Float64Array.from({ length: n }, (_, i) => delta[i]),
    slot: new Map(),
    terms: new Float64Array(96 * (3 * n + 1)),
  };
  s.segments.set(key, segment);
  if (s.segments.size > maxCachedSegments) s.segments.delete(s.segments.keys().next().value as string);
  return segment;
}

/**
 * The offset in `segment.terms` of the terms at σ (read `segment.terms` after the call, the pool may
 * have grown): m from the inverse dynamics at q̇ = 0, q̈ = D; c and the tool speed per unit σ̇ at
 * q̇ = D, q̈ = 0 (neither with gravity or friction); g from the same link rotations.
 */
function segmentPoint(s: ArmState, segment: PathSegment, sigma: number): number {
  const n = segment.n,
    stride = 3 * n + 1;
  const known = segment.slot.get(sigma);
  if (known !== undefined) return known * stride;
  if (segment.slot.size >= maxSegmentPoints) segment.slot.clear();
  const next = segment.slot.size;
  if ((next + 1) * stride > segment.terms.length) {
    const grown = new Float64Array(segment.terms.length * 2);
    grown.set(segment.terms);
    segment.terms = grown;
  }
  const o = next * stride,
    out = segment.terms;
  const q = s.searchQ,
    zero = s.dynamics.zero,
    tmp = s.tau,
    D = segment.delta;
  for (let i = 0; i < n; i++) q[i] = segment.from[i] + sigma * D[i];
  inverseDynamics(s.chain, s.dynamics, q, D, zero, tmp, 0, 0, false, false);
  for (let i = 0; i < n; i++) out[o + n + i] = tmp[i];
  // the tool speed from the same forward pass (its rotations and angular velocities)
  out[o + 3 * n] = toolSpeedAtLastPose(s.chain, s.dynamics, D);
  // gravity at the same pose, reusing the link rotations of the call above
  gravityEffortAtLastPose(s.chain, s.dynamics, tmp);
  for (let i = 0; i < n; i++) out[o + 2 * n + i] = tmp[i];
  inverseDynamics(s.chain, s.dynamics, q, zero, D, tmp, 0, 0, false, false);
  for (let i = 0; i < n; i++) out[o + i] = tmp[i];
  segment.slot.set(sigma, next);
  return o;
}

/**
 * Writes the path terms at τ into `out` at `offset`. A polynomial shape's τ ↦ σ does not depend on
 * the duration, so its path (one per segment) is evaluated at τ directly, one Newton–Euler pass at
 * q̇ = D·s′, q̈ = D·s″; a trapezoid's comes from the segment's terms at σ = s(τ), or at `sigma` when
 * given (a grid or split point chosen by σ, where s(τ) equals it up to rounding).
 */
function evaluatePoint(s: ArmState, path: MovePath, tau: number, out: Float64Array, offset: number, sigma = NaN): void {
  const { n } = path;
  scalingAt(path.shape, path.blend, tau, s.scale);
  const sp = s.scale[1],
    spp = s.scale[2];
  if (path.shape !== TRAPEZOID) {
    const q = s.searchQ,
      qd = s.searchQd,
      qdd = s.searchQdd,
      tmp = s.tau;
    for (let i = 0; i < n; i++) {
      q[i] = path.from[i] + s.scale[0] * path.delta[i];
      qd[i] = path.delta[i] * sp; // q̇ at T = 1
      qdd[i] = path.delta[i] * spp;
    }
    inverseDynamics(s.chain, s.dynamics, q, qd, qdd, tmp, 0, 0, false, false);
    for (let i = 0; i < n; i++) out[offset + i] = tmp[i];
    // the tool speed from the same forward pass (its rotations and angular velocities)
    out[offset + 2 * n + 1] = toolSpeedAtLastPose(s.chain, s.dynamics, qd);
    // gravity at the same pose, reusing the link rotations of the call above
    gravityEffortAtLastPose(s.chain, s.dynamics, tmp);
    for (let i = 0; i < n; i++) out[offset + n + i] = tmp[i];
    out[offset + 2 * n] = sp;
    return;
  }
  const segment = path.segment!;
  const o = segmentPoint(s, segment, Number.isNaN(sigma) ? s.scale[0] : sigma);
  const t = segment.terms;
  for (let i = 0; i < n; i++) {
    out[offset + i] = t[o + i] * spp + t[o + n + i] * sp * sp;
    out[offset + n + i] = t[o + 2 * n + i];
  }
  out[offset + 2 * n] = sp;
  out[offset + 2 * n + 1] = t[o + 3 * n] * sp;
}

/** The σ of the trapezoid's grid: the cubic's s at uniform τ (dense near both ends, like the trapezoid's). */
const trapezoidGridSigma = Float64Array.from({ length: pathGridIntervals + 1 }, (_, k) => {
  const t = k / pathGridIntervals;
  return t * t * (3 - 2 * t);
});

/** A path's grid points, τ and σ, and which of its intervals hold a jump of the acceleration. */
interface PathGrid {
  tau: Float64Array;
  sigma: Float64Array;
  jumps: Uint8Array;
}

/** The grids of the polynomial shapes, which do not depend on the duration. */
const polynomialGrids = new Map<number, PathGrid>();

/**
 * The grid of a path, τ and σ: uniform in τ for the polynomial shapes; for the trapezoid, at fixed σ
 * (the same segment points at every blend) plus both sides of each blend end, where its acceleration
 * jumps.
 */
function gridOf(shape: number, blend: number): PathGrid {
  if (shape !== TRAPEZOID) {
    let grid = polynomialGrids.get(shape);
    if (!grid) {
      const scale = new Float64Array(3);
      const tau = Float64Array.from({ length: pathGridIntervals + 1 }, (_, k) => k / pathGridIntervals);
      const sigma = tau.map((t) => scalingAt(shape, blend, t, scale)[0]);
      polynomialGrids.set(shape, (grid = { tau, sigma, jumps: new Uint8Array(pathGridIntervals) }));
    }
    return grid; // shared, never written
  }
  // the fixed σ points and both sides of each blend end (if b ≤ ½), merged by τ
  const kinks = blend > 0 && blend <= 0.5 ? [blend * (1 - 1e-9), blend, 1 - blend, (1 - blend) * (1 + 1e-9)] : [];
  const size = trapezoidGridSigma.length + kinks.length;
  const tau = new Float64Array(size),
    sigma = new Float64Array(size);
  const scale = new Float64Array(3);
  let count = 0,
    next = 0;
  const push = (t: number, sg: number) => {
    if (count > 0 && t - tau[count - 1] <= 1e-13) return;
    tau[count] = t;
    sigma[count++] = sg;
  };
  for (const sg of trapezoidGridSigma) {
    const t = trapezoidTauAt(sg, blend);
    for (; next < kinks.length && kinks[next] < t; next++)
      push(kinks[next], scalingAt(shape, blend, kinks[next], scale)[0]);
    push(t, sg);
  }
  for (; next < kinks.length; next++) push(kinks[next], scalingAt(shape, blend, kinks[next], scale)[0]);
  // the accelerating side ends just before b, the decelerating side starts just after 1 − b
  const jumps = new Uint8Array(count - 1);
  for (let k = 0; k + 1 < count; k++) {
    const a = tau[k],
      b = tau[k + 1];
    if ((a < blend && b >= blend) || (a <= 1 - blend && b > 1 - blend)) jumps[k] = 1;
  }
  return { tau: tau.slice(0, count), sigma: sigma.slice(0, count), jumps };
}

/**
 * Where an interval [a, b] of a path is split, τ and σ: its middle in τ for the polynomial shapes
 * (whose τ ↦ σ does not depend on the duration), in σ for the trapezoid (the same segment point at
 * every blend).
 */
function splitOf(path: MovePath, a: number, sa: number, b: number, sb: number): { tau: number; sigma: number } {
  if (path.shape === TRAPEZOID) {
    const sigma = (sa + sb) / 2;
    const tau = trapezoidTauAt(sigma, path.blend);
    if (tau > a && tau < b) return { tau, sigma };
  }
  return { tau: (a + b) / 2, sigma: NaN };
}

/**
 * The path terms of a move (chain joints of `from` and `delta`), computed once and cached in the
 * arm state by start, displacement, shape and blend.
 */
export function movePath(
  s: ArmState,
  from: ArrayLike<number>,
  delta: ArrayLike<number>,
  shape: number,
  blend: number,
): MovePath {
  const n = s.n;
  let key = `${shape}|${blend}`;
  for (let i = 0; i < n; i++) key += `|${from[i]}|${delta[i]}`;
  const cached = s.paths.get(key);
  if (cached) {
    s.paths.delete(key); // most recently used last
    s.paths.set(key, cached);
    return cached;
  }
  const { tau, sigma, jumps } = gridOf(shape, blend);
  const stride = 2 * n + 2;
  const path: MovePath = {
    n,
    tau,
    sigma,
    jumps,
    segment: shape === TRAPEZOID ? segmentOf(s, from, delta) : null,
    grid: new Float64Array(tau.length * stride),
    extraSlot: new Map(),
    extraTerms: new Float64Array(16 * stride),
    delta: Float64Array.from({ length: n }, (_, i) => delta[i]),
    from: Float64Array.from({ length: n }, (_, i) => from[i]),
    shape,
    blend,
  };
  for (let k = 0; k < tau.length; k++) evaluatePoint(s, path, tau[k], path.grid, k * stride, sigma[k]);
  s.paths.set(key, path);
  if (s.paths.size > maxCachedPaths) s.paths.delete(s.paths.keys().next().value as string);
  return path;
}

/**
 * The offset in `path.extraTerms` of the path terms at a refinement point τ (memoised in one pool,
 * so a point costs no allocation; read `path.extraTerms` after the call, the pool may have grown).
 */
function termsAt(s: ArmState, path: MovePath, tau: number, sigma = NaN): number {
  const stride = 2 * path.n + 2;
  const slot = path.extraSlot.get(tau);
  if (slot !== undefined) return slot * stride;
  const next = path.extraSlot.size;
  if ((next + 1) * stride > path.extraTerms.length) {
    const grown = new Float64Array(path.extraTerms.length * 2);
    grown.set(path.extraTerms);
    path.extraTerms = grown;
  }
  evaluatePoint(s, path, tau, path.extraTerms, next * stride, sigma);
  path.extraSlot.set(tau, next);
  return next * stride;
}

/**
 * |effort| of chain joint j (N·m or N) at duration T from path terms at `offset`:
 * |Mⱼ/T² + F_v·Dⱼ·s′/T + gⱼ + F_c·tanh(Dⱼ·s′/(T·ε))| (the decomposition of the module comment, with
 * the smoothed sign of `frictionEffort`).
 */
function effortOf(s: ArmState, path: MovePath, terms: Float64Array, offset: number, j: number, T: number): number {
  const n = path.n;
  const x = 1 / T;
  const qd = path.delta[j] * terms[offset + 2 * n] * x;
  const d = s.dynamics;
  return Math.abs(
    terms[offset + j] * x * x +
      d.viscous[j] * qd +
      terms[offset + n + j] +
      d.coulomb[j] * Math.tanh(qd / d.signEpsilon),
  );
}

/** Channel c of a path point at duration T: c < n the effort of joint c, c = n the tool speed (m/s). */
function channelOf(s: ArmState, path: MovePath, terms: Float64Array, offset: number, c: number, T: number): number {
  if (c < path.n) return effortOf(s, path, terms, offset, c, T);
  return terms[offset + 2 * path.n + 1] / T;
}

/** Peaks of a path at one duration: per chain joint the largest |effort|, and the tool speed. */
export interface PathPeaks {
  /** Largest |τⱼ| per chain joint (N·m or N). */
  effort: Float64Array;
  /** τ (0..1) of each effort peak. */
  effortTau: Float64Array;
  /** Largest tool-point speed (m/s). */
  toolSpeed: number;
  /** τ of the tool-speed peak. */
  toolTau: number;
}

/** Allocates a {@link PathPeaks} for n chain joints. */
export function createPathPeaks(n: number): PathPeaks {
  return { effort: new Float64Array(n), effortTau: new Float64Array(n), toolSpeed: 0, toolTau: 0 };
}

/** Largest number of memoised refinement points per path before the memo is cleared. */
const maxExtraPoints = 8192;

/** Control samples an interval may hold before it is evaluated sample by sample rather than split. */
const samplesPerLeaf = 4;

/**
 * How far (a fraction) below the largest sample a reported peak may be, where no decision lies
 * between them (see {@link channelPeak}'s `levels`): ten times inside the 0.1% to which the peaks
 * must agree with the control-rate check.
 */
export const peakSlack = 1e-4;

/** The peak of one channel and where it is (τ). */
interface ChannelPeak {
  peak: number;
  tau: number;
  /** The largest value at the grid points (not samples: an estimate, below the peak or near it). */
  gridPeak: number;
}

/**
 * Peak of channel `c` (see {@link channelOf}) along the path at duration `durationS` (> 0), at the
 * control samples t = k/rateHz (and the end) that the control-rate check evaluates. The grid values
 * only bound: an interval between two grid points is skipped when its curvature bound lies below
 * the peak found so far, else it is split until it holds a few samples, which are evaluated.
 * Deterministic for a given path, duration and rate (the memo only saves work). With `stopAbove`,
 * the scan ends as soon as the peak found exceeds it (the peak only grows, so "exceeds" is then
 * final); the traversal up to that point is the same as without it. `visited`, when given,
 * receives the τ of every evaluated sample. With a finite `threshold`, only the samples that could
 * exceed it are evaluated (intervals whose bound is at or below it are skipped, and there are no
 * seeds): the peak is then exact when it exceeds the threshold and otherwise only at most it
 * (−1 when no sample was evaluated) — enough to tell whether anything exceeds a limit. With
 * `levels` (the values a decision compares the peak with), an interval is also skipped when its
 * bound lies within {@link peakSlack} of the peak found and no level lies between the two: the
 * peak is then a sample's value at most that fraction below the largest, and on the same side of
 * every level.
 */
function channelPeak(
  s: ArmState,
  path: MovePath,
  durationS: number,
  rateHz: number,
  c: number,
  best: ChannelPeak,
  stopAbove = Infinity,
  visited?: number[],
  threshold = -Infinity,
  levels?: readonly number[],
): ChannelPeak {
  const n = path.n;
  const stride = 2 * n + 2;
  const { tau, grid } = path;
  const count = tau.length;
  const perTau = rateHz * durationS; // control samples per unit τ
  const last = Math.floor(perTau + 1e-9) + 1; // the sample index of the end (t = T), as in sampleMove
  // τ of sample k computed as the control-rate check computes it (t = k/rate, then t/T): a sample that
  // lands on a trapezoid's blend end must fall on the same side of it in both checks
  const sampleTau = (k: number) => (k >= last ? 1 : Math.min(k / rateHz, durationS) / durationS);
  const values = s.pathValues.length >= count ? s.pathValues : (s.pathValues = new Float64Array(count));
  let gridMax = 0;
  for (let k = 0; k < count; k++) {
    const v = channelOf(s, path, grid, k * stride, c, durationS);
    values[k] = v;
    if (v > values[gridMax]) gridMax = k;
  }
  best.peak = -1;
  best.tau = 0;
  best.gridPeak = values[gridMax];
  let splits = 0;
  let stopped = false;
  const evaluate = (k: number) => {
    const t = sampleTau(k);
    visited?.push(t);
    const o = termsAt(s, path, t);
    const v = channelOf(s, path, path.extraTerms, o, c, durationS);
    if (v > best.peak || (v === best.peak && t < best.tau)) {
      best.peak = v;
      best.tau = t;
      if (v > stopAbove) stopped = true;
    }
  };
  // seed with the ends and the samples around the largest grid value (a threshold scan needs no
  // seeds: only intervals whose bound passes the threshold are looked at)
  if (threshold === -Infinity) {
    evaluate(0);
    evaluate(last);
    const around = Math.floor(tau[gridMax] * perTau);
    for (let k = Math.max(0, around - 1); k <= Math.min(last, around + 2); k++) evaluate(k);
  }
  // Curvature estimate at each grid point from divided differences (0 at the ends, and where one of
  // the two intervals holds a trapezoid's blend end: the acceleration jumps there, so a difference
  // across it says nothing of the curvature on either side, which the other points estimate).
  const jumps = path.jumps;
  const curvature = (k: number) => {
    if (k <= 0 || k >= count - 1 || jumps[k - 1] || jumps[k]) return 0;
    const h0 = tau[k] - tau[k - 1],
      h1 = tau[k + 1] - tau[k];
    return Math.abs((2 * ((values[k + 1] - values[k]) / h1 - (values[k] - values[k - 1]) / h0)) / (h0 + h1));
  };
  const visit = (a: number, sa: number, va: number, b: number, sb: number, vb: number, K: number, depth: number) => {
    if (stopped) return;
    const h = b - a;
    const bound = Math.max(va, vb) + (curvatureSafety * K * h * h) / 8;
    if (bound <= best.peak * (1 + 1e-12) + 1e-300 || bound <= threshold) return;
    if (levels && bound <= best.peak * (1 + peakSlack) && !levels.some((l) => l >= best.peak && l < bound)) return;
    const k0 = Math.ceil(a * perTau - 1e-9),
      k1 = Math.min(last, Math.floor(b * perTau + 1e-9) + (b >= 1 ? 1 : 0));
    if (k1 < k0) return;
    if (k1 - k0 < samplesPerLeaf) {
      for (let k = k0; k <= k1; k++) evaluate(k);
      return;
    }
    if (depth >= maxRefineDepth || ++splits > maxSplitsPerChannel) {
      // out of refinement: take the bound itself, never less (no false pass)
      if (bound > best.peak) {
        best.peak = bound;
        best.tau = (a + b) / 2;
        if (bound > stopAbove) stopped = true;
      }
      return;
    }
    const split = splitOf(path, a, sa, b, sb);
    const m = split.tau;
    const om = termsAt(s, path, m, split.sigma);
    const vm = channelOf(s, path, path.extraTerms, om, c, durationS);
    const sm = Number.isNaN(split.sigma) ? (sa + sb) / 2 : split.sigma; // σ only steers a trapezoid's splits
    // second divided difference over the two parts (2·f[a, m, b], |f″| for a parabola), the
    // parent's estimate shrunk with h² as a floor
    const Km = Math.max(Math.abs((2 * ((vb - vm) / (b - m) - (vm - va) / (m - a))) / h), K / 4);
    visit(a, sa, va, m, sm, vm, Km, depth + 1);
    visit(m, sm, vm, b, sb, vb, Km, depth + 1);
  };
  const sigma = path.sigma;
  for (let k = 0; k + 1 < count && !stopped; k++) {
    const K = Math.max(curvature(k - 1), curvature(k), curvature(k + 1), curvature(k + 2));
    visit(tau[k], sigma[k], values[k], tau[k + 1], sigma[k + 1], values[k + 1], K, 0);
  }
  return best;
}

/**
 * Peak |effort| of every chain joint and peak tool speed along the path at duration `durationS`
 * (> 0), at the control samples the control-rate check evaluates (see {@link channelPeak}).
 * `visited`, when given, receives the τ of every evaluated sample. With `levels` (per channel, the
 * values its findings compare the peak with), a peak may lie up to {@link peakSlack} below the
 * largest sample, never across a level; without, it is the largest sample.
 */
export function pathPeaks(
  s: ArmState,
  path: MovePath,
  durationS: number,
  rateHz: number,
  out: PathPeaks,
  visited?: number[],
  levels?: readonly (readonly number[])[],
): PathPeaks {
  const n = path.n;
  if (path.extraSlot.size > maxExtraPoints) path.extraSlot.clear();
  const best: ChannelPeak = { peak: -1, tau: 0, gridPeak: -1 };
  for (let c = 0; c <= n; c++) {
    channelPeak(s, path, durationS, rateHz, c, best, Infinity, visited, -Infinity, levels?.[c]);
    if (c < n) {
      out.effort[c] = best.peak;
      out.effortTau[c] = best.tau;
    } else {
      out.toolSpeed = best.peak;
      out.toolTau = best.tau;
    }
  }
  return out;
}

/**
 * Raises `ratio[0]` to a channel's peak ÷ limit after a threshold scan: its peak when a sample was
 * evaluated, else its largest grid value (every bound was below the limit, so no sample was looked
 * at). Only an estimate for the search's interpolation; it never decides a verdict.
 */
function estimateRatio(ratio: Float64Array, best: ChannelPeak, limit: number): void {
  const value = best.peak >= 0 ? best.peak : best.gridPeak;
  if (value >= 0 && !(value / limit <= ratio[0])) ratio[0] = value / limit;
}

/**
 * The first channel (in the order of `order`: c < n the effort of chain joint c, c = n the tool
 * speed) whose peak along the path at `durationS` exceeds `above[c]`, or −1 when none does: the
 * same answer as comparing the peaks of {@link pathPeaks} with `above`, but each channel's scan
 * stops at the first sample over its limit, and a channel whose limit is Infinity is not scanned.
 * `ratio[0]`, when given, receives the largest peak ÷ limit among the samples evaluated (over 1 when
 * something exceeds: the first such sample's), or of the grid values of a channel with no sample
 * evaluated: an estimate for the search's interpolation that never decides a verdict.
 */
export function pathExceeds(
  s: ArmState,
  path: MovePath,
  durationS: number,
  rateHz: number,
  above: Float64Array,
  order: readonly number[],
  ratio?: Float64Array,
): number {
  if (path.extraSlot.size > maxExtraPoints) path.extraSlot.clear();
  const best: ChannelPeak = { peak: -1, tau: 0, gridPeak: -1 };
  if (ratio) ratio[0] = NaN;
  for (const c of order) {
    if (above[c] === Infinity) continue;
    const peak = channelPeak(s, path, durationS, rateHz, c, best, above[c], undefined, above[c]).peak;
    if (ratio) estimateRatio(ratio, best, above[c]);
    if (peak > above[c]) return c;
  }
  return -1;
}

/**
 * The first channel (efforts of the chain joints in order, then the tool speed) whose peak along the
 * path at `durationS` exceeds `above[c]`, or −1: the answer of {@link pathExceeds}, but every channel
 * is scanned to the end, and `visited` receives every sample that could exceed its limit (each
 * channel scanned only where its bound passes the limit), for the next closed form of the search;
 * `ratio[0]` as in {@link pathExceeds}, over every channel.
 */
export function pathOverLimits(
  s: ArmState,
  path: MovePath,
  durationS: number,
  rateHz: number,
  above: Float64Array,
  visited: number[],
  ratio?: Float64Array,
): number {
  if (path.extraSlot.size > maxExtraPoints) path.extraSlot.clear();
  const best: ChannelPeak = { peak: -1, tau: 0, gridPeak: -1 };
  if (ratio) ratio[0] = NaN;
  let first = -1;
  for (let c = 0; c < above.length; c++) {
    if (above[c] === Infinity) continue;
    const peak = channelPeak(s, path, durationS, rateHz, c, best, Infinity, visited, above[c]).peak;
    if (ratio) estimateRatio(ratio, best, above[c]);
    if (peak > above[c] && first < 0) first = c;
  }
  return first;
}

/** The largest |gⱼ| (gravity alone, N·m or N) over the grid points of the path, and where (τ). */
export function pathGravityPeak(path: MovePath, j: number): { value: number; tau: number } {
  const n = path.n,
    stride = 2 * n + 2;
  let value = 0,
    tau = 0;
  for (let k = 0; k < path.tau.length; k++) {
    const g = Math.abs(path.grid[k * stride + n + j]);
    if (g > value) {
      value = g;
      tau = path.tau[k];
    }
  }
  return { value, tau };
}

/** Calls `visit(terms, offset)` for every grid point and every refinement point τ in `extra`. */
function forEachPoint(
  s: ArmState,
  path: MovePath,
  extra: readonly number[],
  visit: (terms: Float64Array, offset: number) => void,
): void {
  const stride = 2 * path.n + 2;
  for (let k = 0; k < path.tau.length; k++) visit(path.grid, k * stride);
  for (const t of extra) {
    const o = termsAt(s, path, t);
    visit(path.extraTerms, o);
  }
}

/**
 * The least duration (s) at which joint j's effort at every grid point and at the refinement
 * points `extra` (τ) is within `limit`, solving per point the quadratic in x = 1/T:
 * M·x² + F_v·D·s′·x + g + F_c·sgn = ±limit (the smoothed Coulomb sign taken at `atDurationS`).
 * Infinity when gravity alone exceeds the limit at one of those points.
 */
export function shortestEffortDuration(
  s: ArmState,
  path: MovePath,
  j: number,
  limit: number,
  atDurationS: number,
  extra: readonly number[] = [],
): number {
  const n = path.n;
  const fv = s.dynamics.viscous[j],
    fc = s.dynamics.coulomb[j],
    eps = s.dynamics.signEpsilon;
  const D = path.delta[j];
  let xBest = Infinity;
  forEachPoint(s, path, extra, (terms, o) => {
    const sp = terms[o + 2 * n];
    const a = terms[o + j];
    const b = fv * D * sp;
    const g = terms[o + n + j];
    if (Math.abs(g) > limit) {
      xBest = 0;
      return;
    }
    const c = g + fc * Math.tanh((D * sp) / (atDurationS * eps));
    // with Coulomb friction at this duration already over the limit, only a longer move (weaker smoothed sign) can help
    if (Math.abs(c) > limit) {
      xBest = Math.min(xBest, 0.5 / atDurationS);
      return;
    }
    const x = Math.min(firstRoot(a, b, c - limit), firstRoot(a, b, c + limit));
    if (x < xBest) xBest = x;
  });
  return xBest === 0 ? Infinity : xBest === Infinity ? 0 : 1 / xBest;
}

/** The least duration (s) at which the tool speed at the grid and `extra` points is within `limit` (tool speed ∝ 1/T). */
export function shortestToolDuration(
  s: ArmState,
  path: MovePath,
  limit: number,
  extra: readonly number[] = [],
): number {
  const n = path.n;
  let u = 0;
  forEachPoint(s, path, extra, (terms, o) => {
    u = Math.max(u, terms[o + 2 * n + 1]);
  });
  return u / limit;
}

/** The smallest x > 0 with a·x² + b·x + c = 0, or Infinity. */
function firstRoot(a: number, b: number, c: number): number {
  if (Math.abs(a) < 1e-300) {
    const x = b !== 0 ? -c / b : Infinity;
    return x > 0 ? x : Infinity;
  }
  const disc = b * b - 4 * a * c;
  if (disc < 0) return Infinity;
  const r = Math.sqrt(disc);
  // numerically stable pair of roots (Press et al., Numerical Recipes, §5.6)
  const qv = -0.5 * (b + (b >= 0 ? r : -r));
  const x1 = qv / a,
    x2 = qv !== 0 ? c / qv : Infinity;
  let best = Infinity;
  if (x1 > 0 && x1 < best) best = x1;
  if (x2 > 0 && x2 < best) best = x2;
  return best;
}
