// The duration sweep the bench draws must tell the same story as the check: at a duration where the
// sweep's worst ratio is over 1 the check faults on that move (speed, acceleration, effort or tool
// speed), and where it is under 1 it does not. The sweep was once speed and acceleration only, so an
// effort-limited move looked safe on the chart at durations that fault.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { check, moveTimingSweep, parsePlan, type Finding, type Plan, type Report } from "@/kinematics";
import { readJson } from "../arm/helpers";

type ArmDoc = { joints: { min: number; max: number; maxEffort?: number }[] } & Record<string, unknown>;
const heavy = readJson("kinematics/arm/presets/bench-arm-h.json") as ArmDoc;
const light = readJson("kinematics/arm/presets/bench-arm-l.json") as ArmDoc;

function parse(doc: unknown): Plan {
  const r = parsePlan(doc);
  if (!r.ok) throw new Error(r.problems.map((p) => `${p.path}: ${p.message}`).join("; "));
  return r.value;
}
const timingKinds = new Set<Finding["kind"]>(["speed-over", "accel-over", "effort-over", "tool-speed"]);
const timingFaults = (report: Report, move: number) =>
  report.findings.filter((f) => f.move === move && f.severity === "fault" && timingKinds.has(f.kind));
const withDuration = (plan: Plan, move: number, durationS: number): Plan => ({
  ...plan,
  moves: plan.moves.map((m, i) => (i === move ? { ...m, duration: durationS } : m)),
});

describe("the duration sweep of a move", () => {
  it("shows an effort fault that speed and acceleration allow: over 1 at the planned duration, from effort", () => {
    const plan = parse(readJson("tests/fixtures/arm-plans/reach-out-heavy.json"));
    const report = check(plan);
    const fault = report.findings.find((f) => f.kind === "effort-over" && f.severity === "fault")!;
    expect(fault).toBeDefined();
    const i = fault.move!;
    const [now] = moveTimingSweep(plan, i, [plan.moves[i].duration]);
    expect(now.ratio).toBeGreaterThan(1);
    expect(now.check).toBe("effort");
    expect(now.joint).toBe(fault.joint);
  });

  it("crosses 1 at the report's shortest safe duration (every timing check)", () => {
    const plan = parse(readJson("tests/fixtures/arm-plans/reach-out-heavy.json"));
    const report = check(plan);
    const i = report.findings.find((f) => f.kind === "effort-over" && f.severity === "fault")!.move!;
    const safe = report.moves[i].minSafeDuration!;
    const [below, at] = moveTimingSweep(plan, i, [safe * 0.97, safe]);
    expect(below.ratio).toBeGreaterThan(1);
    expect(at.ratio).toBeLessThanOrEqual(1 + 1e-9);
  });

  it("stays over 1 at every duration when gravity alone exceeds an effort limit", () => {
    const arm = { ...heavy, joints: heavy.joints.map((j, i) => (i === 1 ? { ...j, maxEffort: 4 } : j)) };
    const plan = parse({
      format: "jointproof.plan",
      version: 1,
      arm,
      start: [0, 0, 0, 0, 0, 0, 0],
      payload: { mass: 0.5 },
      moves: [{ goal: [0, 1.4, 0, 0, 0, 0, 0], duration: 1, shape: "quintic" }],
    });
    for (const p of moveTimingSweep(plan, 0, [0.5, 1, 10, 1000])) {
      expect(p.ratio).toBeGreaterThan(1);
      expect(p.check).toBe("effort");
    }
  });

  it("is over 1 exactly where the check faults the move on timing (random plans on both demo arms)", () => {
    const unit = fc.double({ min: 0, max: 1, noNaN: true });
    const arb = fc.record({
      heavyArm: fc.boolean(),
      start: fc.array(unit, { minLength: 7, maxLength: 7 }),
      goal: fc.array(unit, { minLength: 7, maxLength: 7 }),
      shape: fc.constantFrom("cubic", "quintic", "trapezoid"),
      payload: fc.option(fc.double({ min: 0, max: 0.6, noNaN: true }), { nil: undefined }),
      maxToolSpeed: fc.option(fc.double({ min: 0.2, max: 1.5, noNaN: true }), { nil: undefined }),
      durations: fc.array(fc.double({ min: 0.1, max: 3, noNaN: true }), { minLength: 1, maxLength: 4 }),
    });
    let compared = 0;
    let faulting = 0;
    fc.assert(
      fc.property(arb, (d) => {
        const arm = d.heavyArm ? heavy : light;
        const pose = (u: number[]) =>
          u.map((x, j) => arm.joints[j].min + (0.1 + 0.8 * x) * (arm.joints[j].max - arm.joints[j].min));
        const plan = parse({
          format: "jointproof.plan",
          version: 1,
          arm,
          start: pose(d.start),
          ...(d.payload !== undefined ? { payload: { mass: d.payload, com: [0, 0, 0.03] } } : {}),
          ...(d.maxToolSpeed !== undefined ? { maxToolSpeed: d.maxToolSpeed } : {}),
          moves: [{ goal: pose(d.goal), duration: 1, shape: d.shape }],
        });
        for (const p of moveTimingSweep(plan, 0, d.durations)) {
          if (Math.abs(p.ratio - 1) < 1e-6) continue; // on the limit itself either answer is fair
          const faults = timingFaults(check(withDuration(plan, 0, p.durationS)), 0);
          expect(faults.length > 0, `duration ${p.durationS} s: ratio ${p.ratio} (${p.check})`).toBe(p.ratio > 1);
          compared++;
          if (p.ratio > 1) faulting++;
        }
      }),
      { numRuns: 40, seed: 5 },
    );
    expect(compared).toBeGreaterThan(60);
    expect(faulting).toBeGreaterThan(10);
  });
});

describe("a move longer than a joint's whole travel", () => {
  // Found by the server's fuzz probe: an instant move to −10⁶ rad and back made the shortest-safe
  // search wind the path round thousands of times (minutes of work). Travel does not depend on
  // timing, so such a move has no timing fix, and the check says so at once.
  it("has no shortest safe duration, says that no duration fixes it and why, and is checked quickly", () => {
    const plan = parse({
      format: "jointproof.plan",
      version: 1,
      arm: light,
      start: [0, 0, 0, 0, 0, 0, 0],
      moves: [
        { goal: [-1e6, 0, 0, 0, 0, 0, 0], duration: 0, shape: "trapezoid" },
        { goal: [0, 0, 0, 0, 0, 0, 0], duration: 0.033, shape: "quintic" },
      ],
    });
    const report = check(plan);
    expect(report.verdict).toBe("fault");
    expect(report.moves.map((m) => m.minSafeDuration)).toEqual([null, null]);
    expect(report.findings.some((f) => f.kind === "range" && f.joint === 0)).toBe(true);
    const advice = report.findings.filter((f) => f.move === 1 && f.kind !== "range").map((f) => f.message);
    expect(advice.length).toBeGreaterThan(0);
    for (const message of advice)
      expect(message).toMatch(/No duration fixes this move: it moves joint "base" farther than its whole travel/);
  });

  it("a move within the travel still gets its shortest safe duration", () => {
    const plan = parse({
      format: "jointproof.plan",
      version: 1,
      arm: light,
      start: [-3, 0, 0, 0, 0, 0, 0],
      moves: [{ goal: [3, 0, 0, 0, 0, 0, 0], duration: 0.5, shape: "quintic" }],
    });
    expect(check(plan).moves[0].minSafeDuration).toBeGreaterThan(0.5);
  });
});
