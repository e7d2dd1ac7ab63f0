// The live check's sample-skipping scans of clearance and tool speed (scanClearanceBounded,
// scanToolSpeedBounded) against the full scans on random plans of the 7-joint demo arm. The
// stated tolerance is zero: the fast path evaluates the same samples with the same arithmetic
// wherever a result could come from, so the worst values and their times must be identical.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  compileChain,
  createChainBuffers,
  forwardKinematics,
  type ChainJointType,
  linkFrames,
} from "@/kinematics/arm/chain";
import { check } from "@/kinematics";
import {
  clearanceZones,
  compileCollision,
  createClearanceScanner,
  scanClearance,
  certifyClearPath,
  scanClearanceBounded,
  shapeIntrusions,
} from "@/kinematics/arm/clearance";
import { moveBlend, scalingAt, shapeId, velocityFactor } from "@/kinematics/motion/shapes";
import { compileReachBounds, linkSpeedBounds, toolAccelerationBound } from "@/kinematics/arm/motion-bounds";
import { parsePlan, type Plan } from "@/kinematics";
import { samplePlan } from "@/kinematics/motion/sample";
import { createToolSpeedScanner, scanToolSpeed, scanToolSpeedBounded, toolSpeedAt } from "@/kinematics/arm/tool-speed";
import type { Finding } from "@/kinematics/check/report";
import { readJson } from "./helpers";
import { expectClose } from "../tolerance";

const demoArm = readJson("kinematics/arm/presets/bench-arm-h.json") as { joints: { min: number; max: number }[] };

const unit = fc.double({ min: 0, max: 1, noNaN: true });
const goal = fc
  .array(unit, { minLength: 7, maxLength: 7 })
  .map((u) =>
    u.map((x, j) => demoArm.joints[j].min + (0.1 + 0.8 * x) * (demoArm.joints[j].max - demoArm.joints[j].min)),
  );
const box = fc.record({
  x: fc.double({ min: -0.45, max: 0.45, noNaN: true }),
  y: fc.double({ min: -0.45, max: 0.45, noNaN: true }),
  z: fc.double({ min: 0, max: 0.5, noNaN: true }),
  size: fc.double({ min: 0.04, max: 0.3, noNaN: true }),
});
const planArb = fc.record({
  start: goal,
  goal,
  duration: fc.double({ min: 0.2, max: 3, noNaN: true }),
  shape: fc.constantFrom("cubic", "quintic", "trapezoid"),
  margin: fc.double({ min: 0, max: 0.12, noNaN: true }),
  boxes: fc.array(box, { maxLength: 3 }),
});

type Draw = typeof planArb extends fc.Arbitrary<infer T> ? T : never;

function planOf(d: Draw): Plan {
  const r = parsePlan({
    format: "jointproof.plan",
    version: 1,
    arm: demoArm,
    start: d.start,
    surfaceMargin: d.margin,
    keepOut: d.boxes.map((b, i) => ({
      name: `box ${i}`,
      min: [b.x - b.size / 2, b.y - b.size / 2, b.z],
      max: [b.x + b.size / 2, b.y + b.size / 2, b.z + b.size],
    })),
    moves: [{ goal: d.goal, duration: d.duration, shape: d.shape }],
  });
  if (!r.ok) throw new Error(r.problems.map((p) => `${p.path}: ${p.message}`).join("; "));
  return r.value;
}

/** The compiled model of a plan and its one move sampled at the control rate, with the move's reported peaks. */
function setup(plan: Plan) {
  const arm = plan.arm;
  const chain = compileChain(
    arm.chain!,
    arm.joints.map((j) => j.type as ChainJointType),
    plan.payload,
  );
  const n = chain.jointCount;
  const collision = compileCollision(arm.chain!);
  const samples = samplePlan(plan);
  const report = check(plan, { sampling: "control-rate" });
  const move = report.moves[0];
  const peakQd = move.peakVelocity.map((v) => v ?? 0);
  const peakQdd = move.peakAcceleration.map((v) => v ?? 0);
  const reach = compileReachBounds(
    chain,
    collision,
    arm.joints.slice(0, n).map((j) => Math.max(Math.abs(j.min), Math.abs(j.max))),
  );
  return { chain, n, collision, samples, report, peakQd, peakQdd, reach, stride: arm.joints.length };
}

