/**
 * Clearance: how far each link's collision shapes dip below the work surface (z = 0 in the
 * base frame, plus a margin) or into axis-aligned keep-out boxes. Shapes are spheres,
 * capsules and boxes in their link frames; depths are in metres, positive = intrusion.
 * The base (link 0) is mounted on the work surface, so it is checked against keep-out boxes
 * only.
 *
 * @module
 */
import type { ArmChain, KeepOutBox } from "../plan/arm-model";
import { createChainBuffers, linkFrames, type ChainBuffers, type CompiledChain } from "./chain";
import * as mat4 from "./mat4";

const SPHERE = 0,
  CAPSULE = 1,
  BOX = 2;

/** The chain's collision shapes in flat arrays. */
export interface CollisionModel {
  /** Number of shapes. */
  readonly count: number;
  /** Link index (0 = base) of each shape. */
  readonly link: Uint16Array;
  /** 0 sphere, 1 capsule, 2 box. */
  readonly kind: Uint8Array;
  /** Sphere centre / capsule start / box centre in the link frame, 3 per shape. */
  readonly p1: Float64Array;
  /** Capsule end, 3 per shape. */
  readonly p2: Float64Array;
  /** Sphere or capsule radius (m). */
  readonly radius: Float64Array;
  /** Box half extents (m), 3 per shape. */
  readonly half: Float64Array;
  /** Box placement in its link frame, 16 per shape. */
  readonly local: Float64Array;
  /** Link names, index 0 the base. */
  readonly linkNames: readonly string[];
}

/** Where the arm must not go: the work surface and keep-out boxes. */
export interface ClearanceZones {
  /** Clearance kept above z = 0 (m). */
  surfaceMarginM: number;
  /** Box minima, 3 per box (m, base frame). */
  boxMin: Float64Array;
  /** Box maxima, 3 per box. */
  boxMax: Float64Array;
  /** Box labels for messages. */
  boxNames: string[];
}

/** Flattens `arm.chain`'s collision shapes (link 0 = base, link i follows joint i). */
export function compileCollision(chain: ArmChain): CollisionModel {
  const links = [chain.base, ...chain.joints.map((j) => j.link)];
  const shapes = links.flatMap((l, i) => l.collision.map((s) => ({ s, i })));
  const count = shapes.length;
  const m: CollisionModel = {
    count,
    link: new Uint16Array(count),
    kind: new Uint8Array(count),
    p1: new Float64Array(3 * count),
    p2: new Float64Array(3 * count),
    radius: new Float64Array(count),
    half: new Float64Array(3 * count),
    local: new Float64Array(16 * count),
    linkNames: links.map((l, i) => l.name ?? (i === 0 ? "base" : `link${i}`)),
  };
  shapes.forEach(({ s, i }, k) => {
    m.link[k] = i;
    mat4.identity(m.local, 16 * k);
    if (s.kind === "sphere") {
      m.kind[k] = SPHERE;
      m.p1.set(s.center, 3 * k);
      m.radius[k] = s.radius;
    } else if (s.kind === "capsule") {
      m.kind[k] = CAPSULE;
      m.p1.set(s.from, 3 * k);
      m.p2.set(s.to, 3 * k);
      m.radius[k] = s.radius;
    } else {
      m.kind[k] = BOX;
      m.p1.set(s.center, 3 * k);
      for (let a = 0; a < 3; a++) m.half[3 * k + a] = s.size[a] / 2;
      mat4.fromXyzRpy(m.local, s.center, s.rpy, 16 * k);
    }
  });
  return m;
}

/** Builds the zones from a plan's `surfaceMargin` (m, default 0) and `keepOut` boxes. */
export function clearanceZones(surfaceMarginM = 0, keepOut: readonly KeepOutBox[] = []): ClearanceZones {
  const boxMin = new Float64Array(3 * keepOut.length),
    boxMax = new Float64Array(3 * keepOut.length);
  keepOut.forEach((b, i) => {
    boxMin.set(b.min, 3 * i);
    boxMax.set(b.max, 3 * i);
  });
  return { surfaceMarginM, boxMin, boxMax, boxNames: keepOut.map((b, i) => b.name ?? `keep-out box ${i + 1}`) };
}

