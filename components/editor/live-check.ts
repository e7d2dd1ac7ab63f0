/**
 * The quick live check the bench runs on every edit, on the main thread: the engine's joint checks
 * (travel, speed, acceleration, jumps: well under a millisecond) and the sampled signals the plots and
 * stage draw. The arm model's checks (effort, clearance, tool speed) run in a worker (use-full-check.ts).
 */
import {
  check,
  checkAcceleration,
  checkGoalRange,
  checkSpeed,
  checkStartRange,
  type Report,
  type Samples,
  timelineOf,
  type Timeline,
} from "@/kinematics";
import { plotSamples } from "@/components/plots/downsample";
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
  const report = check(plan, {
    planCheckers: [checkStartRange],
    moveCheckers: [checkGoalRange, checkSpeed, checkAcceleration],
  });
  const timeline = timelineOf(plan);
  const samples = plotSamples(timeline, plan.arm.controlRateHz);
  return { report, timeline, samples, elapsedMs: performance.now() - t0 };
}
