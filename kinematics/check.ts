/**
 * `check(plan)`: predicts the controller faults of a plan and returns the report.
 *
 * The check is analytic (peaks from the shapes' closed forms), so it is exact and fast enough to run
 * on every edit in the browser. Findings come from two lists of checkers:
 * - plan checkers run once (the start pose's range);
 * - move checkers run for every move with a {@link MoveContext} (the move's poses, displacement,
 *   peaks and shortest safe durations).
 * New checks (effort, clearance, tool speed from the arm model) are added by passing longer lists in
 * {@link CheckOptions}, e.g. `check(plan, { moveCheckers: [...defaultMoveCheckers, effortChecker] })`.
 *
 * @module
 */
import type { Arm, Joint, Move, Plan } from "./plan";
import { armMoveCheckers, armPlanCheckers } from "./arm-checks"; // arm model (issue 4)
import { instantPeaks, safeDuration, timedPeaks } from "./peaks";
import { severityOf, verdictOf, type Finding, type MoveReport, type Report, type Severity } from "./report";
import { accelerationPeakTau, velocityPeakTau, type ShortestDuration } from "./shapes";
import { timelineOf, type Timeline } from "./timeline";
import { formatDurationUp, formatPercent, formatQuantity, jointLabel } from "./wording";

/** What a plan checker sees: the plan, its arm and its timeline. */
export interface PlanContext {
  plan: Plan;
  arm: Arm;
  timeline: Timeline;
}

/** What a move checker sees about one move. Arrays are views into shared buffers: read, do not keep. */
export interface MoveContext extends PlanContext {
  /** Index of the move in the plan. */
  index: number;
  move: Move;
  /** True for an instant move (duration 0). */
  instant: boolean;
  /** Pose at the start of the move, rad or m. */
  from: Float64Array;
  /** Goal pose, rad or m. */
  goal: Float64Array;
  /** Goal − start per joint, rad or m. */
  delta: Float64Array;
  /** Peak |q̇| per joint (rad/s or m/s); for an instant move |Δq| × control rate. */
  peakVelocity: Float64Array;
  /** Peak |q̈| per joint (rad/s² or m/s²); `null` for an instant move. */
  peakAcceleration: Float64Array | null;
  /** Shortest duration (s) with the move's shape that has no speed or acceleration fault, and its joint. */
  minSafe: ShortestDuration;
  /** Shortest duration (s) with the move's shape that stays below the caution ratio of every limit. */
  minCalm: ShortestDuration;
  /** Start time of the move, seconds from the plan's start. */
  startS: number;
  /** Rate (Hz) the sampled arm checks use; undefined means the arm's control rate. */
  sampleRateHz?: number;
  /** Arm model (issue 4): extra per-move figures copied into the move's report. */
  figures?: Pick<MoveReport, "peakEffort" | "peakToolSpeed">;
}

/** A check run once per plan; pushes its findings to `out`. */
export type PlanChecker = (context: PlanContext, out: Finding[]) => void;

/** A check run once per move; pushes its findings (with `move` = `context.index`) to `out`. */
export type MoveChecker = (context: MoveContext, out: Finding[]) => void;

/** Which checkers {@link check} runs. */
export interface CheckOptions {
  planCheckers?: readonly PlanChecker[];
  moveCheckers?: readonly MoveChecker[];
  /**
   * Rate (Hz) at which the sampled arm checks (effort, clearance, tool speed) sample each move;
   * default the arm's control rate. A lower rate is faster and may miss a peak between samples
   * (the live editor can use it between edits, the saved check should not). The joint checks are
   * analytic and do not depend on it.
   */
  sampleRateHz?: number;
}

/** How a move is named in messages. */
function moveLabel(index: number, move: Move): string {
  return move.duration === 0 ? `Instant move ${index}` : `Move ${index}`;
}

/** A finding for a pose value outside the joint's travel, or nothing. */
function rangeFinding(value: number, joint: Joint, j: number, move: number | null, where: string, timeS: number): Finding | null {
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
      `${formatQuantity(limit, joint, "position")}; the controller will refuse the target. ` +
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
    const finding = rangeFinding(goal[j], joint, j, index, `The goal of ${moveLabel(index, move).toLowerCase()}`, startS + move.duration);
    if (finding) out.push(finding);
  });
};

/** The sentence that says which duration fixes a speed or acceleration finding. */
function durationFix(severity: Severity, context: MoveContext): string {
  const { move, minSafe, minCalm, arm } = context;
  if (severity === "fault") {
    const calm = `${formatDurationUp(minCalm.durationS)} keeps it below ${formatPercent(arm.cautionRatio)} of every limit`;
    return `Lengthen it to at least ${formatDurationUp(minSafe.durationS)} (the shortest safe duration for its ${move.shape} shape); ${calm}.`;
  }
  return `It will run, with little margin; ${formatDurationUp(minCalm.durationS)} keeps it below ${formatPercent(arm.cautionRatio)} of every limit.`;
}

/**
 * Move checker: peak speed against maxVelocity — `speed-over` on a timed move, `jump` on an instant
 * move (its step must be covered in one control period: the jump-too-far fault).
 */