/**
 * Signed distance from a point to an axis-aligned box (negative inside): the exact box SDF
 * |max(d, 0)| + min(max(dx, dy, dz), 0) with d = |p − c| − h (derived; Ericson, Real-Time
 * Collision Detection, 2005, §5.1.3 gives the outside part).
 */
export function boxSignedDistance(
  x: number,
  y: number,
  z: number,
  mn: ArrayLike<number>,
  mx: ArrayLike<number>,
  o = 0,
): number {
  const dx = Math.max(mn[o] - x, x - mx[o]);
  const dy = Math.max(mn[o + 1] - y, y - mx[o + 1]);
  const dz = Math.max(mn[o + 2] - z, z - mx[o + 2]);
  const ox = dx > 0 ? dx : 0,
    oy = dy > 0 ? dy : 0,
    oz = dz > 0 ? dz : 0;
  const outside = Math.sqrt(ox * ox + oy * oy + oz * oz);
  return outside + Math.min(Math.max(dx, dy, dz), 0);
}

/**
 * Smallest signed distance from the segment a→b to a box. The box SDF is convex, so along
 * the segment it is a convex function of t and a golden-section search finds its minimum
 * (derived; Press et al., Numerical Recipes, §10.2).
 */
export function segmentBoxSignedDistance(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  mn: ArrayLike<number>,
  mx: ArrayLike<number>,
  o = 0,
): number {
  const ex = b[0] - a[0],
    ey = b[1] - a[1],
    ez = b[2] - a[2];
  const f = (t: number) => boxSignedDistance(a[0] + t * ex, a[1] + t * ey, a[2] + t * ez, mn, mx, o);
  const g = 0.6180339887498949; // (√5 − 1)/2
  let lo = 0,
    hi = 1;
  let x1 = hi - g * (hi - lo),
    x2 = lo + g * (hi - lo);
  let f1 = f(x1),
    f2 = f(x2);
  // 30 steps shrink the bracket to 0.618³⁰ ≈ 5e-7 of the segment: sub-micrometre for arm links.
  for (let it = 0; it < 30; it++) {
    if (f1 < f2) {
      hi = x2;
      x2 = x1;
      f2 = f1;
      x1 = hi - g * (hi - lo);
      f1 = f(x1);
    } else {
      lo = x1;
      x1 = x2;
      f1 = f2;
      x2 = lo + g * (hi - lo);
      f2 = f(x2);
    }
  }
  return Math.min(f1, f2, f(0), f(1));
}

/**
 * Depth of the capsule (segment a→b, radius r) into an axis-aligned box: r minus the distance from
 * the segment to the box, negative when apart. When the capsule's bounding box misses the box by g
 * along some axis, the segment is at least r + g from it, so −g (the largest such gap) is returned
 * without the distance search: at least the true depth, which is what the sample-skipping scans'
 * cone tests need (a value below the true depth would let them skip an intrusion).
 */
export function capsuleBoxDepth(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  r: number,
  mn: ArrayLike<number>,
  mx: ArrayLike<number>,
  o = 0,
): number {
  let gap = 0;
  for (let ax = 0; ax < 3; ax++) {
    const lo = Math.min(a[ax], b[ax]) - r,
      hi = Math.max(a[ax], b[ax]) + r;
    const g = Math.max(mn[o + ax] - hi, lo - mx[o + ax]);
    if (g > gap) gap = g;
  }
  return gap > 0 ? -gap : r - segmentBoxSignedDistance(a, b, mn, mx, o);
}

/**
 * Penetration depth of an oriented box (world matrix `w` at `wo`, half extents `h`) into an
 * axis-aligned box, by the separating-axis test over the 15 candidate axes (Ericson,
 * Real-Time Collision Detection, 2005, §4.4.1): the smallest overlap, negative when apart.
 */