describe("sample-skipping clearance scan", () => {
  it("finds exactly the intrusions of the full scan (depth, deepest time, first and last time) on random plans", () => {
    let intrusions = 0;
    fc.assert(
      fc.property(planArb, (d) => {
        const plan = planOf(d);
        const { chain, n, collision, samples, peakQd, reach, stride } = setup(plan);
        const zones = clearanceZones(plan.surfaceMargin ?? 0, plan.keepOut ?? []);
        const full = scanClearance(
          createClearanceScanner(chain, collision, zones),
          samples.position,
          stride,
          samples.timeS,
          samples.count,
        );
        const speeds = linkSpeedBounds(reach, chain, peakQd, new Float64Array(n + 1));
        const fast = scanClearanceBounded(
          createClearanceScanner(chain, collision, zones),
          samples.position,
          stride,
          samples.timeS,
          samples.count,
          speeds,
        );
        expect(fast).toEqual(full);
        intrusions += full.length;
      }),
      { numRuns: 40, seed: 20250115 },
    );
    expect(intrusions).toBeGreaterThan(0); // the draws must exercise the refinement, not only clear moves
  });

  it("the link speed bound holds: no surface depth changes by more than V·Δt between two samples", () => {
    fc.assert(
      fc.property(planArb, (d) => {
        const plan = planOf(d);
        const { chain, n, collision, samples, peakQd, reach, stride } = setup(plan);
        const zones = clearanceZones(0, []);
        const scanner = createClearanceScanner(chain, collision, zones);
        const speeds = linkSpeedBounds(reach, chain, peakQd, new Float64Array(n + 1));
        const previous = new Float64Array(collision.count);
        for (let k = 0; k < samples.count; k++) {
          linkFrames(chain, samples.position, scanner.buffers.frames, k * stride);
          shapeIntrusions(collision, zones, scanner.buffers.frames, scanner.depths, scanner.scratch);
          for (let s = 0; s < collision.count; s++) {
            const depth = scanner.depths[s];
            if (k > 0 && collision.link[s] > 0) {
              const dt = samples.timeS[k] - samples.timeS[k - 1];
              expect(Math.abs(depth - previous[s])).toBeLessThanOrEqual(speeds[collision.link[s]] * dt + 1e-12);
            }
            previous[s] = depth;
          }
        }
      }),
      { numRuns: 15, seed: 7 },
    );
  });
});

