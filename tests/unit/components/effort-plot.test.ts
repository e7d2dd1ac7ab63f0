// The effort chart's series: at most EFFORT_PLOT_MAX_SAMPLES samples, drawn from the same inverse
// dynamics as at the plots' full rate. The check itself evaluates every control period; the chart is a
// drawing, and its coarser peak must stay close to the full-rate one (within 1% of the joint's limit
// here, on the try-out bench's plan grown to 10 moves) so that it does not mislead.
import { describe, expect, it } from "vitest";
import armL from "@/kinematics/arm/presets/bench-arm-l.json";
import { armChainSchema, parseArm, timelineOf } from "@/kinematics";
import { scratchPlan } from "@/components/editor/demo-plan";
import { plotSamples } from "@/components/plots/downsample";
import { EFFORT_PLOT_MAX_SAMPLES, effortAlongPlot, effortSeries } from "@/components/plots/effort";

function benchPlan() {
  const parsed = parseArm(armL);
  if (!parsed.ok) throw new Error("demo arm does not parse");
  const plan = scratchPlan({ ...parsed.value, chain: armChainSchema.parse(armL.chain) });
  // the bench's "Add move" repeats goals; ten moves of the four, as in the bench benchmark
  const moves = Array.from({ length: 10 }, (_, i) => plan.moves[i % plan.moves.length]);
  return { ...plan, moves };
}

describe("effort plot series", () => {
  it("has at most its sample budget, with times from 0 to the plan's end", () => {
    const plan = benchPlan();
    const series = effortAlongPlot(plan)!;
    const totalS = timelineOf(plan).totalS;
    expect(series.count).toBeLessThanOrEqual(EFFORT_PLOT_MAX_SAMPLES + 1);
    expect(series.count).toBeGreaterThan(EFFORT_PLOT_MAX_SAMPLES / 2);
    expect(series.timeS[0]).toBe(0);
    expect(series.timeS[series.count - 1]).toBeCloseTo(totalS, 9);
    expect(series.values.length).toBe(series.count * series.stride);
    expect(series.rateHz).toBeLessThan(plan.arm.controlRateHz);
  });

  it("peaks within 1% of each joint's effort limit of the full-rate series", () => {
    const plan = benchPlan();
    const coarse = effortAlongPlot(plan)!;
    const full = effortSeries(plan, plotSamples(timelineOf(plan), plan.arm.controlRateHz))!;
    for (let j = 0; j < full.stride; j++) {
      const peak = (s: typeof full) => {
        let m = 0;
        for (let k = 0; k < s.count; k++) m = Math.max(m, Math.abs(s.values[k * s.stride + j]));
        return m;
      };
      const limit = plan.arm.joints[j].maxEffort ?? peak(full);
      // the coarse grid is not a subset of the full one, so its peak may also lie a hair above
      expect(Math.abs(peak(full) - peak(coarse))).toBeLessThanOrEqual(0.01 * limit);
    }
  });
});
