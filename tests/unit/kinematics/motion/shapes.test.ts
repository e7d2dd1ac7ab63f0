import { describe, expect, it } from "vitest";
import { check } from "@/kinematics";
import { parsePlan, type Plan } from "@/kinematics";
import { scalingAt, shapeId, speedShareOn, trapezoidTauAt, velocityFactor } from "@/kinematics/motion/shapes";
import fc from "fast-check";

/** |actual − expected| within abs + rel·|expected|. */
function expectClose(actual: number, expected: number, rel = 1e-9, abs = 1e-12): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(abs + rel * Math.abs(expected));
}

const out = new Float64Array(3);

/** Largest |s′| and |s″| of a shape found by evaluating it on a dense grid (not from its constants). */
function densePeaks(shape: number, blend = 0, steps = 200_000): { velocity: number; acceleration: number } {
  let velocity = 0;
  let acceleration = 0;
  for (let k = 0; k <= steps; k++) {
    scalingAt(shape, blend, k / steps, out);
    velocity = Math.max(velocity, Math.abs(out[1]));
    acceleration = Math.max(acceleration, Math.abs(out[2]));
  }
  return { velocity, acceleration };
}

function planOf(joint: Record<string, unknown>, start: number, goal: number, duration: number, shape: string): Plan {
  const result = parsePlan({
    format: "jointproof.plan",
    version: 1,
    arm: { name: "Test arm", controlRateHz: 1000, joints: [{ name: "j0", min: -10, max: 10, ...joint }] },
    start: [start],
    moves: [{ goal: [goal], duration, shape }],
  });
  if (!result.ok) throw new Error(JSON.stringify(result.problems));
  return result.value;
}

const deg = Math.PI / 180;

describe("rest-to-rest shapes against published values", () => {
  // Lynch & Park, Modern Robotics (2017), §9.2.1 — the companion library's CubicTimeScaling(T=2, t=0.6) = 0.216
  it("cubic time scaling at t = 0.6 of T = 2 is 0.216", () => {
    expectClose(scalingAt(shapeId("cubic"), 0, 0.6 / 2, out)[0], 0.216, 1e-12);
  });

  // Lynch & Park, Modern Robotics (2017), §9.2.1 — QuinticTimeScaling(T=2, t=0.6) = 0.16308 (5 digits given)
  it("quintic time scaling at t = 0.6 of T = 2 is 0.16308", () => {
    expectClose(scalingAt(shapeId("quintic"), 0, 0.6 / 2, out)[0], 0.16308, 0, 5e-6);
  });

  // Lynch & Park §9.2.1 (memory): cubic peak velocity 1.5·D/T, peak acceleration 6·D/T²
  it("cubic peaks are 1.5·D/T and 6·D/T²", () => {
    const peaks = densePeaks(shapeId("cubic"));
    expectClose(peaks.velocity, 1.5, 1e-9);
    expectClose(peaks.acceleration, 6, 1e-9);
  });

  // Lynch & Park §9.2.1 (memory): quintic peak velocity 1.875·D/T, peak acceleration (10/√3)·D/T² ≈ 5.7735·D/T²
  it("quintic peaks are 1.875·D/T and 5.7735·D/T²", () => {
    const peaks = densePeaks(shapeId("quintic"));
    expectClose(peaks.velocity, 1.875, 1e-9);
    expectClose(peaks.acceleration, 5.7735, 0, 5e-5);
  });

  it("every shape starts at 0, ends at 1 and is at rest at both ends", () => {
    for (const shape of ["cubic", "quintic", "trapezoid"] as const) {
      scalingAt(shapeId(shape), 0.25, 0, out);
      expect([out[0], out[1]]).toEqual([0, 0]);
      scalingAt(shapeId(shape), 0.25, 1, out);
      expect([out[0], out[1]]).toEqual([1, 0]);
    }
  });

  // Nagarajan, Introduction to Industrial Robotics (2016), Example 10.9.1: 30° → 150° in 5 s with a cubic;
  // derived answer: peak velocity 1.5·120°/5 s = 36°/s, peak acceleration 6·120°/25 s² = 28.8°/s²
  it("worked example: 30° to 150° in 5 s with a cubic peaks at 36°/s and 28.8°/s²", () => {
    const report = check(planOf({ maxVelocity: 10, maxAcceleration: 10 }, 30 * deg, 150 * deg, 5, "cubic"));
    expectClose(report.moves[0].peakVelocity[0] / deg, 36, 1e-12);
    expectClose((report.moves[0].peakAcceleration[0] ?? NaN) / deg, 28.8, 1e-12);
  });

  // Nagarajan (2016), eqs. 10.26–10.28: when D ≥ v²/a the shortest trapezoid takes T = D/v + v/a
  it("shortest trapezoid with a cruise phase takes D/v + v/a", () => {
    const v = 2;
    const a = 8;
    const d = 1.5; // v²/a = 0.5 ≤ 1.5
    const report = check(planOf({ maxVelocity: v, maxAcceleration: a }, 0, d, 10, "trapezoid"));
    expectClose(report.moves[0].minSafeDuration!, d / v + v / a, 1e-12);
  });

  // Nagarajan (2016), eq. 10.28: when D < v²/a the profile is triangular, T = 2√(D/a), peak velocity √(a·D)
  it("shortest trapezoid without a cruise phase is triangular: 2√(D/a), peak √(a·D)", () => {
    const v = 2;
    const a = 8;
    const d = 0.2; // v²/a = 0.5 > 0.2
    const plan = planOf({ maxVelocity: v, maxAcceleration: a }, 0, d, 10, "trapezoid");
    const tMin = check(plan).moves[0].minSafeDuration!;
    expectClose(tMin, 2 * Math.sqrt(d / a), 1e-12);
    const atMin = check({ ...plan, moves: [{ ...plan.moves[0], duration: tMin }] });
    expectClose(atMin.moves[0].peakVelocity[0], Math.sqrt(a * d), 1e-9);
    expect(atMin.verdict).not.toBe("fault");
  });

  // Siciliano et al., Robotics: Modelling, Planning and Control (2009), §4.2.1 (memory): with a fixed T and
  // cruise V = 1.5·D/T the blend time is T/3 and the acceleration 4.5·D/T²
  it("trapezoid without acceleration limits cruises at 1.5·D/T with acceleration 4.5·D/T²", () => {
    const d = 0.9;
    const t = 3;
    const report = check(planOf({ maxVelocity: 5 }, 0, d, t, "trapezoid"));
    expectClose(report.moves[0].peakVelocity[0], (1.5 * d) / t, 1e-12);
    expectClose(report.moves[0].peakAcceleration[0] ?? NaN, (4.5 * d) / (t * t), 1e-12);
    const dense = densePeaks(shapeId("trapezoid"), 1 / 3);
    expectClose(dense.velocity, 1.5, 1e-9);
    expectClose(dense.acceleration, 4.5, 1e-9);
  });

  // Siciliano et al. (2009), §4.2.1 (memory): the triangular limit V = 2D/T needs acceleration 4·D/T², the least possible
  it("triangular trapezoid needs 4·D/T², the least acceleration of any trapezoid", () => {
    const d = 1;
    const t = 2;
    // acceleration-bound joint: the blend fraction reaches ½
    const report = check(planOf({ maxVelocity: 100, maxAcceleration: 0.5 }, 0, d, t, "trapezoid"));
    expectClose(report.moves[0].peakVelocity[0], (2 * d) / t, 1e-12);
    expectClose(report.moves[0].peakAcceleration[0] ?? NaN, (4 * d) / (t * t), 1e-12);
  });
});