export function orientedBoxIntrusion(
  w: ArrayLike<number>,
  wo: number,
  h: ArrayLike<number>,
  ho: number,
  mn: ArrayLike<number>,
  mx: ArrayLike<number>,
  o = 0,
): number {
  const u = satAxes; // box axes (columns of the rotation), 9 values
  for (let k = 0; k < 3; k++) {
    u[3 * k] = w[wo + 4 * k];
    u[3 * k + 1] = w[wo + 4 * k + 1];
    u[3 * k + 2] = w[wo + 4 * k + 2];
  }
  const h0 = h[ho],
    h1 = h[ho + 1],
    h2 = h[ho + 2];
  const bh0 = (mx[o] - mn[o]) / 2,
    bh1 = (mx[o + 1] - mn[o + 1]) / 2,
    bh2 = (mx[o + 2] - mn[o + 2]) / 2;
  const d0 = w[wo + 12] - (mn[o] + mx[o]) / 2,
    d1 = w[wo + 13] - (mn[o + 1] + mx[o + 1]) / 2,
    d2 = w[wo + 14] - (mn[o + 2] + mx[o + 2]) / 2;
  let best = Infinity;
  // Candidate axes: the 3 world axes, the 3 box axes, and the 9 cross products world × box.
  for (let c = 0; c < 15; c++) {
    let lx: number, ly: number, lz: number;
    if (c < 3) {
      lx = c === 0 ? 1 : 0;
      ly = c === 1 ? 1 : 0;
      lz = c === 2 ? 1 : 0;
    } else if (c < 6) {
      lx = u[3 * (c - 3)];
      ly = u[3 * (c - 3) + 1];
      lz = u[3 * (c - 3) + 2];
    } else {
      const e = Math.floor((c - 6) / 3),
        k = (c - 6) % 3;
      const ax = u[3 * k],
        ay = u[3 * k + 1],
        az = u[3 * k + 2];
      // e_e × a
      lx = e === 0 ? 0 : e === 1 ? az : -ay;
      ly = e === 0 ? -az : e === 1 ? 0 : ax;
      lz = e === 0 ? ay : e === 1 ? -ax : 0;
    }
    const len = Math.sqrt(lx * lx + ly * ly + lz * lz);
    if (len < 1e-9) continue; // parallel edges give no new axis
    lx /= len;
    ly /= len;
    lz /= len;
    // Projected radii: oriented box Σ hᵢ|uᵢ·L|, axis-aligned box Σ bhᵢ|Lᵢ|; overlap = ra + rb − |d·L|.
    const ra =
      h0 * Math.abs(u[0] * lx + u[1] * ly + u[2] * lz) +
      h1 * Math.abs(u[3] * lx + u[4] * ly + u[5] * lz) +
      h2 * Math.abs(u[6] * lx + u[7] * ly + u[8] * lz);
    const rb = bh0 * Math.abs(lx) + bh1 * Math.abs(ly) + bh2 * Math.abs(lz);
    const overlap = ra + rb - Math.abs(d0 * lx + d1 * ly + d2 * lz);
    if (overlap < best) best = overlap;
  }
  return best;
}

const satAxes = new Float64Array(9);

/** Scratch for {@link shapeIntrusions}; allocate once. */
export interface ClearanceScratch {
  readonly a: Float64Array;
  readonly b: Float64Array;
  readonly world: Float64Array;
}

/** Allocates the scratch of {@link shapeIntrusions}. */
export function createClearanceScratch(): ClearanceScratch {
  return { a: new Float64Array(3), b: new Float64Array(3), world: new Float64Array(16) };
}

/**
 * Intrusion depth (m, positive = intrusion, negative = clearance) of every shape into every
 * zone for link frames already computed by FK. Writes `count × (1 + boxes)` values into
 * `out`: for shape s, `out[s·(1+B)]` is the work surface, `out[s·(1+B) + 1 + k]` box k.
 * The surface entry of base shapes is −Infinity (the base stands on the surface).
 */
