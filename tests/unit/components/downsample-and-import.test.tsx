// @vitest-environment happy-dom
import { describe, expect, it } from "vitest";
import { importPlanText } from "@/components/editor/import-dialog";
import { planReducer } from "@/components/editor/plan-state";
import { minMaxIndices, plotRateHz } from "@/components/plots/downsample";
import { check, formatPath, moveTimingSweep } from "@/kinematics";
import { demoPlan, pose } from "./helpers";

describe("min–max downsampling for the plots", () => {
  it("keeps every series' peak sample and the end points while cutting 60 000 samples to a few hundred", () => {
    const count = 60_000;
    const stride = 2;
    const values = new Float64Array(count * stride);
    for (let k = 0; k < count; k++) {
      values[k * stride] = Math.sin(k / 900);
      values[k * stride + 1] = 0;
    }
    values[31_337 * stride + 1] = 5; // a one-sample spike on column 1
    const idx = minMaxIndices(count, values, stride, [0, 1], 200);
    expect(idx.length).toBeLessThan(1000);
    expect(Array.from(idx)).toContain(31_337);
    expect(idx[0]).toBe(0);
    expect(idx[idx.length - 1]).toBe(count - 1);
    let peak = -Infinity;
    for (const k of idx) peak = Math.max(peak, values[k * stride]);
    expect(peak).toBeCloseTo(1, 6);
    for (let i = 1; i < idx.length; i++) expect(idx[i]).toBeGreaterThan(idx[i - 1]);
  });

  it("keeps all samples of a short series", () => {
    expect(minMaxIndices(10, new Float64Array(10), 1, [0], 200).length).toBe(10);
  });

  it("lowers the plot rate for long plans only", () => {
    expect(plotRateHz(1000, 5)).toBe(1000);
    expect(plotRateHz(1000, 600)).toBe(50);
  });
});

describe("duration sweep", () => {
  it("crosses ratio 1 at the engine's shortest safe duration of an arm without a chain (speed and acceleration only)", () => {
    const withChain = demoPlan([{ goal: pose(1.2, 0.4), duration: 1 }]);
    // without a chain only speed and acceleration depend on the duration, which is what the sweep draws
    const plan = { ...withChain, arm: { ...withChain.arm, chain: undefined } };
    const safe = check(plan).moves[0].minSafeDuration as number;
    expect(safe).toBeGreaterThan(0);
    const durations = Array.from({ length: 301 }, (_, k) => safe * (0.5 + (1.5 * k) / 300));
    const sweep = moveTimingSweep(plan, 0, durations);
    const below = sweep.filter((p) => p.durationS < safe * 0.999);
    const above = sweep.filter((p) => p.durationS > safe * 1.001);
    expect(below.every((p) => p.ratio > 1)).toBe(true);
    expect(above.every((p) => p.ratio <= 1)).toBe(true);
  });
});

describe("import of a plan document", () => {
  const current = demoPlan([{ goal: pose(0.2), duration: 1 }]);

  it("names each problem by its field path", () => {
    const doc = {
      format: "jointproof.plan",
      version: 1,
      arm: { ...current.arm, controlRateHz: -5 },
      start: pose(0),
      moves: [{ goal: [1], duration: -1 }],
    };
    const r = importPlanText(JSON.stringify(doc), current);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const paths = r.problems.map((p) => formatPath(p.path));
    expect(paths).toContain("arm.controlRateHz");
    expect(paths).toContain("moves[0].duration");
    expect(paths).toContain("moves[0].goal");
  });

  it("refuses text that is not JSON", () => {
    const r = importPlanText("{ nope", current);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems[0].path).toEqual([]);
  });

  it("takes the start pose and moves onto the plan's own arm", () => {
    const doc = {
      ...current,
      arm: { ...current.arm, name: "Other arm" },
      moves: [{ goal: pose(0.5), duration: 2, shape: "cubic" }],
    };
    const r = importPlanText(JSON.stringify(doc), current);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.plan.arm).toBe(current.arm);
    expect(r.plan.moves[0].shape).toBe("cubic");
    expect(r.note).toMatch(/Other arm/);
  });
});

describe("plan editing actions", () => {
  it("set-durations applies scale-to-pass durations and refuses a wrong count", () => {
    const plan = demoPlan([
      { goal: pose(1), duration: 0.1 },
      { goal: pose(0), duration: 0.1 },
    ]);
    expect(planReducer(plan, { type: "set-durations", durations: [1] })).toBe(plan);
    const next = planReducer(plan, { type: "set-durations", durations: [2, 2] });
    expect(check(next).verdict).toBe("pass");
  });

  it("refuses a negative duration and a pose of the wrong length", () => {
    const plan = demoPlan([{ goal: pose(1), duration: 1 }]);
    expect(planReducer(plan, { type: "set-duration", index: 0, duration: -1 })).toBe(plan);
    expect(planReducer(plan, { type: "set-pose", target: "start", pose: [1, 2] })).toBe(plan);
  });
});

describe("effort series for the plots", () => {
  it("at rest equals the engine's gravity-only effort of that pose, and follows the samples", async () => {
    const { effortSeries } = await import("@/components/plots/effort");
    const { samplePlan } = await import("@/kinematics/motion/sample");
    const { compileChain } = await import("@/kinematics/arm/chain");
    const { createDynamicsWorkspace, gravityEffort } = await import("@/kinematics/arm/dynamics");
    const plan = demoPlan([{ goal: pose(0, 0.8, 0.4), duration: 1 }]);
    const samples = samplePlan(plan, { rateHz: 100 });
    const series = effortSeries(plan, samples)!;
    expect(series.stride).toBe(6); // the gripper is outside the chain
    expect(series.values.length).toBe(samples.count * 6);
    const chain = compileChain(
      plan.arm.chain!,
      plan.arm.joints.map((j) => j.type),
    );
    const ws = createDynamicsWorkspace(chain);
    const last = samples.count - 1;
    const expected = gravityEffort(chain, ws, samples.position, new Float64Array(6), last * samples.jointCount, 0);
    for (let j = 0; j < 6; j++) expect(series.values[last * 6 + j]).toBeCloseTo(expected[j], 6);
    // the shoulder holds the raised arm against gravity: clearly non-zero
    expect(Math.abs(series.values[last * 6 + 1])).toBeGreaterThan(0.5);
  });

  it("is null for an arm without a chain", async () => {
    const { effortSeries } = await import("@/components/plots/effort");
    const { samplePlan } = await import("@/kinematics/motion/sample");
    const plan = demoPlan([{ goal: pose(0.5), duration: 1 }]);
    const bare = { ...plan, arm: { ...plan.arm, chain: undefined } };
    expect(effortSeries(bare, samplePlan(bare, { rateHz: 50 }))).toBeNull();
  });
});
