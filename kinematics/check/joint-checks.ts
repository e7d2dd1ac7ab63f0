/**
 * The joint checks: travel (`range`) of the start pose and every goal, peak speed (`speed-over`,
 * and `jump` for an instant move) and peak acceleration (`accel-over`), from the shapes' closed forms.
 *
 * @module
 */
import type { Joint } from "../plan/arm";
import { severityOf, type Finding, type Severity } from "./report";
import { accelerationPeakTau, velocityPeakTau } from "../motion/shapes";
import { noTimingFix } from "./timing-wording";
import type { MoveChecker, MoveContext, PlanChecker } from "./types";
import { formatDurationUp, formatPercent, formatQuantity, jointLabel, limitLevel, moveLabel } from "./wording";

/** A finding for a pose value outside the joint's travel, or nothing. */
function rangeFinding(
  value: number,
  joint: Joint,
  j: number,
  move: number | null,
  where: string,
  timeS: number,
): Finding | null {
  if (value >= joint.min && value <= joint.max) return null;
  const limit = value > joint.max ? joint.max : joint.min;
  const side = value > joint.max ? "max" : "min";
  return {
    kind: "range",
    severity: "fault",
    move,
    joint: j,
    value,
    limit,
    message:
      `${where} puts ${jointLabel(joint)} at ${formatQuantity(value, joint, "position")}, beyond its travel ${side} of ` +
      `${formatQuantity(limit, joint, "position")}; the controller would refuse the target. ` +
      `Choose a value from ${formatQuantity(joint.min, joint, "position")} to ${formatQuantity(joint.max, joint, "position")}.`,

    timeS,
  };
}

/** Plan checker: every start-pose value within its joint's travel (`range`, `move` = null). */
export const checkStartRange: PlanChecker = ({ arm, plan }, out) => {
  arm.joints.forEach((joint, j) => {
    const finding = rangeFinding(plan.start[j], joint, j, null, "The start pose", 0);
    if (finding) out.push(finding);
  });
};

/** Move checker: every goal value within its joint's travel (`range`). */
export const checkGoalRange: MoveChecker = ({ arm, index, move, goal, startS }, out) => {
  arm.joints.forEach((joint, j) => {
    const finding = rangeFinding(
      goal[j],
      joint,
      j,
      index,
      `The goal of ${moveLabel(index, move.duration === 0).toLowerCase()}`,
      startS + move.duration,
    );
    if (finding) out.push(finding);
  });
};

/** "at least 1.2 s", or "at least 1.2 s … " when a caution-free duration exists, for the fix sentences. */
function calmClause(context: MoveContext): string {
  const { minCalm, arm } = context;
  return minCalm.durationS !== null
    ? `${formatDurationUp(minCalm.durationS)} keeps it below ${formatPercent(arm.cautionRatio)} of every limit`
    : "";
}

/**
 * The sentence that says which duration fixes a speed or acceleration finding: the move's shortest
 * safe duration over every timing-dependent check (the report's `minSafeDuration`), or why none does.
 */
function durationFix(severity: Severity, context: MoveContext): string {
  const { move, minSafe, arm } = context;
  const calm = calmClause(context);
  if (severity === "fault") {
    if (minSafe.durationS === null) return noTimingFix(arm, minSafe);
    return `Lengthen it to at least ${formatDurationUp(minSafe.durationS)} (the shortest safe duration for its ${move.shape} shape)${calm ? `; ${calm}` : ""}.`;
  }
  return calm ? `It would run, with little margin; ${calm}.` : `It would run, with little margin.`;
}

/**
 * Move checker: peak speed against maxVelocity — `speed-over` on a timed move, `jump` on an instant
 * move (its step must be covered in one control period: the jump-too-far fault).
 */
