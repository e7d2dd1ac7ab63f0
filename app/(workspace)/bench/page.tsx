import type { Metadata } from "next";
import { ScratchBench } from "@/components/editor/scratch-bench";
import armL from "@/kinematics/arm/presets/bench-arm-l.json";
import { formatProblem, parseArm, armChainSchema } from "@/kinematics";
import { scratchPlan } from "@/components/editor/demo-plan";

export const metadata: Metadata = { title: "Try-out bench" };

/** A bench that needs no account: a demo plan on the light demo arm, checked live, never saved. */
export default function ScratchBenchPage() {
  const parsed = parseArm(armL);
  if (!parsed.ok)
    throw new Error(`demo arm does not parse: ${parsed.problems.map((p) => formatProblem(p)).join("; ")}`);
  const chain = armChainSchema.parse(armL.chain);
  const plan = scratchPlan({ ...parsed.value, chain });
  return <ScratchBench plan={plan} />;
}
