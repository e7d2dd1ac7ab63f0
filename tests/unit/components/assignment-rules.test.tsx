// @vitest-environment happy-dom
import { cleanup, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import {
  AssignmentRulesPanel,
  assignmentArm,
  limitLines,
  toleranceText,
  type BenchAssignment,
} from "@/components/editor/assignment-rules";
import { check } from "@/kinematics";
import { demoPlan, pose } from "./helpers";

afterEach(cleanup);

const revision = "5b0c7a52-0000-4000-8000-00000000000a";

function assignment(overrides: Partial<BenchAssignment["rules"]> = {}): BenchAssignment {
  return {
    title: "Pick and place",
    courseTitle: "Robot Motion I",
    armRevisionId: revision,
    rules: {
      requiredArmRevisionId: revision,
      poseTolerance: 0.01,
      courseLimits: { speedPercent: 70 },
      limits: null,
      ...overrides,
    },
  };
}

describe("the bench of an assignment's plan", () => {
  it("checks against the course's limits: a move that passes on the arm faults at 70% of maximum speed", () => {
    // base 1.0 rad in 0.75 s with a quintic: peak 1.875·D/T = 2.5 rad/s (Lynch & Park, Modern Robotics §9.2.1, memory),
    // below the light arm's 3.2 rad/s but above 70% of it (2.24 rad/s)
    const plan = demoPlan([{ goal: pose(1.0), duration: 0.75 }]);
    expect(check(plan).findings.some((f) => f.kind === "speed-over" && f.severity === "fault")).toBe(false);
    const tightened = { ...plan, arm: assignmentArm(assignment())(plan.arm) };
    const speed = check(tightened).findings.find((f) => f.kind === "speed-over" && f.severity === "fault");
    expect(speed?.limit).toBeCloseTo(0.7 * plan.arm.joints[0].maxVelocity, 12);
  });

  it("names each limit in words, in the form's unit", () => {
    const plan = demoPlan([]);
    expect(limitLines("course", { speedPercent: 70 }, plan.arm.joints, "deg")).toEqual([
      "course limit: 70% of maximum speed",
    ]);
    const caps = limitLines(
      "assignment",
      { accelPercent: 50, joints: [{ joint: 1, max: Math.PI / 4 }] },
      plan.arm.joints,
      "deg",
    );
    expect(caps[0]).toBe("assignment limit: 50% of maximum acceleration");
    expect(caps[1]).toBe(`assignment limit for ${plan.arm.joints[1].name}: travel its minimum to 45.0°`);
    expect(toleranceText(0.01, plan.arm.joints)).toBe(
      "±0.573° (0.01 rad) on revolute joints, ±10 mm on prismatic joints",
    );
  });

  it("lists the required poses and which ones the plan meets, in order", () => {
    const plan = demoPlan([
      { goal: pose(0.5), duration: 2 },
      { goal: pose(0.5, 0.3), duration: 2 },
    ]);
    const rules = { requiredStart: pose(0), requiredGoals: [pose(0.5), pose(0.9)] };
    render(<AssignmentRulesPanel assignment={assignment(rules)} plan={plan} unit="deg" />);
    const list = screen.getByRole("list", { name: "Required poses" });
    const items = within(list).getAllByRole("listitem");
    expect(items.map((i) => i.textContent)).toEqual([
      "Start pose:met",
      "Goal pose 1 (in order):met",
      "Goal pose 2 (in order):not met yet",
    ]);
    expect(screen.getByText("course limit: 70% of maximum speed")).toBeTruthy();
  });

  it("says so when the plan is on another arm revision than the assignment requires", () => {
    const plan = demoPlan([{ goal: pose(0.5), duration: 2 }]);
    render(
      <AssignmentRulesPanel
        assignment={{ ...assignment(), armRevisionId: "5b0c7a52-0000-4000-8000-00000000000b" }}
        plan={plan}
        unit="deg"
      />,
    );
    expect(screen.getByRole("alert").textContent).toMatch(/another arm revision/);
  });
});
