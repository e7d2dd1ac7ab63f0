import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { planReducer, type BenchPlan } from "@/components/editor/plan-state";
import { fixLabel, quickFixes, remedyFor, shortestPassing, timingKinds } from "@/components/editor/quick-fixes";
import { check, parsePlan, type Report } from "@/kinematics";
import { demoPlan, pose } from "./helpers";

// Every report here is the engine's own full check (joint and arm-model checks) of a real plan on a
// demo arm; the fixes are checked again by applying them to the plan and running the engine.

function fixture(name: string): BenchPlan {
  const parsed = parsePlan(
    JSON.parse(readFileSync(new URL(`../../fixtures/arm-plans/${name}.json`, import.meta.url), "utf8")),
  );
  if (!parsed.ok) throw new Error(parsed.problems.map((p) => p.message).join("; "));
  return parsed.value as BenchPlan;
}

const faultsOf = (report: Report, move?: number | null) =>
  report.findings.filter((f) => f.severity === "fault" && (move === undefined || f.move === move));

/** Applies every offered fix to a copy and checks it: the fix's own claims must hold. */
function expectEveryFixHolds(plan: BenchPlan, report: Report) {
  const fixes = quickFixes(plan, report);
  const all = [
    ...fixes.findings.flatMap((f) => f.fixes),
    ...fixes.moves.filter((f) => f !== null),
    ...(fixes.plan ? [fixes.plan] : []),
  ];
  for (const fix of all) {
    const after = check(planReducer(plan, fix.action));
    expect(after.verdict).toBe(fix.verdictAfter);
    expect(faultsOf(after).length).toBe(fix.faultsAfter);
    if (fix.move !== null && fix.scope === "move") expect(faultsOf(after, fix.move)).toEqual([]);
    if (fix.scope === "plan") expect(after.verdict).not.toBe("fault");
    // never worse: no move gains a fault
    for (let m = -1; m < plan.moves.length; m++) {
      const key = m < 0 ? null : m;
      expect(faultsOf(after, key).length).toBeLessThanOrEqual(faultsOf(report, key).length);
    }
  }
  return fixes;
}

