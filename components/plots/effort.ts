/**
 * Joint effort along sampled motion, for the plots: the arm model's recursive Newton–Euler inverse
 * dynamics (kinematics/dynamics.ts) at every sample, gravity, friction and payload included.
 */
import {
  compileChain,
  createDynamicsWorkspace,
  inverseDynamics,
  sampleTimeline,
  type Samples,
  timelineOf,
} from "@/kinematics";
import type { BenchPlan } from "@/components/editor/plan-state";
import { plotRateHz } from "./downsample";

export interface EffortSeries {
  /** Effort per sample and chain joint (N·m or N), stride `stride`. */
  values: Float64Array;
  /** The samples' times (s) and count, and their rate (Hz): fewer than the motion plots' at most. */
  timeS: Float64Array;
  count: number;
  rateHz: number;
  /** Number of chain joints (joints after the chain, e.g. a gripper, have no effort series). */
  stride: number;
}

/** An effort series still being computed (by a worker): how many chain joints it will have. */
export interface EffortPending {
  values: null;
  stride: number;
}

/** Effort at every sample of a plan with a chain; null when the arm has no chain. */
export function effortSeries(plan: BenchPlan, samples: Samples): EffortSeries | null {
  const chain = plan.arm.chain;
  if (!chain) return null;
  const compiled = compileChain(
    chain,
    plan.arm.joints.map((j) => j.type),
    plan.payload,
  );
  const ws = createDynamicsWorkspace(
    compiled,
    plan.arm.joints.map((j) => j.friction),
  );
  const m = compiled.jointCount;
  const n = samples.jointCount;
  const values = new Float64Array(samples.count * m);
  for (let k = 0; k < samples.count; k++) {
    inverseDynamics(compiled, ws, samples.position, samples.velocity, samples.acceleration, values, k * n, k * m);
  }
  return { values, stride: m, timeS: samples.timeS, count: samples.count, rateHz: samples.rateHz };
}

/**
 * Samples of the effort plot at most: inverse dynamics at every plotted sample of a 10-move plan
 * (11,700 at 1 kHz) took 30-100 ms in the bench's worker. 3,000 is still several per pixel of a wide
 * chart; the check itself evaluates every control period, and the chart says its rate when lower.
 */
export const EFFORT_PLOT_MAX_SAMPLES = 3_000;

/** The effort plot's series of a plan: its timeline at the plots' rate, or lower (see above). */
export function effortAlongPlot(plan: BenchPlan): EffortSeries | null {
  if (!plan.arm.chain) return null;
  const timeline = timelineOf(plan);
  const rateHz = Math.min(
    plotRateHz(plan.arm.controlRateHz, timeline.totalS),
    plotRateHz(plan.arm.controlRateHz, timeline.totalS, EFFORT_PLOT_MAX_SAMPLES),
  );
  return effortSeries(plan, sampleTimeline(timeline, rateHz));
}