export function shapeIntrusions(
  model: CollisionModel,
  zones: ClearanceZones,
  frames: Float64Array,
  out: Float64Array,
  scratch: ClearanceScratch,
): Float64Array {
  const boxes = zones.boxMin.length / 3;
  const stride = 1 + boxes;
  const { a, b, world } = scratch;
  for (let s = 0; s < model.count; s++) {
    const fo = 16 * model.link[s];
    const kind = model.kind[s];
    const base = s * stride;
    if (kind === BOX) {
      mat4.multiply(world, frames, model.local, 0, fo, 16 * s);
      // Lowest corner: c_z − Σₖ hₖ·|R[2,k]| (support point of a box, derived).
      const h = model.half;
      const low =
        world[14] -
        h[3 * s] * Math.abs(world[2]) -
        h[3 * s + 1] * Math.abs(world[6]) -
        h[3 * s + 2] * Math.abs(world[10]);
      out[base] = model.link[s] === 0 ? -Infinity : zones.surfaceMarginM - low;
      for (let k = 0; k < boxes; k++)
        out[base + 1 + k] = orientedBoxIntrusion(world, 0, h, 3 * s, zones.boxMin, zones.boxMax, 3 * k);
      continue;
    }
    mat4.transformPoint(a, frames, model.p1, 0, fo, 3 * s);
    const r = model.radius[s];
    if (kind === SPHERE) {
      out[base] = model.link[s] === 0 ? -Infinity : zones.surfaceMarginM - (a[2] - r);
      for (let k = 0; k < boxes; k++)
        out[base + 1 + k] = r - boxSignedDistance(a[0], a[1], a[2], zones.boxMin, zones.boxMax, 3 * k);
    } else {
      mat4.transformPoint(b, frames, model.p2, 0, fo, 3 * s);
      out[base] = model.link[s] === 0 ? -Infinity : zones.surfaceMarginM - (Math.min(a[2], b[2]) - r);
      for (let k = 0; k < boxes; k++) out[base + 1 + k] = capsuleBoxDepth(a, b, r, zones.boxMin, zones.boxMax, 3 * k);
    }
  }
  return out;
}

/** The worst intrusion of one link into one zone over a sampled move. */
export interface Intrusion {
  /** Link index (0 = base). */
  link: number;
  /** Link name. */
  linkName: string;
  /** -1 for the work surface, else the keep-out box index. */
  zone: number;
  /** "the work surface" or the box's name. */
  zoneName: string;
  /** Deepest intrusion (m). */
  depthM: number;
  /** Time of the deepest intrusion from the move's start (s). */
  timeS: number;
  /** First and last sampled times with an intrusion (s). */
  firstTimeS: number;
  lastTimeS: number;
}

/** Reusable state for {@link scanClearance}. */
export interface ClearanceScanner {
  readonly chain: CompiledChain;
  readonly model: CollisionModel;
  readonly zones: ClearanceZones;
  readonly buffers: ChainBuffers;
  readonly scratch: ClearanceScratch;
  readonly depths: Float64Array;
  /** Depths at the coarse samples of {@link scanClearanceBounded}, grown as needed. */
  coarse: Float64Array;
}

/** Allocates a scanner for one chain and zone set. */
export function createClearanceScanner(
  chain: CompiledChain,
  model: CollisionModel,
  zones: ClearanceZones,
): ClearanceScanner {
  const boxes = zones.boxMin.length / 3;
  return {
    chain,
    model,
    zones,
    buffers: createChainBuffers(chain),
    scratch: createClearanceScratch(),
    depths: new Float64Array(model.count * (1 + boxes)),
    coarse: new Float64Array(0),
  };
}