describe("sample-skipping tool-speed scan", () => {
  it("finds exactly the peak tool speed and its time of the full scan on random plans", () => {
    fc.assert(
      fc.property(planArb, (d) => {
        const plan = planOf(d);
        const { chain, samples, peakQd, peakQdd, reach, stride } = setup(plan);
        const full = scanToolSpeed(
          createToolSpeedScanner(chain),
          samples.position,
          samples.velocity,
          stride,
          samples.timeS,
          samples.count,
        );
        const accel = toolAccelerationBound(reach, chain, peakQd, peakQdd);
        const fast = scanToolSpeedBounded(
          createToolSpeedScanner(chain),
          samples.position,
          samples.velocity,
          stride,
          samples.timeS,
          samples.count,
          accel,
        );
        expect(fast).toEqual(full);
      }),
      { numRuns: 40, seed: 11 },
    );
  });

  it("the tool acceleration bound holds: the speed changes by at most A·Δt between two samples", () => {
    fc.assert(
      fc.property(planArb, (d) => {
        const plan = planOf(d);
        const { chain, samples, peakQd, peakQdd, reach, stride } = setup(plan);
        const scanner = createToolSpeedScanner(chain);
        const accel = toolAccelerationBound(reach, chain, peakQd, peakQdd);
        let previous = toolSpeedAt(scanner, samples.position, samples.velocity, 0);
        for (let k = 1; k < samples.count; k++) {
          const v = toolSpeedAt(scanner, samples.position, samples.velocity, k * stride);
          expect(Math.abs(v - previous)).toBeLessThanOrEqual(accel * (samples.timeS[k] - samples.timeS[k - 1]) + 1e-12);
          previous = v;
        }
      }),
      { numRuns: 15, seed: 5 },
    );
  });

  it("check() at the control rate reports the full scan's peak tool speed and clearance depths (within 1e-9: check samples the move with its own arithmetic)", () => {
    fc.assert(
      fc.property(planArb, (d) => {
        const plan = planOf(d);
        const { chain, collision, samples, report, stride } = setup(plan);
        const full = scanToolSpeed(
          createToolSpeedScanner(chain),
          samples.position,
          samples.velocity,
          stride,
          samples.timeS,
          samples.count,
        );
        expectClose(
          (report.moves[0] as { peakToolSpeed?: number }).peakToolSpeed ?? NaN,
          full.peakSpeed,
          1e-9,
          1e-9,
          "peak tool speed",
        );
        const zones = clearanceZones(plan.surfaceMargin ?? 0, plan.keepOut ?? []);
        const hits = scanClearance(
          createClearanceScanner(chain, collision, zones),
          samples.position,
          stride,
          samples.timeS,
          samples.count,
        );
        const found = report.findings.filter((f) => f.kind === "clearance") as (Finding & { link: string })[];
        expect(found.map((f) => f.link).sort()).toEqual(hits.map((h) => h.linkName).sort());
        expect(found).toHaveLength(hits.length);
        for (const f of found) {
          const h = hits.find(
            (x) =>
              x.linkName === f.link && (x.zone < 0 ? "work surface" : x.zoneName) === (f as { zone?: string }).zone,
          )!;
          expect(h, f.message).toBeDefined();
          expectClose(f.value, h.depthM, 1e-9, 1e-9, "depth");
          // the deepest time may differ where the depth is flat to rounding (at rest): both times lie in the intrusion
          expect(f.timeS).toBeGreaterThanOrEqual(h.firstTimeS - 1e-9);
          expect(f.timeS).toBeLessThanOrEqual(h.lastTimeS + 1e-9);
        }
      }),
      { numRuns: 20, seed: 3 },
    );
  });
});

/** Poses of the demo arm held near upright (shoulder, elbow and wrist pitch within 45–55% of travel). */
const upright = fc.array(unit, { minLength: 7, maxLength: 7 }).map((u) =>
  u.map((x, j) => {
    const f = j === 1 || j === 2 || j === 3 ? 0.45 + 0.1 * x : 0.1 + 0.8 * x;
    return demoArm.joints[j].min + f * (demoArm.joints[j].max - demoArm.joints[j].min);
  }),
);
const uprightPlanArb = fc.record({
  start: upright,
  goal: upright,
  duration: fc.double({ min: 0.2, max: 3, noNaN: true }),
  shape: fc.constantFrom("cubic", "quintic", "trapezoid"),
  margin: fc.double({ min: 0, max: 0.12, noNaN: true }),
  boxes: fc.array(box, { maxLength: 3 }),
});

