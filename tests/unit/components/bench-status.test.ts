import { describe, expect, it } from "vitest";
import { benchStatus } from "@/components/editor/use-bench-state";
import { runLiveCheck } from "@/components/editor/live-check";
import { noMotionText } from "@/components/plots/joint-plots";
import { check } from "@/kinematics";
import { demoPlan, pose } from "./helpers";

describe("what the bench says about a whole plan", () => {
  it("an empty plan has no verdict at all, not a Pass", () => {
    const plan = demoPlan([]);
    const full = check(plan);
    expect(full.verdict).toBe("pass"); // the engine passes a plan with nothing to check…
    expect(benchStatus(0, runLiveCheck(plan).report, { report: full, error: null })).toEqual({ kind: "empty" }); // …the bench says nothing
  });

  it("shows no Pass while the arm-model checks run, and a fault the joint checks already found", () => {
    const gentle = demoPlan([{ goal: pose(0.2), duration: 2 }]);
    expect(benchStatus(1, runLiveCheck(gentle).report, { report: null, error: null })).toEqual({
      kind: "checking",
      faultSoFar: false,
    });
    const fast = demoPlan([{ goal: pose(1.5), duration: 0.2 }]);
    expect(benchStatus(1, runLiveCheck(fast).report, { report: null, error: null })).toEqual({
      kind: "checking",
      faultSoFar: true,
    });
  });

  it("shows no Pass when the arm-model checks failed to run", () => {
    const gentle = demoPlan([{ goal: pose(0.2), duration: 2 }]);
    expect(benchStatus(1, runLiveCheck(gentle).report, { report: null, error: "worker stopped" })).toEqual({
      kind: "unchecked",
      error: "worker stopped",
      faultSoFar: false,
    });
  });

  it("takes the full report's verdict once it is there", () => {
    const plan = fixtureLikeEffortPlan();
    const full = check(plan);
    expect(benchStatus(plan.moves.length, runLiveCheck(plan).report, { report: full, error: null })).toEqual({
      kind: "checked",
      verdict: full.verdict,
    });
  });

  it("plots of a plan of instant moves explain the instant move instead of saying there is no motion yet", () => {
    expect(noMotionText(0)).toMatch(/^No moves yet/);
    expect(noMotionText(1)).toMatch(/instant move/);
    expect(noMotionText(1)).toMatch(/one control period/);
    expect(noMotionText(3)).toMatch(/^All 3 moves are instant moves/);
    expect(noMotionText(2)).not.toMatch(/No motion yet|No moves yet/);
  });
});

/** A plan whose joint checks pass but whose arm model may not: the shoulder lifted and held out. */
function fixtureLikeEffortPlan() {
  return demoPlan([{ goal: pose(0, 1.2, 0.3), duration: 1.5 }]);
}
