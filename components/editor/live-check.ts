/**
 * The live check the bench runs on every edit: the engine's `check` over the plan being edited, and
 * the sampled signals the plots and stage draw. One place to add the arm model's checkers (effort,
 * clearance, tool speed) when the engine exposes them as checkers.
 */
import { check } from "@/kinematics/check";
import type { Report } from "@/kinematics/report";
import { sampleTimeline, type Samples } from "@/kinematics/sample";
import { timelineOf, type Timeline } from "@/kinematics/timeline";
import { plotRateHz } from "@/components/plots/downsample";
import type { BenchPlan } from "./plan-state";

export interface LiveCheck {
  report: Report;
  timeline: Timeline;
  samples: Samples;
  /** Milliseconds the check and sampling took on this machine (shown in the status line). */
  elapsedMs: number;
}

export function runLiveCheck(plan: BenchPlan): LiveCheck {
  const t0 = performance.now();
  const report = check(plan);
  const timeline = timelineOf(plan);
  const samples = sampleTimeline(timeline, plotRateHz(plan.arm.controlRateHz, timeline.totalS));
  return { report, timeline, samples, elapsedMs: performance.now() - t0 };
}
