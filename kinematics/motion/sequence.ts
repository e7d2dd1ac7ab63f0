/**
 * Sequences: building a plan from a pose sequence, per-move shortest safe durations, and scale to pass
 * (stretching the whole plan's timing by one factor until every timed move passes).
 *
 * Time scaling: stretching a move's duration by s divides its velocities by s and its accelerations by
 * s² (Biagiotti & Melchiorri, Trajectory Planning for Automatic Machines and Robots, 2008 — memory).
 * Every shape's peaks fall as its duration grows, so a move passes exactly when its duration is at
 * least its shortest safe duration, and the least passing factor is the largest ratio
 * shortest safe duration / duration over the timed moves.
 *
 * @module
 */
import { check } from "../check/check";
import type { Arm } from "../plan/arm";
import type { Move, Plan, Pose, ShapeName } from "../plan/document";
import { planFormat, planVersion } from "../plan/document";
import { safeDuration } from "./peaks";
import type { Finding, Report } from "../check/report";
import { shapeId } from "./shapes";

/** Builds a plan document from a start pose, goal poses and per-move durations (s), all with one shape. */
export function planFromPoses(
  arm: Arm,
  start: Pose,
  goals: readonly Pose[],
  durationsS: readonly number[],
  shape: ShapeName = "quintic",
): Plan {
  if (goals.length !== durationsS.length) throw new RangeError("need one duration per goal pose");
  return {
    format: planFormat,
    version: planVersion,
    arm,
    start: [...start],
    moves: goals.map((goal, i): Move => ({ goal: [...goal], duration: durationsS[i], shape })),
  };
}

/** Displacement goal − previous pose of every move, rad or m. */
function deltasOf(plan: Plan): Float64Array[] {
  let previous = plan.start;
  return plan.moves.map((move) => {
    const delta = new Float64Array(move.goal.length);
    for (let j = 0; j < delta.length; j++) delta[j] = move.goal[j] - previous[j];
    previous = move.goal;
    return delta;
  });
}

/** Options for {@link shortestSafeDurations} and {@link scaleToPass}. */
export interface TimingOptions {
  /**
   * Share of each limit to stay within: 1 (default) avoids faults; the arm's cautionRatio also avoids
   * cautions.
   */
  limitScale?: number;
}

/**
 * The shortest safe duration (s) of every move with its own shape (instant moves included: the duration
 * that would replace the instant step).
 */
export function shortestSafeDurations(plan: Plan, options: TimingOptions = {}): number[] {
  const scale = options.limitScale ?? 1;
  return deltasOf(plan).map((delta, i) => safeDuration(shapeId(plan.moves[i].shape), delta, plan.arm.joints, scale).durationS);
}

/**
 * The plan with every timed move set to its shortest safe duration (instant moves unchanged; a
 * zero-length timed move keeps its duration, since 0 would make it an instant move).
 */
export function withShortestDurations(plan: Plan, options: TimingOptions = {}): Plan {
  const shortest = shortestSafeDurations(plan, options);
  return {
    ...plan,
    moves: plan.moves.map((move, i) =>
      move.duration === 0 || shortest[i] === 0 ? move : { ...move, duration: shortest[i] },
    ),
  };
}

/** The plan with every move's duration multiplied by `factor` (> 0). */
export function scalePlan(plan: Plan, factor: number): Plan {
  if (!(factor > 0) || !Number.isFinite(factor)) throw new RangeError("factor must be a finite number greater than 0");
  return { ...plan, moves: plan.moves.map((move) => ({ ...move, duration: move.duration * factor })) };
}

/** Result of {@link scaleToPass}. */
export interface ScaleResult {
  /** The timing factor: durations × factor. At least 1 unless `allowFaster` was set. */
  factor: number;
  /** The scaled plan. */
  plan: Plan;
  /** The scaled plan's report. */
  report: Report;
  /**
   * Faults no timing factor can fix: `jump` faults of instant moves (0 × s is still 0) and `range`
   * faults. Empty when the scaled plan passes.
   */
  unscalable: Finding[];
}

/** Options for {@link scaleToPass}. */
export interface ScaleOptions extends TimingOptions {
  /** Also return factors below 1 when the plan has margin (it then runs faster). Default false. */
  allowFaster?: boolean;
}

/**
 * Scale to pass: the least factor s such that every timed move, with its duration × s, has no fault
 * (or, with `limitScale` = cautionRatio, no caution), the scaled plan and its report.
 */
export function scaleToPass(plan: Plan, options: ScaleOptions = {}): ScaleResult {
  const scale = options.limitScale ?? 1;
  const deltas = deltasOf(plan);
  const needed = plan.moves.map((move, i) =>
    move.duration > 0 ? safeDuration(shapeId(move.shape), deltas[i], plan.arm.joints, scale).durationS : 0,
  );
  let factor = 0;
  plan.moves.forEach((move, i) => {
    if (move.duration > 0) factor = Math.max(factor, needed[i] / move.duration);
  });
  if (!options.allowFaster) factor = Math.max(factor, 1);
  if (factor === 0) factor = 1; // nothing timed moves: keep the timing
  // the product duration × factor may round a hair below the needed duration: nudge until it does not
  for (let tries = 0; tries < 64; tries++) {
    const short = plan.moves.some((move, i) => move.duration > 0 && move.duration * factor < needed[i]);
    if (!short) break;
    factor *= 1 + 2 * Number.EPSILON * (tries + 1);
  }
  const scaled = scalePlan(plan, factor);
  const report = check(scaled);
  const unscalable = report.findings.filter(
    (f) => f.severity === "fault" && (f.kind === "jump" || f.kind === "range"),
  );
  return { factor, plan: scaled, report, unscalable };
}
