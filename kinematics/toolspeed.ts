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
}

/** Allocates a scanner for one chain. */
export function createToolSpeedScanner(chain: CompiledChain): ToolSpeedScanner {
  return { chain, buffers: createChainBuffers(chain), jacobian: new Float64Array(6 * chain.jointCount) };
}

/** Tool-point speed (m/s) at pose `q` with joint velocities `qd` (values from `offset`). */
export function toolSpeedAt(s: ToolSpeedScanner, q: ArrayLike<number>, qd: ArrayLike<number>, offset = 0): number {
  const n = s.chain.jointCount;
  forwardKinematics(s.chain, q, s.buffers, offset);
  const j = toolJacobian(s.chain, s.buffers, s.jacobian);
  let vx = 0, vy = 0, vz = 0;
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
  let peakSpeed = 0, timeS = count > 0 ? times[0] : 0;
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
