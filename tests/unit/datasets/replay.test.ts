// The replay of an episode: ease in, pass through every frame without stopping, ease out. The curve
// through the frames is checked against an independent dense evaluation of the cubic Hermite basis
// h00 = 2s³ − 3s² + 1, h10 = s³ − 2s² + s, h01 = −2s³ + 3s², h11 = s³ − s² (Burden & Faires, Numerical
// Analysis, §3.5 — memory), differentiated by central differences.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import armL from "@/kinematics/arm/presets/bench-arm-l.json";
import { auditEpisode, checkPassThrough, parseArm, replayOf, timelineOf, type Arm, type Recording } from "@/kinematics";
import { expectClose } from "../kinematics/recordings/helpers";

function armOf(maxAcceleration?: number): Arm {
  const result = parseArm({
    name: "Replay arm",
    controlRateHz: 1000,
    joints: [
      { name: "lift", min: -1, max: 1, maxVelocity: 1, ...(maxAcceleration ? { maxAcceleration } : {}) },
      { name: "grip", type: "prismatic", min: 0, max: 0.04, maxVelocity: 0.1 },
    ],
  });
  if (!result.ok) throw new Error(JSON.stringify(result.problems));
  return result.value;
}

function recordingOf(timeS: number[], lift: number[], grip: number[]): Recording {
  return {
    names: ["lift", "grip"],
    jointCount: 2,
    count: timeS.length,
    timeS: Float64Array.from(timeS),
    position: Float64Array.from(lift.flatMap((q, k) => [q, grip[k]])),
  };
}

/** Position of one joint on segment k at s ∈ [0, 1], from the frames and the returned speeds. */
function hermite(r: Recording, speeds: Float64Array, j: number, k: number, s: number): number {
  const n = r.jointCount;
  const h = r.timeS[k] - r.timeS[k - 1];
  const s2 = s * s;
  const s3 = s2 * s;
  return (
    (2 * s3 - 3 * s2 + 1) * r.position[(k - 1) * n + j] +
    (s3 - 2 * s2 + s) * h * speeds[(k - 1) * n + j] +
    (-2 * s3 + 3 * s2) * r.position[k * n + j] +
    (s3 - s2) * h * speeds[k * n + j]
  );
}

/** Dense scan of one joint's curve: the largest |q̇| (central differences) and the extreme positions. */
function scan(r: Recording, speeds: Float64Array, j: number) {
  let peakSpeed = 0;
  let lo = Infinity;
  let hi = -Infinity;
  const steps = 400;
  for (let k = 1; k < r.count; k++) {
    const h = r.timeS[k] - r.timeS[k - 1];
    for (let i = 0; i <= steps; i++) {
      const s = i / steps;
      const q = hermite(r, speeds, j, k, s);
      lo = Math.min(lo, q);
      hi = Math.max(hi, q);
      if (i > 0 && i < steps) {
        const ds = 1e-6;
        const v = (hermite(r, speeds, j, k, s + ds) - hermite(r, speeds, j, k, s - ds)) / (2 * ds * h);
        peakSpeed = Math.max(peakSpeed, Math.abs(v));
      }
    }
  }
  return { peakSpeed, lo, hi };
}

