/**
 * The scratch bench's starting plan: a short pick-and-place-like sequence on the light demo arm,
 * with one move tight enough to show a caution and room to try shorter durations.
 */
import type { BenchPlan } from "./plan-state";

export function scratchPlan(arm: BenchPlan["arm"]): BenchPlan {
  const n = arm.joints.length;
  const pose = (...v: number[]) => Array.from({ length: n }, (_, j) => v[j] ?? 0);
  return {
    format: "jointproof.plan",
    version: 1,
    arm,
    start: pose(0, -0.3, 1.2, 0.6, 0, 0, 0.01),
    moves: [
      { goal: pose(0.9, 0.25, 0.9, 0.4, 0, 0.5, 0.01), duration: 1.6, shape: "quintic" },
      { goal: pose(0.9, 0.55, 0.55, 0.5, 0, 0.5, 0.0), duration: 0.9, shape: "quintic" },
      { goal: pose(-0.6, 0.1, 1.0, 0.3, 0.8, -0.3, 0.0), duration: 1.2, shape: "trapezoid" },
      { goal: pose(0, -0.3, 1.2, 0.6, 0, 0, 0.01), duration: 1.5, shape: "cubic" },
    ],
  };
}
