/** The assignment rules and the stricter limits, on the demo arm and the real engine. */
import { describe, expect, it } from "vitest";
import { checkAgainstAssignment, ruleProblems, tightenArm } from "@/lib/shared/courses/rules";
import { csvField } from "@/app/api/v1/courses/course-api";
import { planSchema, type Arm } from "@/kinematics";
import { baseMovePlan } from "./_fixtures";

const plan = (durationS: number) => planSchema.parse(baseMovePlan(durationS));
const arm: Arm = plan(1).arm;

describe("tightenArm", () => {
  it("scales speed and acceleration and takes the strictest of several limits", () => {
    const t = tightenArm(arm, { speedPercent: 70 }, { speedPercent: 50, joints: [{ joint: 0, maxVelocity: 1 }] });
    expect(t.joints[0].maxVelocity).toBeCloseTo(Math.min(arm.joints[0].maxVelocity * 0.7 * 0.5, 1), 12);
    expect(t.joints[1].maxVelocity).toBeCloseTo(arm.joints[1].maxVelocity * 0.35, 12);
    expect(t.joints[0].maxAcceleration).toBe(arm.joints[0].maxAcceleration);
  });

  it("never loosens a limit: a per-joint cap above the arm's own is ignored", () => {
    const t = tightenArm(arm, { joints: [{ joint: 0, maxVelocity: 1e6, min: -100, max: 100 }] });
    expect(t.joints[0].maxVelocity).toBe(arm.joints[0].maxVelocity);
    expect(t.joints[0].min).toBe(arm.joints[0].min);
    expect(t.joints[0].max).toBe(arm.joints[0].max);
  });

  it("leaves the input arm unchanged", () => {
    const before = JSON.stringify(arm);
    tightenArm(arm, { speedPercent: 10 });
    expect(JSON.stringify(arm)).toBe(before);
  });
});

describe("ruleProblems", () => {
  const n = arm.joints.length;
  const zero = new Array(n).fill(0);
  const goal = [1, ...new Array(n - 1).fill(0)];
  it("accepts the required start and goal within the tolerance", () => {
    expect(
      ruleProblems(plan(2), "rev", {
        requiredArmRevisionId: "rev",
        requiredStart: zero,
        requiredGoals: [goal.map((v) => v + 0.0005)],
        poseTolerance: 0.001,
      }),
    ).toEqual([]);
  });
  it("names a missed goal, a wrong start and a wrong arm revision", () => {
    const problems = ruleProblems(plan(2), "other", {
      requiredArmRevisionId: "rev",
      requiredStart: goal,
      requiredGoals: [zero.map(() => 0.5)],
      poseTolerance: 0.001,
    });
    expect(problems.map((p) => p.rule)).toEqual(["arm-revision", "start-pose", "goal-pose"]);
  });
});

describe("checkAgainstAssignment", () => {
  // Quintic peak rate is 15/8 Δ/T: 1 rad in 0.73 s peaks at 2.57 rad/s — 80% of the base's limit.
  it("passes on the arm's own limits but faults at 70% of them", () => {
    const rules = { requiredArmRevisionId: "rev", poseTolerance: 0.001 };
    expect(checkAgainstAssignment(plan(0.73), arm, "rev", rules).report.verdict).not.toBe("fault");
    const strict = checkAgainstAssignment(plan(0.73), arm, "rev", { ...rules, courseLimits: { speedPercent: 70 } });
    expect(strict.report.verdict).toBe("fault");
    expect(strict.report.findings.find((f) => f.kind === "speed-over")?.limit).toBeCloseTo(
      arm.joints[0].maxVelocity * 0.7,
      9,
    );
  });
});

describe("csvField", () => {
  it("quotes separators and neutralises spreadsheet formulas", () => {
    expect(csvField('a,"b"')).toBe('"a,""b"""');
    expect(csvField("=SUM(A1)")).toBe("'=SUM(A1)");
    expect(csvField(-1)).toBe("-1");
    expect(csvField(null)).toBe("");
  });
});