export const checkSpeed: MoveChecker = (context, out) => {
  const { arm, index, move, instant, peakVelocity, delta, minSafe, minCalm, startS } = context;
  // the peak's time: the instant move's start, else the shape's first velocity peak
  const timeS = instant ? startS : startS + velocityPeakTau(context.timeline.shape[index], context.timeline.blend[index]) * move.duration;
  arm.joints.forEach((joint, j) => {
    const value = peakVelocity[j];
    const severity = severityOf(value, joint.maxVelocity, arm.cautionRatio);
    if (!severity) return;
    const label = `${moveLabel(index, move)}, ${jointLabel(joint)}`;
    const limitText = formatQuantity(joint.maxVelocity, joint, "velocity");
    const level = severity === "fault" ? `above its limit of ${limitText}` : `above ${formatPercent(arm.cautionRatio)} of its limit of ${limitText}`;
    let message: string;
    if (instant) {
      const periodMs = 1000 / arm.controlRateHz;
      const stepLimit = joint.maxVelocity / arm.controlRateHz;
      const outcome =
        severity === "fault" ? "the controller will stop with a jump-too-far fault" : "the controller will accept it, close to its jump limit";
      message =
        `${label}: a step of ${formatQuantity(Math.abs(delta[j]), joint, "step")} in one ${formatNumberMs(periodMs)} control period needs ` +
        `${formatQuantity(value, joint, "velocity")}, ${level}, which allows at most ${formatQuantity(stepLimit, joint, "step")} per period; ` +
        `${outcome}. ` +
        (severity === "fault"
          ? `Give the move a duration of at least ${formatDurationUp(minSafe.durationS)} with its ${move.shape} shape, ` +
            `or ${formatDurationUp(minCalm.durationS)} to stay below ${formatPercent(arm.cautionRatio)} of every limit.`
          : `A duration of ${formatDurationUp(minCalm.durationS)} with its ${move.shape} shape keeps it below ` +
            `${formatPercent(arm.cautionRatio)} of every limit.`);
    } else {
      const outcome = severity === "fault" ? "; the controller will refuse the move. " : ". ";
      message = `${label}: peak speed ${formatQuantity(value, joint, "velocity")} is ${level}${outcome}${durationFix(severity, context)}`;
    }
    out.push({ kind: instant ? "jump" : "speed-over", severity, move: index, joint: j, value, limit: joint.maxVelocity, message, timeS });
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
    const level = severity === "fault" ? `above its limit of ${limitText}` : `above ${formatPercent(arm.cautionRatio)} of its limit of ${limitText}`;
    const outcome = severity === "fault" ? "; the controller will refuse the move. " : ". ";
    const message =
      `${moveLabel(index, move)}, ${jointLabel(joint)}: peak acceleration ${formatQuantity(value, joint, "acceleration")} ` +
      `is ${level}${outcome}${durationFix(severity, context)}`;
    out.push({ kind: "accel-over", severity, move: index, joint: j, value, limit: joint.maxAcceleration, message, timeS });
  });
};

/** The plan checkers {@link check} runs by default. */
export const defaultPlanCheckers: readonly PlanChecker[] = [checkStartRange, ...armPlanCheckers];

/** The move checkers {@link check} runs by default, in report order. */
export const defaultMoveCheckers: readonly MoveChecker[] = [checkGoalRange, checkSpeed, checkAcceleration, ...armMoveCheckers];

/** Copies a typed array into a plain list (for the JSON report). */
function toList(values: Float64Array): number[] {
  return Array.from(values);
}

/**
 * Checks a parsed plan (see `parsePlan`) and returns its report: per-move peaks and shortest safe
 * durations, the findings of every checker, and the verdict.
 */
export function check(plan: Plan, options: CheckOptions = {}): Report {
  const planCheckers = options.planCheckers ?? defaultPlanCheckers;
  const moveCheckers = options.moveCheckers ?? defaultMoveCheckers;
  const arm = plan.arm;
  const n = arm.joints.length;
  const timeline = timelineOf(plan);
  const findings: Finding[] = [];
  for (const checker of planCheckers) checker({ plan, arm, timeline }, findings);

  const peakVelocity = new Float64Array(n);
  const peakAcceleration = new Float64Array(n);
  const moves: MoveReport[] = plan.moves.map((move, index) => {
    const base = index * n;
    const delta = timeline.delta.subarray(base, base + n);
    const instant = move.duration === 0;
    const shape = timeline.shape[index];
    if (instant) instantPeaks(delta, arm.controlRateHz, peakVelocity);
    else timedPeaks(shape, timeline.blend[index], delta, move.duration, peakVelocity, peakAcceleration);
    const context: MoveContext = {
      plan,
      arm,
      timeline,
      index,
      move,
      instant,
      from: timeline.from.subarray(base, base + n),
      goal: timeline.goal.subarray(base, base + n),
      delta,
      startS: timeline.startS[index],
      sampleRateHz: options.sampleRateHz,
      peakVelocity,
      peakAcceleration: instant ? null : peakAcceleration,
      minSafe: safeDuration(shape, delta, arm.joints, 1),
      minCalm: safeDuration(shape, delta, arm.joints, arm.cautionRatio),
      figures: {},
    };
    const moveFindings: Finding[] = [];
    for (const checker of moveCheckers) checker(context, moveFindings);
    findings.push(...moveFindings);
    return {
      index,
      duration: move.duration,
      shape: move.shape,
      peakVelocity: toList(peakVelocity),
      peakAcceleration: instant ? new Array<null>(n).fill(null) : toList(peakAcceleration),
      minSafeDuration: context.minSafe.durationS,
      findings: moveFindings,
      ...context.figures, // arm model (issue 4): peakEffort, peakToolSpeed when the arm has a chain
    };
  });
  return { verdict: verdictOf(findings), moves, findings };
}