export const checkSpeed: MoveChecker = (context, out) => {
  const { arm, index, move, instant, peakVelocity, delta, minSafe, startS } = context;
  // minCalm is read only where a message names it: check() finds it on first read
  // the peak's time: the instant move's start, else the shape's first velocity peak
  const timeS = instant
    ? startS
    : startS + velocityPeakTau(context.timeline.shape[index], context.timeline.blend[index]) * move.duration;
  arm.joints.forEach((joint, j) => {
    const value = peakVelocity[j];
    const severity = severityOf(value, joint.maxVelocity, arm.cautionRatio);
    if (!severity) return;
    const label = `${moveLabel(index, move.duration === 0)}, ${jointLabel(joint)}`;
    const limitText = formatQuantity(joint.maxVelocity, joint, "velocity");
    const level = limitLevel(severity, arm.cautionRatio, limitText);
    let message: string;
    if (instant) {
      const periodMs = 1000 / arm.controlRateHz;
      const stepLimit = joint.maxVelocity / arm.controlRateHz;
      const outcome =
        severity === "fault"
          ? "the controller would stop with a jump-too-far fault"
          : "the controller would accept it, close to its jump limit";
      message =
        `${label}: a step of ${formatQuantity(Math.abs(delta[j]), joint, "step")} in one ${formatNumberMs(periodMs)} control period needs ` +
        `${formatQuantity(value, joint, "velocity")}, ${level}, which allows at most ${formatQuantity(stepLimit, joint, "step")} per period; ` +
        `${outcome}. ` +
        (severity === "fault"
          ? minSafe.durationS === null
            ? `Make the step smaller. ${noTimingFix(arm, minSafe)}`
            : `Give the move a duration of at least ${formatDurationUp(minSafe.durationS)} with its ${move.shape} shape, or make the step smaller` +
              (context.minCalm.durationS !== null
                ? `; ${formatDurationUp(context.minCalm.durationS)} stays below ${formatPercent(arm.cautionRatio)} of every limit.`
                : ".")
          : context.minCalm.durationS !== null
            ? `A duration of ${formatDurationUp(context.minCalm.durationS)} with its ${move.shape} shape keeps it below ${formatPercent(arm.cautionRatio)} of every limit.`
            : `Make the step smaller for more margin.`);
    } else {
      const outcome = severity === "fault" ? "; the controller would refuse the move. " : ". ";
      message = `${label}: peak speed ${formatQuantity(value, joint, "velocity")} is ${level}${outcome}${durationFix(severity, context)}`;
    }
    out.push({
      kind: instant ? "jump" : "speed-over",
      severity,
      move: index,
      joint: j,
      value,
      limit: joint.maxVelocity,
      message,
      timeS,
    });
  });
};

/** Milliseconds without trailing zeros: `1 ms`, `0.5 ms`. */
function formatNumberMs(ms: number): string {
  return `${Number(ms.toPrecision(4))} ms`;
}

/** Move checker: peak acceleration against maxAcceleration, where given (`accel-over`; timed moves only). */
export const checkAcceleration: MoveChecker = (context, out) => {
  const { arm, index, move, peakAcceleration, startS } = context;
  if (!peakAcceleration) return;
  const timeS = startS + accelerationPeakTau(context.timeline.shape[index]) * move.duration;
  arm.joints.forEach((joint, j) => {
    if (joint.maxAcceleration === undefined) return;
    const value = peakAcceleration[j];
    const severity = severityOf(value, joint.maxAcceleration, arm.cautionRatio);
    if (!severity) return;
    const limitText = formatQuantity(joint.maxAcceleration, joint, "acceleration");
    const level = limitLevel(severity, arm.cautionRatio, limitText);
    const outcome = severity === "fault" ? "; the controller would refuse the move. " : ". ";
    const message =
      `${moveLabel(index, move.duration === 0)}, ${jointLabel(joint)}: peak acceleration ${formatQuantity(value, joint, "acceleration")} ` +
      `is ${level}${outcome}${durationFix(severity, context)}`;
    out.push({
      kind: "accel-over",
      severity,
      move: index,
      joint: j,
      value,
      limit: joint.maxAcceleration,
      message,
      timeS,
    });
  });
};
