import armL from "@/kinematics/arm/presets/bench-arm-l.json";
import { parsePlan } from "@/kinematics";
import type { BenchPlan } from "@/components/editor/plan-state";

/** A plan on the light demo arm (real arm file, parsed by the engine's schema). */
export function demoPlan(
  moves: { goal: number[]; duration: number; shape?: "cubic" | "quintic" | "trapezoid" }[] = [],
): BenchPlan {
  const n = armL.joints.length;
  const parsed = parsePlan({
    format: "jointproof.plan",
    version: 1,
    arm: armL,
    start: new Array(n).fill(0),
    moves: moves.map((m) => ({ shape: "quintic", ...m })),
  });
  if (!parsed.ok) throw new Error(parsed.problems.map((p) => `${p.path}: ${p.message}`).join("; "));
  return parsed.value as BenchPlan;
}

/** A pose of the demo arm with the given leading values (the rest 0). */
export function pose(...values: number[]): number[] {
  return Array.from({ length: armL.joints.length }, (_, j) => values[j] ?? 0);
}
