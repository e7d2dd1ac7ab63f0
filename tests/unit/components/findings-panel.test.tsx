// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { FindingsPanel, type PanelFinding } from "@/components/findings/findings-panel";
import { findingTime, worstFirst } from "@/components/findings/finding-time";
import { check } from "@/kinematics/check";
import { timelineOf } from "@/kinematics/timeline";
import { demoPlan, pose } from "./helpers";

afterEach(cleanup);

/** A plan with speed and acceleration faults (move 1), a speed caution (move 0) and an instant jump (move 2). */
function faultyPlan() {
  return demoPlan([
    // base 1.0 rad quintic over 0.62 s: 1.875/0.62 ≈ 3.02 rad/s, above 90% of 3.2 → caution
    { goal: pose(1.0), duration: 0.62 },
    // base back 1.0 rad over 0.4 s: 4.69 rad/s → speed-over fault
    { goal: pose(0), duration: 0.4 },
    // instant 0.2 rad step of the elbow: 200 rad/s → jump fault
    { goal: pose(0, 0, 0.2), duration: 0 },
  ]);
}

function items(plan = faultyPlan()): PanelFinding[] {
  const report = check(plan);
  const timeline = timelineOf(plan);
  return worstFirst(report.findings).map((finding) => ({ finding, timeS: findingTime(finding, timeline, plan.moves.map((m) => m.shape)) }));
}

describe("findings panel", () => {
  it("lists the engine's findings worst first: faults before cautions, bigger overshoot first", () => {
    const list = items();
    // jump 55.6× its limit, acceleration 2.0×, speed 1.46×, then the caution at 0.95
    expect(list.map((i) => `${i.finding.severity}:${i.finding.kind}:${i.finding.move}`)).toEqual([
      "fault:jump:2",
      "fault:accel-over:1",
      "fault:speed-over:1",
      "caution:speed-over:0",
    ]);
  });

  it("shows each finding with its verdict word, kind, joint, move, time and the engine's message", () => {
    const plan = faultyPlan();
    render(<FindingsPanel verdict="fault" items={items(plan)} joints={plan.arm.joints} onJump={() => {}} />);
    expect(screen.getAllByText("Jump too far").length).toBeGreaterThan(0);
    expect(screen.getAllByText("Speed over limit").length).toBeGreaterThan(0);
    const speed = items(plan).find((i) => i.finding.kind === "speed-over" && i.finding.severity === "fault")!;
    expect(screen.getByText(speed.finding.message)).toBeTruthy();
    expect(screen.getAllByText(/t = 0\.820 s/).length).toBeGreaterThan(0); // mid-move 1: 0.62 + 0.2
    expect(screen.getByText("3 faults, 1 caution.")).toBeTruthy();
  });

  it("never shows a verdict by colour alone: every item carries the word and an icon", () => {
    const plan = faultyPlan();
    const { container } = render(<FindingsPanel verdict="fault" items={items(plan)} joints={plan.arm.joints} onJump={() => {}} />);
    const chips = container.querySelectorAll("li [data-verdict]");
    expect(chips.length).toBe(items(plan).length);
    for (const chip of chips) {
      expect(chip.textContent).toMatch(/Fault|Caution/);
      expect(chip.querySelector("svg")).not.toBeNull();
    }
  });

  it("clicking a finding jumps to the moment it happens and its move", () => {
    const plan = faultyPlan();
    const jumps: [number, number | null][] = [];
    render(<FindingsPanel verdict="fault" items={items(plan)} joints={plan.arm.joints} onJump={(t, m) => jumps.push([t, m])} />);
    fireEvent.click(screen.getAllByRole("button", { name: /Jump too far/ })[0]);
    expect(jumps).toHaveLength(1);
    expect(jumps[0][1]).toBe(2);
    expect(jumps[0][0]).toBeCloseTo(1.02, 9); // the instant move happens at the end of move 1
  });

  it("offers a fix when one is given and applies it on click", () => {
    const plan = faultyPlan();
    let applied = 0;
    const list = items(plan).map((i, k) => (k === 0 ? { ...i, fix: { label: "Set move 2 to 0.100 s", apply: () => applied++ } } : i));
    render(<FindingsPanel verdict="fault" items={list} joints={plan.arm.joints} onJump={() => {}} />);
    fireEvent.click(screen.getByRole("button", { name: "Set move 2 to 0.100 s" }));
    expect(applied).toBe(1);
  });

  it("says so plainly when there are no findings", () => {
    const plan = demoPlan([{ goal: pose(0.3), duration: 2 }]);
    expect(check(plan).verdict).toBe("pass");
    render(<FindingsPanel verdict="pass" items={items(plan)} joints={plan.arm.joints} onJump={() => {}} />);
    expect(screen.getByText(/No findings/)).toBeTruthy();
    expect(screen.getByText("Pass")).toBeTruthy();
  });
});
