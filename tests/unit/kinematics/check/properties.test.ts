import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { check } from "@/kinematics";
import { safeDuration } from "@/kinematics/motion/peaks";
import { parsePlan, shapeNames, type Plan } from "@/kinematics";
import { samplePlan } from "@/kinematics/motion/sample";
import { scaleToPass } from "@/kinematics/motion/sequence";
import { shapeId } from "@/kinematics/motion/shapes";
import { repairStream, streamCheck, validateRecording, type Recording } from "@/kinematics";

const runs = { numRuns: 150 };

const jointArb = fc.record({
  maxVelocity: fc.double({ min: 0.2, max: 6, noNaN: true }),
  maxAcceleration: fc.option(fc.double({ min: 0.5, max: 60, noNaN: true }), { nil: undefined }),
});

const shapeArb = fc.constantFrom(...shapeNames);

/** A random valid plan: 1–4 joints with travel ±3, 1–4 moves, goals within travel. */
const planArb = fc
  .record({
    joints: fc.array(jointArb, { minLength: 1, maxLength: 4 }),
    moveCount: fc.integer({ min: 1, max: 4 }),
    cautionRatio: fc.double({ min: 0.5, max: 1, noNaN: true }),
  })
  .chain(({ joints, moveCount, cautionRatio }) =>
    fc
      .record({
        start: fc.array(fc.double({ min: -3, max: 3, noNaN: true }), {
          minLength: joints.length,
          maxLength: joints.length,
        }),
        moves: fc.array(
          fc.record({
            goal: fc.array(fc.double({ min: -3, max: 3, noNaN: true }), {
              minLength: joints.length,
              maxLength: joints.length,
            }),
            duration: fc.double({ min: 0.05, max: 5, noNaN: true }),
            shape: shapeArb,
          }),
          { minLength: moveCount, maxLength: moveCount },
        ),
      })
      .map(({ start, moves }): Plan => {
        const result = parsePlan({
          format: "jointproof.plan",
          version: 1,
          arm: {
            name: "Property arm",
            controlRateHz: 1000,
            cautionRatio,
            joints: joints.map((j, i) => ({ name: `j${i}`, min: -3, max: 3, ...j })),
          },
          start,
          moves,
        });
        if (!result.ok) throw new Error(JSON.stringify(result.problems));
        return result.value;
      }),
  );