/** Records the intrusions of one sample (depths already in `scanner.depths`) into `found`, in time order. */
function recordSample(scanner: ClearanceScanner, found: Map<number, Intrusion>, t: number, toleranceM: number): void {
  const { model, zones, depths } = scanner;
  const zonesPer = 1 + zones.boxMin.length / 3;
  for (let s = 0; s < model.count; s++) {
    for (let z = 0; z < zonesPer; z++) {
      const d = depths[s * zonesPer + z];
      if (!(d > toleranceM)) continue;
      const key = model.link[s] * zonesPer + z;
      const hit = found.get(key);
      if (!hit) {
        found.set(key, {
          link: model.link[s],
          linkName: model.linkNames[model.link[s]],
          zone: z - 1,
          zoneName: z === 0 ? "the work surface" : zones.boxNames[z - 1],
          depthM: d,
          timeS: t,
          firstTimeS: t,
          lastTimeS: t,
        });
      } else {
        if (d > hit.depthM) {
          hit.depthM = d;
          hit.timeS = t;
        }
        hit.lastTimeS = t;
      }
    }
  }
}

/** Computes every shape's depths at sample k into `scanner.depths`. */
function depthsAt(scanner: ClearanceScanner, positions: Float64Array, offset: number): Float64Array {
  linkFrames(scanner.chain, positions, scanner.buffers.frames, offset);
  return shapeIntrusions(scanner.model, scanner.zones, scanner.buffers.frames, scanner.depths, scanner.scratch);
}

/**
 * Scans sampled poses (`positions`, `stride` values per sample, chain joints first) at
 * `times` (s) and returns, per link and zone, the deepest intrusion with its time. Only
 * intrusions deeper than `toleranceM` (default 1e-9 m) count. Evaluates every sample; see
 * {@link scanClearanceBounded} for the same result with fewer evaluations.
 */
export function scanClearance(
  scanner: ClearanceScanner,
  positions: Float64Array,
  stride: number,
  times: ArrayLike<number>,
  count: number,
  toleranceM = 1e-9,
): Intrusion[] {
  const found = new Map<number, Intrusion>();
  for (let k = 0; k < count; k++) {
    depthsAt(scanner, positions, k * stride);
    recordSample(scanner, found, times[k], toleranceM);
  }
  return [...found.values()].sort((p, q) => q.depthM - p.depthM);
}

/**
 * The result of {@link scanClearance}, computing only the samples that could intrude. Every
 * `step`-th sample (and the last) is evaluated first; a shape whose points move at most V m/s
 * (`linkSpeed[link]`, e.g. from `linkSpeedBounds`) changes its depth by at most V·Δt, so on an
 * interval between two evaluated samples with depths d₀, d₁ it cannot intrude when
 * d₀ + d₁ + V·Δt < 0 (derived: the worst point of the interval is where the two cones
 * d₀ + V·(t − t₀) and d₁ + V·(t₁ − t) meet). For the box–box test, whose negative values are
 * separations along one axis and so at most the true distance, the same condition keeps the
 * shapes apart. Intervals that fail the test are evaluated sample by sample, in time order, so
 * the deepest intrusion, its time and the first and last times are those of the full scan.
 */
export function scanClearanceBounded(
  scanner: ClearanceScanner,
  positions: Float64Array,
  stride: number,
  times: ArrayLike<number>,
  count: number,
  linkSpeed: ArrayLike<number>,
  toleranceM = 1e-9,
  step = 16,
): Intrusion[] {
  const { model, zones } = scanner;
  const pairs = scanner.depths.length;
  const zonesPer = 1 + zones.boxMin.length / 3;
  const coarseCount = count > 0 ? Math.ceil((count - 1) / step) + 1 : 0;
  if (scanner.coarse.length < coarseCount * pairs) scanner.coarse = new Float64Array(coarseCount * pairs);
  const coarse = scanner.coarse;
  const indexOf = (c: number) => Math.min(c * step, count - 1);
  for (let c = 0; c < coarseCount; c++) coarse.set(depthsAt(scanner, positions, indexOf(c) * stride), c * pairs);
  const found = new Map<number, Intrusion>();
  for (let c = 0; c < coarseCount; c++) {
    const k0 = indexOf(c);
    scanner.depths.set(coarse.subarray(c * pairs, (c + 1) * pairs));
    recordSample(scanner, found, times[k0], toleranceM);
    if (c + 1 >= coarseCount) break;
    const k1 = indexOf(c + 1);
    if (k1 - k0 <= 1) continue;
    const dt = times[k1] - times[k0];
    let clear = true;
    for (let s = 0; s < model.count && clear; s++) {
      const reach = linkSpeed[model.link[s]] * dt;
      for (let z = 0; z < zonesPer; z++) {
        const p = s * zonesPer + z;
        const d0 = coarse[c * pairs + p],
          d1 = coarse[(c + 1) * pairs + p];
        // −Infinity (the base on the surface) stays clear; anything else must be provably apart.
        if (!(d0 + d1 + reach < 0)) {
          clear = false;
          break;
        }
      }
    }
    if (clear) continue;
    for (let k = k0 + 1; k < k1; k++) {
      depthsAt(scanner, positions, k * stride);
      recordSample(scanner, found, times[k], toleranceM);
    }
  }
  return [...found.values()].sort((p, q) => q.depthM - p.depthM);
}

