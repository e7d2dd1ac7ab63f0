/**
 * `effort-over`: recursive Newton–Euler plus joint friction against `maxEffort`, along each move
 * (from the move's path terms, or every control period) and at the start pose.
 * Per-move peaks are written into the move context's `figures` (copied into the move's report).
 *
 * @module
 */
import { gravityEffort, inverseDynamics } from "../arm/dynamics";
import { severityLevels, severityOf } from "./report";
import { sampleGoal, sampleMove, sampleRateOf, stateOf, type ArmState } from "./arm-state";
import { createPathPeaks, movePath, pathGravityPeak, pathPeaks, type MovePath, type PathPeaks } from "./move-path";
import { noTimingFix } from "./timing-wording";
import type { MoveChecker, MoveContext, PlanChecker } from "./types";
import { formatDurationUp, formatNumber, formatPercent, jointLabel, limitLevel, moveLabel } from "./wording";

/** Peak |τⱼ| over the sampled move into `peak`, and the time of each peak into `at`. */
function effortPeaks(s: ArmState, count: number, peak: Float64Array, at: Float64Array, gravityOnly = false): void {
  peak.fill(0);
  at.fill(0);
  for (let k = 0; k < count; k++) {
    if (gravityOnly) gravityEffort(s.chain, s.dynamics, s.q, s.tau, k * s.n);
    else inverseDynamics(s.chain, s.dynamics, s.q, s.qd, s.qdd, s.tau, k * s.n);
    for (let j = 0; j < s.n; j++) {
      const v = Math.abs(s.tau[j]);
      if (v > peak[j]) {
        peak[j] = v;
        at[j] = s.time[k];
      }
    }
  }
}

function effortUnit(type: "revolute" | "prismatic"): string {
  return type === "prismatic" ? "N" : "N·m";
}

/** Peak effort and tool speed of a timed move from its path terms, computed once per move context. */
const contextPeaks = new WeakMap<MoveContext, PathPeaks>();

/**
 * The path-mode peaks (effort per chain joint, tool speed) of a timed move at its duration, shared
 * by the effort and tool-speed checkers of one move.
 */
export function movePathPeaks(s: ArmState, context: MoveContext): { path: MovePath; peaks: PathPeaks } {
  const T = context.move.duration;
  const shape = context.timeline.shape[context.index];
  const path = movePath(s, context.from, context.delta, shape, context.timeline.blend[context.index]);
  let peaks = contextPeaks.get(context);
  if (!peaks) {
    // the values the effort and tool-speed findings compare each peak with (see severityOf)
    const ratio = context.arm.cautionRatio;
    const levels = context.arm.joints.slice(0, s.n).map((joint) => severityLevels(joint.maxEffort, ratio));
    levels.push(severityLevels(context.plan.maxToolSpeed, ratio));
    peaks = pathPeaks(s, path, T, sampleRateOf(s, context), createPathPeaks(s.n), undefined, levels);
    contextPeaks.set(context, peaks);
  }
  return { path, peaks };
}

/** What to do about an effort finding that a longer duration fixes, or why none does. */
function effortFix(context: MoveContext, severity: "caution" | "fault"): string {
  const target = severity === "fault" ? context.minSafe : context.minCalm;
  const within =
    severity === "fault" ? "within every limit" : `below ${formatPercent(context.arm.cautionRatio)} of every limit`;
  if (target.durationS !== null)
    return `Lengthen the move to at least ${formatDurationUp(target.durationS)} to stay ${within} (the shortest safe duration for its ${context.move.shape} shape).`;
  return noTimingFix(context.arm, target);
}

/**
 * Move checker `effort-over`: the peak joint effort along the move (rigid-body dynamics with
 * payload, plus friction) against each joint's `maxEffort` (fault above it, caution above
 * cautionRatio × it). When gravity alone exceeds the limit, the message says no duration fixes
 * it; otherwise it names the move's shortest safe duration, which passes every timing check.
 */