describe("replay: passing through the frames", () => {
  it("a ramp at constant speed keeps that speed at every inner frame and peaks at 4/3 of it in the first and last segment", () => {
    // derived: with end speeds 0 and δ, q′ = 4δs − 3δs², largest at s = 2/3, where it is (4/3)·δ
    const t = Array.from({ length: 11 }, (_, k) => k / 30);
    const r = recordingOf(
      t,
      t.map((x) => 0.6 * x),
      t.map(() => 0.01),
    );
    const pass = checkPassThrough(armOf(), r);
    for (let k = 1; k < 10; k++) expectClose(pass.speeds[k * 2], 0.6);
    expect(pass.speeds[0]).toBe(0);
    expect(pass.speeds[20]).toBe(0);
    expect(scan(r, pass.speeds, 0).peakSpeed).toBeCloseTo(0.8, 4);
    expect(pass.findings).toEqual([]);
    expect(pass.verdict).toBe("pass");
  });

  it("a ramp whose end segments peak exactly at the speed limit passes the speed check (equal to the limit passes) and is a caution", () => {
    const t = Array.from({ length: 11 }, (_, k) => k / 30);
    const r = recordingOf(
      t,
      t.map((x) => 0.75 * x), // 4/3 × 0.75 = 1 rad/s, the limit
      t.map(() => 0.01),
    );
    const pass = checkPassThrough(armOf(), r);
    expect(pass.findings.map((f) => [f.kind, f.severity, f.joint])).toEqual([["speed-over", "caution", 0]]);
    expectClose(pass.findings[0].value, 1, 1e-12);
  });

  it("a speed faster than the limit between two frames is a speed-over fault naming the joint and the frames from 1", () => {
    const t = [0, 1 / 30, 2 / 30, 3 / 30];
    const r = recordingOf(t, [0, 0, 0.1, 0.1], [0.01, 0.01, 0.01, 0.01]); // 3 rad/s between frames 2 and 3
    const pass = checkPassThrough(armOf(), r);
    const speed = pass.findings.find((f) => f.kind === "speed-over");
    expect(speed?.severity).toBe("fault");
    expect(speed?.sample).toBe(2);
    expect(speed?.message).toMatch(/joint "lift", frames 2–3/i);
    expect(pass.verdict).toBe("fault");
  });

  it("acceleration is checked where the arm limits it: q″ at the segment ends against maxAcceleration", () => {
    const t = [0, 1 / 30, 2 / 30, 3 / 30];
    const r = recordingOf(t, [0, 0.01, 0.02, 0.03], [0.01, 0.01, 0.01, 0.01]);
    expect(checkPassThrough(armOf(), r).findings.some((f) => f.kind === "accel-over")).toBe(false);
    // from rest to 0.3 rad/s in 1/30 s and back needs about 20 rad/s² at the ends (derived: a₁/h)
    const limited = checkPassThrough(armOf(2), r);
    const accel = limited.findings.find((f) => f.kind === "accel-over");
    expect(accel?.severity).toBe("fault");
    expect(accel?.limit).toBe(2);
  });

  it("never passes where the timed-replay audit finds a speed-over fault, and finds every speed above the limit that a dense scan finds (property)", () => {
    const arm = armOf();
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -0.9, max: 0.9, noNaN: true }), { minLength: 3, maxLength: 12 }),
        fc.array(fc.double({ min: 0.01, max: 0.1, noNaN: true }), { minLength: 12, maxLength: 12 }),
        (lift, steps) => {
          const t = [0];
          for (let k = 1; k < lift.length; k++) t.push(t[k - 1] + steps[k]);
          const r = recordingOf(
            t,
            lift,
            lift.map(() => 0.02),
          );
          const pass = checkPassThrough(arm, r);
          const audit = auditEpisode(arm, { id: "p", recording: r });
          const speedFault = pass.findings.some(
            (f) => f.kind === "speed-over" && f.severity === "fault" && f.joint === 0,
          );
          if (audit.findings.some((f) => (f.kind === "speed-over" || f.kind === "glitch") && f.severity === "fault"))
            expect(speedFault).toBe(true);
          const dense = scan(r, pass.speeds, 0);
          if (dense.peakSpeed > 1 * (1 + 1e-6)) expect(speedFault).toBe(true);
          // monotone between frames: the curve stays inside the frames' span, so within travel
          expect(dense.lo).toBeGreaterThanOrEqual(Math.min(...lift) - 1e-9);
          expect(dense.hi).toBeLessThanOrEqual(Math.max(...lift) + 1e-9);
        },
      ),
      { numRuns: 150, seed: 14 },
    );
  });
});

describe("replay: the three parts", () => {
  it("eases in from rest to the first frame and out from the last, one quintic move each, and joins them at rest", () => {
    const arm = armOf();
    const t = Array.from({ length: 31 }, (_, k) => k / 30);
    const r = recordingOf(
      t,
      t.map((x) => 0.5 + 0.2 * Math.sin(x)),
      t.map(() => 0.02),
    );
    const replay = replayOf(arm, r);
    expect(replay.easeIn.moves).toHaveLength(1);
    expect(replay.easeIn.moves[0].goal).toEqual([r.position[0], r.position[1]]);
    expect(replay.easeOut.moves[0].goal).toEqual(replay.rest);
    // the shortest passing duration: within the caution ratio of every limit, so a pass, not a caution
    expect(replay.easeInReport.verdict).toBe("pass");
    expect(replay.easeOutReport.verdict).toBe("pass");
    expect(replay.passThrough.speeds[0]).toBe(0);
    expect(replay.passThrough.speeds[30 * 2]).toBe(0);
    expect(replay.passThrough.notChecked).toEqual([]);
    expect(["pass", "caution"]).toContain(replay.verdict);
  });

  it("an arm with a chain: effort and clearance are not checked along the frames, so the replay is incomplete, never a pass", () => {
    const parsed = parseArm(armL);
    if (!parsed.ok) throw new Error("arm");
    const arm = parsed.value;
    const n = arm.joints.length;
    const t = Array.from({ length: 10 }, (_, k) => k / 30);
    const r: Recording = {
      names: arm.joints.map((j) => j.name),
      jointCount: n,
      count: t.length,
      timeS: Float64Array.from(t),
      position: Float64Array.from(t.flatMap(() => arm.joints.map((j) => (j.min <= 0 && j.max >= 0 ? 0 : j.min)))),
    };
    const replay = replayOf(arm, r);
    expect(replay.passThrough.notChecked.length).toBeGreaterThan(0);
    expect(replay.verdict).toBe("incomplete");
    expect(timelineOf(replay.easeIn).moveCount).toBe(1);
  });
});
