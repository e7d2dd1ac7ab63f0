import { describe, expect, it } from "vitest";
import { check } from "@/kinematics";
import { parseArm, type Arm } from "@/kinematics";
import { samplePlan } from "@/kinematics/motion/sample";
import {
  planFromPoses,
  scalePlan,
  scaleToPass,
  shortestSafeDurations,
  withShortestDurations,
} from "@/kinematics/motion/sequence";

function expectClose(actual: number | null, expected: number, rel = 1e-12, abs = 1e-12): void {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) - expected)).toBeLessThanOrEqual(abs + rel * Math.abs(expected));
}

function armOf(): Arm {
  const result = parseArm({
    name: "Sequence arm",
    controlRateHz: 1000,
    joints: [
      { name: "base", min: -3, max: 3, maxVelocity: 2, maxAcceleration: 10 },
      { name: "elbow", min: -2, max: 2, maxVelocity: 3, maxAcceleration: 15 },
    ],
  });
  if (!result.ok) throw new Error(JSON.stringify(result.problems));
  return result.value;
}

describe("sequences", () => {
  it("builds a plan from a pose sequence with per-move durations", () => {
    const plan = planFromPoses(
      armOf(),
      [0, 0],
      [
        [1, 0.5],
        [0, 0],
      ],
      [2, 3],
      "cubic",
    );
    expect(plan.moves.map((m) => [m.duration, m.shape])).toEqual([
      [2, "cubic"],
      [3, "cubic"],
    ]);
    expect(check(plan).verdict).toBe("pass");
  });

  // Time scaling (Biagiotti & Melchiorri, Trajectory Planning for Automatic Machines and Robots, 2008 — memory):
  // stretching by s divides velocities by s and accelerations by s²
  it("stretching a plan by s divides peak velocities by s and peak accelerations by s²", () => {
    const plan = planFromPoses(
      armOf(),
      [0, 0],
      [
        [1, 0.5],
        [-0.5, 1.2],
      ],
      [0.8, 1.1],
      "quintic",
    );
    const s = 1.7;
    const before = check(plan);
    const after = check(scalePlan(plan, s));
    before.moves.forEach((move, i) => {
      move.peakVelocity.forEach((v, j) => expectClose(after.moves[i].peakVelocity[j], v / s));
      move.peakAcceleration.forEach((a, j) => expectClose(after.moves[i].peakAcceleration[j], (a as number) / (s * s)));
    });
  });

  it("scale to pass returns the least factor: the largest shortest-safe / duration ratio", () => {
    const plan = planFromPoses(
      armOf(),
      [0, 0],
      [
        [2, 0],
        [2, 1.5],
      ],
      [0.5, 2],
      "cubic",
    );
    expect(check(plan).verdict).toBe("fault");
    // move 0: base D = 2 → speed bound 1.5·2/2 = 1.5 s, acceleration bound √(6·2/10) ≈ 1.095 s → ratio 3
    const result = scaleToPass(plan);
    expectClose(result.factor, 3, 1e-12);
    expect(result.report.findings.filter((f) => f.severity === "fault")).toEqual([]);
    expect(result.unscalable).toEqual([]);
  });

  it("scale to pass keeps a passing plan's timing unless asked to run faster", () => {
    const plan = planFromPoses(armOf(), [0, 0], [[0.3, 0]], [4], "cubic");
    expect(scaleToPass(plan).factor).toBe(1);
    const faster = scaleToPass(plan, { allowFaster: true });
    expect(faster.factor).toBeLessThan(1);
    expect(faster.report.verdict).not.toBe("fault");
  });

  it("scale to pass reports instant-move jumps as faults no factor can fix", () => {
    const plan = planFromPoses(
      armOf(),
      [0, 0],
      [
        [1, 0],
        [1, 0.5],
      ],
      [1, 0],
    );
    const result = scaleToPass(plan);
    expect(result.unscalable.map((f) => [f.kind, f.move])).toEqual([["jump", 1]]);
  });

  it("with limitScale = cautionRatio, scale to pass also clears cautions", () => {
    const plan = planFromPoses(armOf(), [0, 0], [[2, 0]], [1.2], "cubic");
    const result = scaleToPass(plan, { limitScale: 0.9 });
    expect(result.report.verdict).toBe("pass");
  });

  it("per-move shortest safe durations match the report, and retiming to them passes", () => {
    const plan = planFromPoses(
      armOf(),
      [0, 0],
      [
        [1, 0.5],
        [1, 0.5],
        [-1, -1],
      ],
      [3, 2, 0.1],
      "trapezoid",
    );
    const shortest = shortestSafeDurations(plan);
    expect(shortest).toEqual(check(plan).moves.map((m) => m.minSafeDuration));
    expect(shortest[1]).toBe(0);
    const retimed = withShortestDurations(plan);
    expect(retimed.moves[1].duration).toBe(2); // zero-length move keeps its duration
    expect(check(retimed).findings.filter((f) => f.severity === "fault")).toEqual([]);
  });
});

describe("sampling", () => {
  it("samples at the control rate by default, from 0 to the end", () => {
    const plan = planFromPoses(armOf(), [0, 0], [[1, 0.5]], [0.01], "cubic");
    const samples = samplePlan(plan);
    expect(samples.count).toBe(11);
    expectClose(samples.timeS[10], 0.01);
    expect(samples.position.length).toBe(22);
  });

  it("samples a cubic at its midpoint at half the displacement, at its peak speed", () => {
    const plan = planFromPoses(armOf(), [0, 0], [[1, -0.5]], [2], "cubic");
    const samples = samplePlan(plan, { rateHz: 10 });
    const mid = 10 * 2; // t = 1 s
    expectClose(samples.position[mid], 0.5);
    expectClose(samples.position[mid + 1], -0.25);
    expectClose(samples.velocity[mid], (1.5 * 1) / 2);
    expectClose(samples.acceleration[0], (6 * 1) / 4);
  });

  it("shows an instant move as a step between two samples", () => {
    const plan = planFromPoses(
      armOf(),
      [0, 0],
      [
        [0.1, 0],
        [0.2, 0],
        [0.2, 0.1],
      ],
      [0.1, 0, 0.1],
      "quintic",
    );
    const samples = samplePlan(plan, { rateHz: 100 });
    // sample 10 (t = 0.1 s) is the start of the last move, already after the instant step
    expectClose(samples.position[9 * 2], 0.1 - 0.1 * (1 - (10 * 0.9 ** 3 - 15 * 0.9 ** 4 + 6 * 0.9 ** 5)), 1e-9);
    expect(samples.position[10 * 2]).toBe(0.2);
    expect(samples.position[20 * 2 + 1]).toBe(0.1);
  });

  it("after the last move, velocity and acceleration are zero", () => {
    const plan = planFromPoses(armOf(), [0, 0], [[1, 0]], [0.5], "cubic");
    const samples = samplePlan(plan, { rateHz: 8 });
    const last = (samples.count - 1) * 2;
    expect([samples.velocity[last], samples.acceleration[last]]).toEqual([0, 0]);
  });
});
