/**
 * Tool-point speed: the Cartesian speed of the tool point along a sampled move, from the
 * geometric Jacobian, v = J_v(q)·q̇ (Siciliano et al., Robotics: Modelling, Planning and
 * Control, 2009, §3.1). Allocation-free per sample.
 *
 * @module
 */
import { createChainBuffers, forwardKinematics, toolJacobian, type ChainBuffers, type CompiledChain } from "./chain";

/** Reusable state for tool-speed evaluation. */
export interface ToolSpeedScanner {
  readonly chain: CompiledChain;
  readonly buffers: ChainBuffers;
  /** 6×n Jacobian scratch. */
  readonly jacobian: Float64Array;
  /** Speeds at the coarse samples of {@link scanToolSpeedBounded}, grown as needed. */
  coarse: Float64Array;
}

/** Allocates a scanner for one chain. */
export function createToolSpeedScanner(chain: CompiledChain): ToolSpeedScanner {
  return {
    chain,
    buffers: createChainBuffers(chain),
    jacobian: new Float64Array(6 * chain.jointCount),
    coarse: new Float64Array(0),
  };
}

/** Tool-point speed (m/s) at pose `q` with joint velocities `qd` (values from `offset`). */
export function toolSpeedAt(s: ToolSpeedScanner, q: ArrayLike<number>, qd: ArrayLike<number>, offset = 0): number {
  const n = s.chain.jointCount;
  forwardKinematics(s.chain, q, s.buffers, offset);
  const j = toolJacobian(s.chain, s.buffers, s.jacobian);
  let vx = 0,
    vy = 0,
    vz = 0;
  for (let i = 0; i < n; i++) {
    const w = qd[offset + i];
    vx += j[i] * w; // v = J_v·q̇, rows 0–2 of the geometric Jacobian
    vy += j[n + i] * w;
    vz += j[2 * n + i] * w;
  }
  return Math.hypot(vx, vy, vz);
}

/** Peak tool-point speed over a sampled move and when it happens. */
export interface ToolSpeedPeak {
  /** Largest tool-point speed (m/s). */
  peakSpeed: number;
  /** Time of the peak from the move's start (s). */
  timeS: number;
}

/**
 * Scans sampled positions and velocities (`stride` values per sample, chain joints first)
 * and returns the peak tool-point speed.
 */
export function scanToolSpeed(
  s: ToolSpeedScanner,
  positions: Float64Array,
  velocities: Float64Array,
  stride: number,
  times: ArrayLike<number>,
  count: number,
): ToolSpeedPeak {
  let peakSpeed = 0,
    timeS = count > 0 ? times[0] : 0;
  for (let k = 0; k < count; k++) {
    // Positions and velocities share the stride; evaluate with offset k·stride.
    const v = toolSpeedAt(s, positions, velocities, k * stride);
    if (v > peakSpeed) {
      peakSpeed = v;
      timeS = times[k];
    }
  }
  return { peakSpeed, timeS };
}

/**
 * The result of {@link scanToolSpeed}, computing only the samples that could hold the peak.
 * Every `step`-th sample (and the last) is evaluated first; with the tool speed changing by at
 * most `accelBound` m/s² (e.g. from `toolAccelerationBound`), no sample between two evaluated
 * ones with speeds v₀, v₁ exceeds (v₀ + v₁ + A·Δt)/2 (derived: the two cones v₀ + A·(t − t₀)
 * and v₁ + A·(t₁ − t) meet there). Intervals whose bound is below the best speed found so far
 * are skipped; the others are evaluated sample by sample, and ties go to the earlier sample, so
 * the peak and its time are exactly those of the full scan.
 */
export function scanToolSpeedBounded(
  s: ToolSpeedScanner,
  positions: Float64Array,
  velocities: Float64Array,
  stride: number,
  times: ArrayLike<number>,
  count: number,
  accelBound: number,
  step = 16,
): ToolSpeedPeak {
  if (count <= 0) return { peakSpeed: 0, timeS: 0 };
  const coarseCount = Math.ceil((count - 1) / step) + 1;
  if (s.coarse.length < coarseCount) s.coarse = new Float64Array(coarseCount);
  const coarse = s.coarse;
  const indexOf = (c: number) => Math.min(c * step, count - 1);
  // The full scan starts at 0 and keeps the first sample of a strictly larger speed: same rule here.
  let peakSpeed = 0,
    peakK = 0;
  const visit = (v: number, k: number) => {
    if (v > peakSpeed || (v === peakSpeed && v > 0 && k < peakK)) {
      peakSpeed = v;
      peakK = k;
    }
  };
  for (let c = 0; c < coarseCount; c++) {
    const k = indexOf(c);
    coarse[c] = toolSpeedAt(s, positions, velocities, k * stride);
    visit(coarse[c], k);
  }
  for (let c = 0; c + 1 < coarseCount; c++) {
    const k0 = indexOf(c),
      k1 = indexOf(c + 1);
    if (k1 - k0 <= 1) continue;
    const bound = (coarse[c] + coarse[c + 1] + accelBound * (times[k1] - times[k0])) / 2;
    if (bound < peakSpeed) continue;
    for (let k = k0 + 1; k < k1; k++) visit(toolSpeedAt(s, positions, velocities, k * stride), k);
  }
  return { peakSpeed, timeS: peakSpeed > 0 ? times[peakK] : times[0] };
}