describe("clear-path certificate", () => {
  // The cone test of scanClearanceBounded applied to the path in τ (derived: a depth that changes
  // by at most V per unit τ cannot reach 0 between two points where d₀ + d₁ + V·Δτ < 0).
  it("a path certified clear has no intrusion at any control sample at three durations, and paths that intrude are never certified", () => {
    let certified = 0,
      intruding = 0;
    fc.assert(
      fc.property(uprightPlanArb, (d) => {
        const plan = planOf(d);
        const { chain, n, collision, reach } = setup(plan);
        const scanner = createClearanceScanner(chain, collision, clearanceZones(d.margin, plan.keepOut ?? []));
        const shape = shapeId(d.shape as "cubic" | "quintic" | "trapezoid");
        const from = plan.start.slice(0, n);
        const delta = d.goal.slice(0, n).map((g, i) => g - from[i]);
        const scale = new Float64Array(3);
        for (const T of [d.duration, 0.1 + 0.37 * d.duration, 2.9]) {
          const blend = moveBlend(
            shape,
            plan.moves[0].goal.map((g, i) => g - plan.start[i]),
            T,
            plan.arm.joints,
          );
          const perTau = delta.map((x) => Math.abs(x) * velocityFactor(shape, blend) * (1 + 1e-6));
          const speeds = linkSpeedBounds(reach, chain, perTau, new Float64Array(n + 1));
          const clear = certifyClearPath(
            scanner,
            (tau, q) => {
              scalingAt(shape, blend, tau, scale);
              for (let i = 0; i < n; i++) q[i] = from[i] + scale[0] * delta[i];
            },
            speeds,
          );
          // every control sample of the move at T (1 kHz, and the end), scanned in full
          const count = Math.floor(T * 1000 + 1e-9) + 2;
          const positions = new Float64Array(count * n),
            times = new Float64Array(count);
          for (let k = 0; k < count; k++) {
            times[k] = Math.min(k / 1000, T);
            scalingAt(shape, blend, times[k] / T, scale);
            for (let i = 0; i < n; i++) positions[k * n + i] = from[i] + scale[0] * delta[i];
          }
          const hits = scanClearance(scanner, positions, n, times, count);
          if (clear) {
            certified++;
            expect(hits, `certified clear, yet ${hits.length} intrusion(s) at T = ${T} s`).toEqual([]);
          }
          if (hits.length > 0) {
            intruding++;
            expect(clear).toBe(false);
          }
        }
      }),
      { numRuns: 30, seed: 21 },
    );
    // both kinds occurred, so the test can fail either way
    expect(certified).toBeGreaterThan(5);
    expect(intruding).toBeGreaterThan(2);
  });

  it("a thin box that the tool crosses only between the certificate's first points is found: not certified, and the full scan hits it", () => {
    const mid = (j: number) => (demoArm.joints[j].min + demoArm.joints[j].max) / 2;
    const start = [-3, mid(1), mid(2), mid(3), 0, 0, 0.02];
    const goal = [3, mid(1), mid(2), mid(3), 0, 0, 0.02];
    const plan0 = planOf({ start, goal, duration: 2.9, shape: "quintic", margin: 0, boxes: [] });
    const { chain, n, collision, reach } = setup(plan0);
    const shape = shapeId("quintic");
    const scale = new Float64Array(3);
    const poseAt = (tau: number, q: Float64Array) => {
      scalingAt(shape, 0, tau, scale);
      for (let i = 0; i < n; i++) q[i] = start[i] + scale[0] * (goal[i] - start[i]);
    };
    // the tool point at τ = 15/32, between the even points 7/16 and 8/16, inside a 4 mm slab (6 cm wide)
    const q = new Float64Array(n);
    poseAt(15 / 32, q);
    const t = forwardKinematics(chain, q, createChainBuffers(chain));
    const [x, y, z] = [t[12], t[13], t[14]];
    const slab = {
      name: "slab",
      min: [x - 0.03, y - 0.002, z - 0.03] as [number, number, number],
      max: [x + 0.03, y + 0.002, z + 0.03] as [number, number, number],
    };
    const scanner = createClearanceScanner(chain, collision, clearanceZones(0, [slab]));
    const perTau = start.slice(0, n).map((a, i) => Math.abs(goal[i] - a) * velocityFactor(shape, 0) * (1 + 1e-6));
    const speeds = linkSpeedBounds(reach, chain, perTau, new Float64Array(n + 1));
    expect(certifyClearPath(scanner, poseAt, speeds)).toBe(false);
    const T = 2.9,
      count = Math.floor(T * 1000 + 1e-9) + 2;
    const positions = new Float64Array(count * n),
      times = new Float64Array(count);
    for (let k = 0; k < count; k++) {
      times[k] = Math.min(k / 1000, T);
      poseAt(times[k] / T, q);
      positions.set(q, k * n);
    }
    expect(scanClearance(scanner, positions, n, times, count).some((h) => h.zoneName === "slab")).toBe(true);
  });
});