describe("engine invariants (fast-check)", () => {
  it("sampling meets the start pose and every move's goal exactly", () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        const samples = samplePlan(plan, { rateHz: 200 });
        const n = plan.arm.joints.length;
        for (let j = 0; j < n; j++) expect(samples.position[j]).toBe(plan.start[j]);
        const last = (samples.count - 1) * n;
        const goal = plan.moves[plan.moves.length - 1].goal;
        for (let j = 0; j < n; j++) expect(samples.position[last + j]).toBe(goal[j]);
        // every move boundary that lands on the sampling grid shows that move's goal exactly
        let clockS = 0;
        for (const move of plan.moves.slice(0, -1)) {
          clockS += move.duration;
          const k = Math.round(clockS * 200);
          if (k / 200 === clockS && k < samples.count) {
            for (let j = 0; j < n; j++) expect(samples.position[k * n + j]).toBe(move.goal[j]);
          }
        }
      }),
      runs,
    );
  });

  it("the sampled peak speed and acceleration match the reported peaks", () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        const single: Plan = { ...plan, moves: [plan.moves[0]] };
        const move = single.moves[0];
        const report = check(single);
        const rateHz = 4000 / move.duration; // 4000 samples over the move
        const samples = samplePlan(single, { rateHz });
        const n = plan.arm.joints.length;
        for (let j = 0; j < n; j++) {
          let v = 0;
          let a = 0;
          for (let k = 0; k < samples.count; k++) {
            v = Math.max(v, Math.abs(samples.velocity[k * n + j]));
            a = Math.max(a, Math.abs(samples.acceleration[k * n + j]));
          }
          const peakV = report.moves[0].peakVelocity[j];
          const peakA = report.moves[0].peakAcceleration[j] as number;
          // never above the analytic peak; within the grid's resolution below it
          expect(v).toBeLessThanOrEqual(peakV * (1 + 1e-12) + 1e-15);
          expect(v).toBeGreaterThanOrEqual(peakV * (1 - 1e-3) - 1e-15);
          expect(a).toBeLessThanOrEqual(peakA * (1 + 1e-12) + 1e-15);
          expect(a).toBeGreaterThanOrEqual(peakA * (1 - 1e-3) - 1e-15);
        }
      }),
      runs,
    );
  });

  it("the shortest safe duration passes and 1% shorter faults on the limiting joint", () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        const move = plan.moves[0];
        const delta = move.goal.map((g, j) => g - plan.start[j]);
        const shortest = safeDuration(shapeId(move.shape), delta, plan.arm.joints);
        fc.pre(shortest.joint >= 0 && shortest.durationS > 1e-6);
        const report = check(plan).moves[0];
        expect(report.minSafeDuration).toBe(shortest.durationS);
        const at = (durationS: number) => check({ ...plan, moves: [{ ...move, duration: durationS }] });
        const pass = at(shortest.durationS);
        expect(pass.findings.filter((f) => f.severity === "fault")).toEqual([]);
        const short = at(shortest.durationS * 0.99);
        const faults = short.findings.filter(
          (f) => f.severity === "fault" && (f.kind === "speed-over" || f.kind === "accel-over"),
        );
        expect(faults.map((f) => f.joint)).toContain(shortest.joint);
      }),
      runs,
    );
  });

  it("scaling a plan by its safe factor makes it pass", () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        const result = scaleToPass(plan);
        expect(result.unscalable).toEqual([]);
        expect(check(result.plan).findings.filter((f) => f.severity === "fault")).toEqual([]);
        expect(result.factor).toBeGreaterThanOrEqual(1);
        // and the factor is the least one: 1% less faults (when stretching was needed at all)
        if (result.factor! > 1.0001) {
          const less = scaleToPass(plan, { allowFaster: true });
          const tighter = {
            ...plan,
            moves: plan.moves.map((m) => ({ ...m, duration: m.duration * less.factor! * 0.99 })),
          };
          expect(check(tighter).verdict).toBe("fault");
        }
      }),
      runs,
    );
  });

  it("the repaired stream passes the stream check", () => {
    const recordingArb = fc.record({
      joints: fc.array(jointArb, { minLength: 1, maxLength: 3 }),
      steps: fc.array(
        fc.record({
          dt: fc.double({ min: 0.0002, max: 0.004, noNaN: true }),
          moves: fc.array(fc.double({ min: -0.05, max: 0.05, noNaN: true }), { minLength: 3, maxLength: 3 }),
        }),
        { minLength: 2, maxLength: 200 },
      ),
      resample: fc.boolean(),
    });
    fc.assert(
      fc.property(recordingArb, ({ joints, steps, resample }) => {
        const armResult = parsePlan({
          format: "jointproof.plan",
          version: 1,
          arm: {
            name: "Stream arm",
            controlRateHz: 1000,
            joints: joints.map((j, i) => ({ name: `j${i}`, min: -1, max: 1, ...j })),
          },
          start: joints.map(() => 0),
          moves: [],
        });
        if (!armResult.ok) throw new Error("arm");
        const arm = armResult.value.arm;
        const n = joints.length;
        const count = steps.length;
        const timeS = new Float64Array(count);
        const position = new Float64Array(count * n);
        let t = 0;
        steps.forEach((step, k) => {
          t += step.dt;
          timeS[k] = t;
          for (let j = 0; j < n; j++)
            position[k * n + j] = (k > 0 ? position[(k - 1) * n + j] : 0) + step.moves[j] * 10;
        });
        const recording: Recording = { names: arm.joints.map((j) => j.name), jointCount: n, count, timeS, position };
        const repaired = repairStream(arm, recording, resample ? { resampleHz: 1000 } : {});
        expect(validateRecording(arm, repaired.recording, { maxGapS: 1 })).toEqual([]);
        const report = streamCheck(arm, repaired.recording);
        expect(report.findings).toEqual([]);
        expect(report.verdict).toBe("pass");
      }),
      runs,
    );
  });
});
