/**
 * Joint effort along sampled motion, for the plots: the arm model's recursive Newton–Euler inverse
 * dynamics (kinematics/dynamics.ts) at every sample, gravity, friction and payload included.
 */
import { compileChain, createDynamicsWorkspace, inverseDynamics, type Samples, timelineOf } from "@/kinematics";
import type { BenchPlan } from "@/components/editor/plan-state";
import { plotSamples } from "./downsample";

export interface EffortSeries {
  /** Effort per sample and chain joint (N·m or N), stride `stride`. */
  values: Float64Array;
  /** Number of chain joints (joints after the chain, e.g. a gripper, have no effort series). */
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
  return { values, stride: m };
}

/**
 * The effort series at the plots' own samples (the same timeline and rate as the bench's live check,
 * live-check.ts), for a worker that has only the plan.
 */
export function effortAlongPlot(plan: BenchPlan): EffortSeries | null {
  if (!plan.arm.chain) return null;
  return effortSeries(plan, plotSamples(timelineOf(plan), plan.arm.controlRateHz));
}
