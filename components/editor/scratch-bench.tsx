"use client";
import { Bench } from "./bench";
import type { BenchPlan } from "./plan-state";

/** The bench without a saved plan behind it: edits stay in this tab. */
export function ScratchBench({ plan }: { plan: BenchPlan }) {
  return (
    <Bench
      initialPlan={plan}
      meta={{ planName: "Unsaved plan", armName: plan.arm.name }}
      actions={() => (
        <span className="text-xs text-ink-faint">
          Try-out bench: nothing is saved. Sign in to keep plans in a project.
        </span>
      )}
    />
  );
}
