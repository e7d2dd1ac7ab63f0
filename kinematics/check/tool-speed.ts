/**
 * `tool-speed`: peak tool-point speed against the plan's `maxToolSpeed`.
 *
 * @module
 */
import { forwardKinematics } from "../arm/chain";
import { toolAccelerationBound } from "../arm/motion-bounds";
import { scanToolSpeedBounded } from "../arm/tool-speed";
import { severityOf } from "./report";
import { sampleMove, sampleRateOf, stateOf } from "./arm-state";
import { movePathPeaks } from "./effort";
import { noTimingFix } from "./timing-wording";
import type { MoveChecker } from "./types";
import { formatDurationUp, formatNumber, formatPercent, limitLevel, moveLabel } from "./wording";

/**
 * Move checker `tool-speed`: peak tool-point speed (m/s) against the plan's `maxToolSpeed`
 * (fault above it, caution above cautionRatio × it). Tool speed scales as 1/duration on the
 * same path, so the fix is duration × peak / limit. For an instant move the tool must cover its
 * whole displacement in one control period.
 */
export const checkToolSpeed: MoveChecker = (context, out) => {
  const s = stateOf(context.plan);
  if (!s) return;
  let peak: number, at: number;
  if (context.instant) {
    // |Δp_tool| × control rate: the step is covered in one control period.
    const t = forwardKinematics(s.chain, context.from, s.toolSpeed.buffers);
    const x0 = t[12],
      y0 = t[13],
      z0 = t[14];
    forwardKinematics(s.chain, context.goal, s.toolSpeed.buffers);
    peak = Math.hypot(t[12] - x0, t[13] - y0, t[14] - z0) * context.arm.controlRateHz;
    at = 0;
  } else if (context.sampling === "path") {
    // tool speed is |J(q)·D·s′|/T on the move's path: from the cached path terms
    const { peaks } = movePathPeaks(s, context);
    peak = peaks.toolSpeed;
    at = peaks.toolTau * context.move.duration;
  } else {
    const count = sampleMove(s, context, context.move.duration, sampleRateOf(s, context));
    // The tool speed changes at most accelBound m/s² (from the move's peak joint speeds and
    // accelerations), so only the stretches that could hold the peak are evaluated sample by sample.
    const accelBound = toolAccelerationBound(
      s.reach,
      s.chain,
      context.peakVelocity,
      context.peakAcceleration ?? context.peakVelocity.map(() => Infinity),
    );
    const r = scanToolSpeedBounded(s.toolSpeed, s.q, s.qd, s.n, s.time, count, accelBound);
    peak = r.peakSpeed;
    at = r.timeS;
  }
  if (context.figures) context.figures.peakToolSpeed = peak;
  const limit = context.plan.maxToolSpeed;
  if (limit === undefined) return;
  const severity = severityOf(peak, limit, context.arm.cautionRatio);
  if (!severity) return;
  const level = limitLevel(severity, context.arm.cautionRatio, `${formatNumber(limit)} m/s`, "the plan's");
  const stepM = peak / context.arm.controlRateHz; // the tool's straight-line step in one control period
  const fix = context.instant
    ? `Give it a duration: covering ${formatNumber(stepM * 1000)} mm at ${formatNumber(limit)} m/s takes at least ${formatDurationUp(stepM / limit)}, and a rest-to-rest shape needs longer; check again.`
    : severity === "caution"
      ? context.minCalm.durationS !== null
        ? `It would run, with little margin; ${formatDurationUp(context.minCalm.durationS)} keeps it below ${formatPercent(context.arm.cautionRatio)} of every limit.`
        : `It would run, with little margin.`
      : context.minSafe.durationS !== null
        ? `Lengthen it to at least ${formatDurationUp(context.minSafe.durationS)} (tool speed falls in proportion to the duration; that is the shortest safe duration for its ${context.move.shape} shape).`
        : noTimingFix(context.arm, context.minSafe);
  out.push({
    kind: "tool-speed",
    severity,
    move: context.index,
    joint: null,
    value: peak,
    limit,
    message: context.instant
      ? `${moveLabel(context.index, context.instant)}: the tool point would jump ${formatNumber(stepM * 1000)} mm in one control period, ${formatNumber(peak)} m/s, ${level}. ${fix}`
      : `${moveLabel(context.index, context.instant)}: the tool point reaches ${formatNumber(peak)} m/s at ${formatNumber(at)} s, ${level}. ${fix}`,
    timeS: context.startS + at,
  });
};
