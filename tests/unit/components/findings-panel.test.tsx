// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { FindingsPanel, type PanelFinding } from "@/components/findings/findings-panel";
import { findingTimeS, worstFirst } from "@/components/findings/finding-time";
import { check } from "@/kinematics";
import { timelineOf } from "@/kinematics/motion/timeline";
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
  return worstFirst(report.findings).map((finding) => ({ finding, timeS: findingTimeS(finding, timeline) }));
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
    expect(screen.getAllByText(/t = 0\.820 s/).length).toBeGreaterThan(0); // the engine's timeS: mid-move 1, 0.62 + 0.2
    expect(screen.getByText("3 faults, 1 caution.")).toBeTruthy();
  });

  it("never shows a verdict by colour alone: every item carries the word and an icon", () => {
    const plan = faultyPlan();
    const { container } = render(
      <FindingsPanel verdict="fault" items={items(plan)} joints={plan.arm.joints} onJump={() => {}} />,
    );
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
    render(
      <FindingsPanel
        verdict="fault"
        items={items(plan)}
        joints={plan.arm.joints}
        onJump={(t, m) => jumps.push([t, m])}
      />,
    );
    fireEvent.click(screen.getAllByRole("button", { name: /Jump too far/ })[0]);
    expect(jumps).toHaveLength(1);
    expect(jumps[0][1]).toBe(2);
    expect(jumps[0][0]).toBeCloseTo(1.02, 9); // the instant move happens at the end of move 1
  });

  it("offers each given fix and applies the one clicked, with the advice in words beside them", () => {
    const plan = faultyPlan();
    const applied: string[] = [];
    const list = items(plan).map((i, k) =>
      k === 0
        ? {
            ...i,
            fixes: [
              { label: "This move only", scope: "move" as const, apply: () => applied.push("move") },
              { label: "Whole plan, one factor", scope: "plan" as const, apply: () => applied.push("plan") },
            ],
            remedy: "Give it a duration or take a smaller step.",
          }
        : i,
    );
    render(<FindingsPanel verdict="fault" items={list} joints={plan.arm.joints} onJump={() => {}} />);
    fireEvent.click(screen.getByRole("button", { name: "Whole plan, one factor" }));
    fireEvent.click(screen.getByRole("button", { name: "This move only" }));
    expect(applied).toEqual(["plan", "move"]);
    expect(screen.getByText("Give it a duration or take a smaller step.")).toBeTruthy();
  });

  it("shows no verdict chip and the given summary when told there is no verdict (no moves yet)", () => {
    const plan = demoPlan([]);
    const { container } = render(
      <FindingsPanel verdict={null} summary="No moves yet." items={[]} joints={plan.arm.joints} onJump={() => {}} />,
    );
    expect(container.querySelector("[data-verdict]")).toBeNull();
    expect(screen.getByText("No moves yet.")).toBeTruthy();
    expect(screen.queryByText("Pass")).toBeNull();
  });

  it("places every finding at the engine's timeS, not at a time the bench works out", () => {
    const plan = faultyPlan();
    const report = check(plan);
    const timeline = timelineOf(plan);
    for (const f of report.findings) {
      expect(f.timeS).toBeDefined();
      expect(findingTimeS(f, timeline)).toBe(f.timeS);
    }
    // the quintic's acceleration peaks at τ = (3 − √3)/6 of move 1: 0.62 + 0.2113 × 0.4 ≈ 0.705 s
    const accel = items(plan).find((i) => i.finding.kind === "accel-over")!;
    expect(accel.timeS).toBeCloseTo(0.62 + ((3 - Math.sqrt(3)) / 6) * 0.4, 6);
    // a timeS the engine sets is what the panel shows and jumps to, whatever the shape would suggest
    const moved = items(plan).map((i) =>
      i.finding.kind === "accel-over" ? { ...i, timeS: findingTimeS({ ...i.finding, timeS: 0.777 }, timeline) } : i,
    );
    const jumps: number[] = [];
    render(<FindingsPanel verdict="fault" items={moved} joints={plan.arm.joints} onJump={(t) => jumps.push(t)} />);
    fireEvent.click(screen.getByRole("button", { name: /Acceleration over limit/ }));
    expect(jumps).toEqual([0.777]);
    expect(screen.getByText("t = 0.777 s")).toBeTruthy();
  });

  it("a stored report without timeS (before the engine timed findings) falls back to its move's start", () => {
    const plan = faultyPlan();
    const timeline = timelineOf(plan);
    const speed = check(plan).findings.find((f) => f.kind === "speed-over" && f.move === 1)!;
    const { timeS: _dropped, ...old } = speed;
    void _dropped;
    expect(findingTimeS(old, timeline)).toBeCloseTo(0.62, 12);
    expect(findingTimeS({ ...old, move: null }, timeline)).toBe(0);
  });

  it("a clearance finding names the link, the zone and the depth, and jumps to the deepest instant", () => {
    // shoulder 1.2 rad and elbow 2.5 rad over 2 s drive the handle into the table mid-move
    const plan = demoPlan([{ goal: pose(0, 1.2, 2.5), duration: 2 }]);
    const list = items(plan).filter((i) => i.finding.kind === "clearance");
    expect(list.length).toBeGreaterThan(0);
    const worst = list.reduce((a, b) => (b.finding.value > a.finding.value ? b : a));
    expect(worst.finding.link).toBe("handle");
    expect(worst.finding.zone).toBe("work surface");
    const jumps: number[] = [];
    render(<FindingsPanel verdict="fault" items={list} joints={plan.arm.joints} onJump={(t) => jumps.push(t)} />);
    const button = screen.getByRole("button", { name: /Clearance, link handle/ });
    expect(within(button).getByText("link handle")).toBeTruthy();
    expect(within(button).getAllByText("into work surface").length).toBe(1);
    expect(within(button).getByText(`${(worst.finding.value * 1000).toFixed(1)} mm deep`)).toBeTruthy();
    fireEvent.click(button);
    expect(jumps[0]).toBe(worst.finding.timeS);
    expect(jumps[0]).toBeGreaterThan(0.5);
    expect(jumps[0]).toBeLessThan(2);
  });

  it("says so plainly when there are no findings", () => {
    const plan = demoPlan([{ goal: pose(0.3), duration: 2 }]);
    expect(check(plan).verdict).toBe("pass");
    render(<FindingsPanel verdict="pass" items={items(plan)} joints={plan.arm.joints} onJump={() => {}} />);
    expect(screen.getByText(/No findings/)).toBeTruthy();
    expect(screen.getByText("Pass")).toBeTruthy();
  });
});