describe("quick fixes", () => {
  it("a timed move over its speed limit offers this move at the report's shortest passing duration, and the whole plan by one factor", () => {
    // 1.5 rad on the base in 0.3 s with a quintic peaks at 1.875·D/T = 9.4 rad/s (Lynch & Park,
    // Modern Robotics §9.2.1, memory), well over the light arm's speed limit.
    const plan = demoPlan([{ goal: pose(1.5), duration: 0.3 }]);
    const report = check(plan);
    expect(faultsOf(report, 0).some((f) => f.kind === "speed-over")).toBe(true);
    const fixes = expectEveryFixHolds(plan, report);
    const safe = shortestPassing(report, 0);
    expect(safe).not.toBeNull();
    expect(fixes.moves[0]?.action).toEqual({ type: "set-duration", index: 0, duration: safe });
    expect(safe as number).toBeGreaterThan(0.3);
    expect(fixes.plan?.scope).toBe("plan");
    expect(fixes.plan?.factor as number).toBeGreaterThan(1);
    const speed = report.findings.findIndex((f) => f.kind === "speed-over" && f.severity === "fault");
    expect(fixes.findings[speed].fixes.map((f) => f.scope)).toEqual(["move", "plan"]);
    expect(fixLabel(fixes.findings[speed].fixes[0], plan, "deg")).toBe(
      `This move only: Move 1 to ${(safe as number).toFixed(3)} s`,
    );
  });

  it("an instant move across a large angle offers a duration, and its advice names the control period and a smaller step", () => {
    // Common practice (no published source): an instant move far from the current pose is a jump-too-far fault.
    const plan = demoPlan([{ goal: pose(0.6), duration: 0 }]);
    const report = check(plan);
    const jump = report.findings.findIndex((f) => f.kind === "jump" && f.severity === "fault");
    expect(jump).toBeGreaterThanOrEqual(0);
    const fixes = expectEveryFixHolds(plan, report);
    const safe = shortestPassing(report, 0) as number;
    expect(fixes.findings[jump].fixes[0]?.action).toEqual({ type: "set-duration", index: 0, duration: safe });
    expect(fixes.findings[jump].remedy).toContain("one control period (1 ms at 1000 Hz)");
    expect(fixes.findings[jump].remedy).toContain(`shortest passing: ${safe.toFixed(3)} s`);
    expect(fixes.findings[jump].remedy).toContain("smaller step");
    expect(fixLabel(fixes.findings[jump].fixes[0], plan, "deg")).toContain("Instant move 1");
    // a plan of instant moves only has no timed move to scale
    expect(fixes.plan).toBeNull();
  });

  it("a clearance fault offers no timing fix and says a different pose or path would fix it", () => {
    const plan = fixture("clip-surface");
    const report = check(plan);
    expect(faultsOf(report).every((f) => f.kind === "clearance")).toBe(true);
    const fixes = expectEveryFixHolds(plan, report);
    expect(fixes.moves[0]).toBeNull();
    expect(fixes.plan).toBeNull();
    expect(fixes.untimed).toBe(faultsOf(report).length);
    for (const [i, f] of report.findings.entries()) {
      if (f.severity !== "fault") continue;
      expect(fixes.findings[i].fixes).toEqual([]);
      expect(fixes.findings[i].remedy).toMatch(/^No duration fixes this: choose a different pose or path/);
    }
  });

  it("an effort fault from gravity alone offers no timing fix and names a different pose, a lighter payload or the other tool", () => {
    // The shoulder's effort limit set below what holding the arm out against gravity takes: at any
    // duration the static torque alone is over it, so no duration can pass.
    const base = fixture("reach-out-heavy");
    const weak: BenchPlan = {
      ...base,
      arm: { ...base.arm, joints: base.arm.joints.map((j, k) => (k === 1 ? { ...j, maxEffort: 0.5 } : j)) },
    };
    const report = check(weak);
    const effort = report.findings.findIndex((f) => f.kind === "effort-over" && f.severity === "fault" && f.move === 0);
    expect(effort).toBeGreaterThanOrEqual(0);
    const fixes = expectEveryFixHolds(weak, report);
    expect(fixes.findings[effort].fixes).toEqual([]);
    expect(fixes.moves[0]).toBeNull();
    expect(fixes.plan).toBeNull();
    expect(fixes.findings[effort].remedy).toMatch(/different pose or path, a lighter payload or the other tool/);
  });

  it("the reach-out plan on the gripper arm is never offered a fix that leaves a fault or shortens the faulting move", () => {
    const plan = fixture("reach-out-heavy");
    const report = check(plan);
    expect(faultsOf(report, 0).some((f) => f.kind === "effort-over")).toBe(true);
    const fixes = expectEveryFixHolds(plan, report);
    const moveFix = fixes.moves[0];
    if (moveFix && moveFix.action.type === "set-duration")
      expect(moveFix.action.duration).toBeGreaterThan(plan.moves[0].duration);
    if (fixes.plan) expect(fixes.plan.factor as number).toBeGreaterThan(1);
  });

  it("a move that passes is never stretched: it is only offered its shorter shortest passing duration", () => {
    const plan = demoPlan([
      { goal: pose(0.3), duration: 3 },
      { goal: pose(1.8), duration: 0.3 },
    ]);
    const report = check(plan);
    expect(faultsOf(report, 0)).toEqual([]);
    const fixes = expectEveryFixHolds(plan, report);
    const first = fixes.moves[0];
    expect(first?.action.type).toBe("set-duration");
    if (first?.action.type === "set-duration") expect(first.action.duration).toBeLessThan(3);
    // the whole-plan factor stretches both, and is offered as the whole-plan choice only
    if (fixes.plan?.action.type === "set-durations") expect(fixes.plan.action.durations[0]).toBeGreaterThan(3);
    for (const [i, f] of report.findings.entries()) if (f.move === 0) expect(fixes.findings[i].fixes).toEqual([]);
  });

  it("a goal outside the travel offers the nearest limit only when that clears it without a new fault", () => {
    const plan = demoPlan([{ goal: pose(0, 2.5), duration: 3 }]);
    const report = check(plan);
    const range = report.findings.findIndex((f) => f.kind === "range" && f.severity === "fault");
    expect(range).toBeGreaterThanOrEqual(0);
    const fixes = expectEveryFixHolds(plan, report);
    expect(fixes.findings[range].remedy).toMatch(
      /^No duration fixes this: bring shoulder in Move 1 back inside its travel/,
    );
    const offered = fixes.findings[range].fixes;
    expect(offered.length).toBeLessThanOrEqual(1);
    if (offered[0])
      expect(offered[0].action).toEqual({
        type: "set-joint",
        target: 0,
        joint: 1,
        value: report.findings[range].limit,
      });
  });

  it("a plan that still faults after scaling (a timing fault beside a clearance fault) offers this move only, not the whole plan", () => {
    const clip = fixture("clip-surface");
    // a quick turn of the base first (clear of the table, too fast), then the fixture's move into the table, turned too
    const turned = (q: readonly number[]) => q.map((v, j) => (j === 0 ? v + 0.8 : v));
    const plan: BenchPlan = {
      ...clip,
      moves: [
        { goal: turned(clip.start), duration: 0.2, shape: "quintic" },
        { ...clip.moves[0], goal: turned(clip.moves[0].goal) },
      ],
    };
    const report = check(plan);
    expect(faultsOf(report, 0).length).toBeGreaterThan(0);
    expect(faultsOf(report, 0).every((f) => timingKinds.has(f.kind))).toBe(true);
    expect(faultsOf(report, 1).some((f) => f.kind === "clearance")).toBe(true);
    const fixes = expectEveryFixHolds(plan, report);
    expect(fixes.plan).toBeNull();
    expect(fixes.moves[0]?.scope).toBe("move");
    expect(fixes.moves[1]).toBeNull();
  });

  it("advice for a timing fault whose move has other faults says to fix those first", () => {
    const plan = demoPlan([{ goal: pose(1.5, 2.5), duration: 0.3 }]);
    const report = check(plan);
    const speed = report.findings.find((f) => f.kind === "speed-over" && f.severity === "fault");
    expect(speed).toBeDefined();
    const fixes = quickFixes(plan, report);
    expect(fixes.moves[0]).toBeNull();
    const text = remedyFor(speed!, plan, report, false);
    expect(text).toContain("fix those first");
  });

  it("offers nothing for a plan without faults", () => {
    const plan = demoPlan([{ goal: pose(0.2), duration: 2 }]);
    const report = check(plan);
    expect(report.verdict).not.toBe("fault");
    const fixes = quickFixes(plan, report);
    expect(fixes.plan).toBeNull();
    expect(fixes.findings.every((f) => f.fixes.length === 0 && f.remedy === null)).toBe(true);
  });
});