export const checkEffort: MoveChecker = (context, out) => {
  const s = stateOf(context.plan);
  if (!s) return;
  const { arm } = context;
  const n = s.n;
  const peak = new Float64Array(n),
    at = new Float64Array(n);
  let path: MovePath | null = null;
  if (context.instant) {
    effortPeaks(s, sampleGoal(s, context), peak, at);
  } else if (context.sampling === "control-rate") {
    effortPeaks(s, sampleMove(s, context, context.move.duration, sampleRateOf(s, context)), peak, at);
    path = movePath(
      s,
      context.from,
      context.delta,
      context.timeline.shape[context.index],
      context.timeline.blend[context.index],
    );
  } else {
    const result = movePathPeaks(s, context);
    path = result.path;
    for (let j = 0; j < n; j++) {
      peak[j] = result.peaks.effort[j];
      at[j] = result.peaks.effortTau[j] * context.move.duration;
    }
  }
  const figures = context.figures;
  if (figures) figures.peakEffort = arm.joints.map((_, j) => (j < n ? peak[j] : null));
  const startS = context.startS;
  for (let j = 0; j < n; j++) {
    const joint = arm.joints[j];
    if (joint.maxEffort === undefined) continue;
    const severity = severityOf(peak[j], joint.maxEffort, arm.cautionRatio);
    if (!severity) continue;
    const unit = effortUnit(joint.type);
    const label = `${moveLabel(context.index, context.instant)}, ${jointLabel(joint)}`;
    const level = limitLevel(severity, arm.cautionRatio, `${formatNumber(joint.maxEffort)} ${unit}`);
    // gravity alone along the path (an instant move: at its goal, where the arm must hold it)
    const gravity = path ? pathGravityPeak(path, j) : { value: peak[j], tau: 0 };
    const gravityAt = path ? gravity.tau * context.move.duration : 0;
    let fix: string;
    const gravitySeverity = severityOf(gravity.value, joint.maxEffort, arm.cautionRatio);
    if (gravitySeverity === severity || gravitySeverity === "fault") {
      fix =
        `Gravity alone needs ${formatNumber(gravity.value)} ${unit} at ${formatNumber(gravityAt)} s to hold the arm there, so no duration fixes it: ` +
        `choose a pose that keeps the load closer to the joint, carry less, or use the lighter tool.`;
    } else if (context.instant) {
      fix = `Hold the goal pose for less load or reach it with a timed move.`;
    } else {
      fix = effortFix(context, severity);
    }
    const outcome =
      severity === "fault" ? "; the motor could not deliver it and the controller would stop the arm. " : ". ";
    out.push({
      kind: "effort-over",
      severity,
      move: context.index,
      joint: j,
      value: peak[j],
      limit: joint.maxEffort,
      message: `${label}: peak ${joint.type === "prismatic" ? "force" : "torque"} ${formatNumber(peak[j])} ${unit} at ${formatNumber(at[j])} s is ${level}${outcome}${fix}`,
      timeS: startS + at[j],
    });
  }
};

/**
 * Plan checker `effort-over` for the start pose: gravity alone at the start pose against
 * maxEffort (the arm must hold it before the first move).
 */
export const checkStartEffort: PlanChecker = ({ plan, arm }, out) => {
  const s = stateOf(plan);
  if (!s) return;
  gravityEffort(s.chain, s.dynamics, plan.start, s.tau);
  for (let j = 0; j < s.n; j++) {
    const joint = arm.joints[j];
    if (joint.maxEffort === undefined) continue;
    const v = Math.abs(s.tau[j]);
    const severity = severityOf(v, joint.maxEffort, arm.cautionRatio);
    if (!severity) continue;
    const unit = effortUnit(joint.type);
    out.push({
      kind: "effort-over",
      severity,
      move: null,
      joint: j,
      value: v,
      limit: joint.maxEffort,
      message:
        `The start pose: ${jointLabel(joint)} needs ${formatNumber(v)} ${unit} against gravity to hold it, ` +
        `${limitLevel(severity, arm.cautionRatio, `${formatNumber(joint.maxEffort)} ${unit}`)}; ` +
        `no duration fixes it. Start from a pose that keeps the load closer to the joint.`,
      timeS: 0,
    });
  }
};
