import { describe, expect, it } from "vitest";
import { check } from "@/kinematics";
import { parsePlan, type Plan } from "@/kinematics";
import { sampleMoveAt } from "@/kinematics/motion/sample";
import { timelineOf } from "@/kinematics/motion/timeline";
import { expectClose } from "../tolerance";

function planOf(moves: { goal: number[]; duration: number; shape?: string }[], start = [0, 0]): Plan {
  const r = parsePlan({
    format: "jointproof.plan",
    version: 1,
    arm: {
      name: "Timing arm",
      controlRateHz: 1000,
      joints: [
        { name: "a", min: -3, max: 3, maxVelocity: 1, maxAcceleration: 2 },
        { name: "b", min: -3, max: 3, maxVelocity: 1 },
      ],
    },
    start,
    moves,
  });
  if (!r.ok) throw new Error(JSON.stringify(r.problems));
  return r.value;
}

/** |q̇| and |q̈| of joint j at plan time tS (seconds from the plan's start), from the sampler. */
function motionAt(plan: Plan, move: number, tS: number, j: number) {
  const tl = timelineOf(plan);
  const q = new Float64Array(2),
    qd = new Float64Array(2),
    qdd = new Float64Array(2);
  sampleMoveAt(tl, move, tS - tl.startS[move], q, qd, qdd, 0);
  return { v: Math.abs(qd[j]), a: Math.abs(qdd[j]) };
}

describe("finding times (seconds from the plan's start)", () => {
  // The first move (2 s) passes, so every finding of move 1 starts 2 s into the plan.
  const lead = { goal: [0.5, 0], duration: 2, shape: "quintic" };

  it("speed-over is at the cubic's velocity peak, T/2 into the move (Lynch & Park §9.2.1 — memory), and the value is the speed there", () => {
    const plan = planOf([lead, { goal: [2.5, 0], duration: 2, shape: "cubic" }]);
    const f = check(plan).findings.find((x) => x.kind === "speed-over")!;
    expectClose(f.timeS!, 2 + 1, 1e-12);
    expectClose(motionAt(plan, 1, f.timeS!, 0).v, f.value, 1e-12, 1e-12, "speed at timeS");
  });

  it("accel-over on a quintic is at τ = (3 − √3)/6, where its acceleration peaks (Lynch & Park §9.2.1 — memory)", () => {
    const plan = planOf([lead, { goal: [2.5, 0], duration: 2, shape: "quintic" }]);
    const f = check(plan).findings.find((x) => x.kind === "accel-over")!;
    expectClose(f.timeS!, 2 + 2 * ((3 - Math.sqrt(3)) / 6), 1e-12);
    expectClose(motionAt(plan, 1, f.timeS!, 0).a, f.value, 1e-12, 1e-12, "acceleration at timeS");
  });

  it("on a trapezoid, speed-over is at the start of the cruise and accel-over at the move's start", () => {
    const plan = planOf([lead, { goal: [2.5, 0], duration: 1.5, shape: "trapezoid" }]);
    const r = check(plan);
    const v = r.findings.find((x) => x.kind === "speed-over")!;
    const a = r.findings.find((x) => x.kind === "accel-over")!;
    expectClose(motionAt(plan, 1, v.timeS!, 0).v, v.value, 1e-9, 1e-12, "cruise speed at timeS");
    // just before the cruise the speed is still rising: timeS is the first instant at the peak
    expect(motionAt(plan, 1, v.timeS! - 1e-3, 0).v).toBeLessThan(v.value);
    expectClose(a.timeS!, 2, 1e-12);
  });

  it("a jump is at the instant move's start, a range finding at the end of its move, the start pose's at 0", () => {
    const plan = planOf([lead, { goal: [0.5, 0.2], duration: 0 }, { goal: [3.5, 0.2], duration: 4 }], [-3.2, 0]);
    const r = check(plan);
    expectClose(r.findings.find((x) => x.kind === "jump")!.timeS!, 2, 1e-12);
    const ranges = r.findings.filter((x) => x.kind === "range");
    expect(ranges.map((x) => [x.move, x.timeS])).toEqual([
      [null, 0],
      [2, 6],
    ]);
  });

  it("every finding of a check carries a finite timeS inside the plan", () => {
    const plan = planOf([lead, { goal: [2.5, 0.3], duration: 1, shape: "cubic" }, { goal: [2.5, 1.9], duration: 0 }]);
    const r = check(plan);
    expect(r.findings.length).toBeGreaterThan(2);
    for (const f of r.findings) expect(f.timeS! >= 0 && f.timeS! <= 3, `${f.kind} at ${f.timeS}`).toBe(true);
  });
});
