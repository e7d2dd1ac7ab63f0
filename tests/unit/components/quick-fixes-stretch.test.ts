import { describe, expect, it } from "vitest";
import armH from "@/kinematics/arm/presets/bench-arm-h.json";
import { check, parsePlan } from "@/kinematics";
import type { BenchPlan } from "@/components/editor/plan-state";
import { probeDurationS, quickFixes } from "@/components/editor/quick-fixes";
import { verdictCount } from "@/components/findings/findings-panel";
import { waitingFirst } from "@/components/review/review-queue";

// Every report here is the engine's own full check of a real plan on the gripper demo arm. Which
// faults time clears is read from the engine too: the move is checked again at a long duration. The
// physics behind it (common practice, rigid-body dynamics): inertial torque falls with the square of
// the duration, the torque holding the arm against gravity does not.

/** The gripper arm with its shoulder's effort limit set to `shoulderEffort` N·m, one cubic move of `durationS`. */
function heavyPlan(shoulderEffort: number, durationS: number): BenchPlan {
  const arm = { ...armH, joints: armH.joints.map((j, k) => (k === 1 ? { ...j, maxEffort: shoulderEffort } : j)) };
  const parsed = parsePlan({
    format: "jointproof.plan",
    version: 1,
    arm,
    start: [0, 0, 0, 0, 0, 0, 0.02],
    moves: [{ goal: [0, 0.6, 0.3, 0, 0, 0, 0.02], duration: durationS, shape: "cubic" }],
  });
  if (!parsed.ok) throw new Error(parsed.problems.map((p) => p.message).join("; "));
  return parsed.value as BenchPlan;
}

const faultKeys = (plan: BenchPlan) =>
  check(plan)
    .findings.filter((f) => f.severity === "fault")
    .map((f) => `${f.kind}:${f.joint}`);

describe("advice when no duration makes a move pass", () => {
  it("tells a fault that time clears from the one gravity holds, and counts only the latter as no duration fixing it", () => {
    // 8 N·m on the shoulder: holding the goal pose takes more, so no duration passes; at 0.5 s the
    // acceleration and the elbow's and wrist's efforts fault as well, and those a longer move clears.
    const plan = heavyPlan(8, 0.5);
    const report = check(plan);
    expect(report.moves[0].minSafeDuration).toBeNull();
    const atLength = faultKeys({ ...plan, moves: [{ ...plan.moves[0], duration: probeDurationS }] });
    expect(atLength).toEqual(["effort-over:1"]);

    const fixes = quickFixes(plan, report);
    expect(fixes.moves[0]).toBeNull();
    expect(fixes.plan).toBeNull();
    expect(fixes.untimed).toBe(1);
    report.findings.forEach((f, i) => {
      if (f.severity !== "fault") return;
      const remedy = fixes.findings[i].remedy ?? "";
      expect(fixes.findings[i].fixes).toEqual([]);
      if (f.kind === "effort-over" && f.joint === 1) {
        expect(remedy).toMatch(/^No duration fixes this: gravity alone holds shoulder above its effort limit/);
      } else {
        // the elbow's effort and the acceleration are dynamic: a longer move clears them
        expect(remedy).not.toMatch(/gravity alone holds (elbow|wrist-pitch)/);
        expect(remedy).toMatch(/^A longer duration clears this, but Move 1 still faults at every duration: shoulder/);
      }
    });
  });

  it("an effort fault that time clears on the stock arm offers this move at the shortest passing duration, which leaves no fault", () => {
    const plan = heavyPlan(armH.joints[1].maxEffort, 0.5);
    const report = check(plan);
    expect(report.findings.some((f) => f.kind === "effort-over" && f.severity === "fault")).toBe(true);
    const fixes = quickFixes(plan, report);
    expect(fixes.untimed).toBe(0);
    const move = fixes.moves[0];
    expect(move?.faultsAfter).toBe(0);
    expect(move?.action).toMatchObject({ type: "set-duration", index: 0 });
    const before = report.findings.filter((f) => f.severity === "fault").length;
    expect(move!.faultsAfter).toBeLessThan(before);
  });
});

describe("counts beside a verdict chip", () => {
  const f = (severity: "fault" | "caution") => ({ severity });
  it("shows the findings of the verdict's own severity, as the findings summary counts them", () => {
    expect(verdictCount([f("fault"), f("caution"), f("fault")], "fault")).toBe("2 faults");
    expect(verdictCount([f("caution")], "caution")).toBe("1 caution");
    expect(verdictCount([], "pass")).toBeUndefined();
  });
});

describe("review queue order", () => {
  it("puts waiting submissions first, each group oldest first", () => {
    const rows = [
      { id: "a", status: "approved" as const, submittedAt: "2026-12-01T08:00:00Z" },
      { id: "b", status: "submitted" as const, submittedAt: "2026-12-02T09:00:00Z" },
      { id: "c", status: "returned" as const, submittedAt: "2026-11-30T10:00:00Z" },
      { id: "d", status: "submitted" as const, submittedAt: "2026-12-01T09:00:00Z" },
    ];
    expect(waitingFirst(rows).map((r) => r.id)).toEqual(["d", "b", "c", "a"]);
  });
});