/** Most depth evaluations {@link certifyClearPath} spends on one path before it gives up. */
const maxCertifyPoints = 1024;

/**
 * True when the whole path τ ∈ [0, 1] is provably clear of every zone, so that no sample of it, at
 * any duration, intrudes: `positionAt(τ, q)` writes the chain pose at τ, and `linkSpeedPerTau[m]`
 * bounds how far (m) any collision point of link m moves per unit τ. The path is evaluated at
 * `initial` + 1 even points and each interval is accepted by the cone test of
 * {@link scanClearanceBounded} (d₀ + d₁ + V·Δτ < 0 for every shape and zone) or halved; it is not
 * certified (false) when a point is not strictly apart from a zone, or after `maxCertifyPoints`
 * evaluations. False says nothing about an intrusion: the caller then scans the samples.
 * `speedShare(a, b)`, when given, is at least the largest share (0..1) of `linkSpeedPerTau` that the
 * path reaches on [a, b] (the path's speed along τ varies: a rest-to-rest shape starts and ends at rest).
 */
export function certifyClearPath(
  scanner: ClearanceScanner,
  positionAt: (tau: number, q: Float64Array) => void,
  linkSpeedPerTau: ArrayLike<number>,
  initial = 16,
  speedShare?: (a: number, b: number) => number,
): boolean {
  const { model, zones } = scanner;
  const pairs = scanner.depths.length;
  const zonesPer = 1 + zones.boxMin.length / 3;
  const q = new Float64Array(scanner.chain.jointCount);
  let evaluations = 0;
  // depths at τ into a fresh array; null when some shape is not strictly apart from a zone
  const depthsOf = (tau: number): Float64Array | null => {
    evaluations++;
    positionAt(tau, q);
    const d = Float64Array.from(depthsAt(scanner, q, 0));
    for (let p = 0; p < pairs; p++) if (!(d[p] < 0)) return null;
    return d;
  };
  const intervalClear = (d0: Float64Array, d1: Float64Array, a: number, b: number): boolean => {
    const dTau = (b - a) * (speedShare ? speedShare(a, b) : 1);
    for (let s = 0; s < model.count; s++) {
      const reach = linkSpeedPerTau[model.link[s]] * dTau;
      for (let z = 0; z < zonesPer; z++) {
        const p = s * zonesPer + z;
        // −Infinity (the base on the surface) stays clear; anything else must be provably apart.
        if (!(d0[p] + d1[p] + reach < 0)) return false;
      }
    }
    return true;
  };
  const certify = (a: number, da: Float64Array, b: number, db: Float64Array): boolean => {
    if (intervalClear(da, db, a, b)) return true;
    if (evaluations >= maxCertifyPoints) return false;
    const m = (a + b) / 2;
    const dm = depthsOf(m);
    return dm !== null && certify(a, da, m, dm) && certify(m, dm, b, db);
  };
  let prev = depthsOf(0);
  if (!prev) return false;
  for (let k = 1; k <= initial; k++) {
    const b = k / initial;
    const next = depthsOf(b);
    if (!next || !certify((k - 1) / initial, prev, b, next)) return false;
    prev = next;
  }
  return true;
}