describe("speed share on an interval (the clearance certification's local speed bound)", () => {
  it("is at least |s′(τ)| ÷ the shape's peak at every τ of [a, b], and reaches it somewhere there, for every shape and blend", () => {
    const scratch = new Float64Array(3);
    const out = new Float64Array(3);
    fc.assert(
      fc.property(
        fc.constantFrom("cubic", "quintic", "trapezoid"),
        fc.double({ min: 1e-3, max: 0.5, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (name, blendDraw, u, v) => {
          const shape = shapeId(name);
          const blend = name === "trapezoid" ? blendDraw : 0;
          const [a, b] = u <= v ? [u, v] : [v, u];
          const share = speedShareOn(shape, blend, a, b, scratch);
          const peak = velocityFactor(shape, blend);
          let largest = 0;
          for (let k = 0; k <= 200; k++) {
            scalingAt(shape, blend, a + ((b - a) * k) / 200, out);
            const s = Math.abs(out[1]) / peak;
            largest = Math.max(largest, s);
            expect(s).toBeLessThanOrEqual(share * (1 + 1e-12) + 1e-15);
          }
          // not a loose bound: the densest sample comes within 1% of the interval's share
          expect(largest).toBeGreaterThanOrEqual(share * 0.99 - 1e-12);
        },
      ),
      { numRuns: 300, seed: 3 },
    );
  });
});

describe("trapezoidTauAt", () => {
  it("inverts the trapezoid's s(τ) on all three pieces, at every blend (derived closed form, checked against scalingAt)", () => {
    const out = new Float64Array(3);
    fc.assert(
      fc.property(
        fc.double({ min: 1e-6, max: 0.5, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (blend, tau) => {
          const sigma = scalingAt(shapeId("trapezoid"), blend, tau, out)[0];
          const back = trapezoidTauAt(sigma, blend);
          // s′ vanishes at both ends, where τ is only determined to about √ε
          expect(Math.abs(back - tau)).toBeLessThan(tau < 1e-3 || tau > 1 - 1e-3 ? 1e-7 : 1e-9);
          expect(scalingAt(shapeId("trapezoid"), blend, back, out)[0]).toBeCloseTo(sigma, 12);
        },
      ),
      { numRuns: 500, seed: 4 },
    );
    expect(trapezoidTauAt(0, 0.3)).toBe(0);
    expect(trapezoidTauAt(1, 0.3)).toBe(1);
  });
});
