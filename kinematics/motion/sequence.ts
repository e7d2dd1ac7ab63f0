/**
 * Sequences: building a plan from a pose sequence, per-move shortest safe durations, and scale to pass
 * (stretching the whole plan's timing by one factor until every timed move passes).
 *
 * Time scaling: stretching a move's duration by s divides its velocities by s and its accelerations by
 * s² (Biagiotti & Melchiorri, Trajectory Planning for Automatic Machines and Robots, 2008 — memory),
 * its inertial effort by s², its viscous friction by s and its tool speed by s; gravity does not change
 * (check/move-path.ts). A move's shortest safe duration (check/safe-duration.ts) is the least duration
 * from which on none of these faults, so the least passing factor is the largest ratio shortest safe
 * duration / duration over the timed moves.
 *
 * @module
 */
import { check } from "../check/check";
import type { Arm } from "../plan/arm";
import type { Move, Plan, Pose, ShapeName } from "../plan/document";
import { planFormat, planVersion } from "../plan/document";
import type { Finding, Report } from "../check/report";
import { stateOf } from "../check/arm-state";
import { moveSafeDuration } from "../check/safe-duration";
import { timelineOf } from "./timeline";

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

/** Options for {@link shortestSafeDurations} and {@link scaleToPass}. */
export interface TimingOptions {
  /**
   * Share of each limit to stay within: 1 (default) avoids faults; the arm's cautionRatio also avoids
   * cautions.
   */
  limitScale?: number;
}

/** Each move's shortest safe duration over every timing-dependent check, within `limitScale` × the limits. */
function safeDurationsOf(plan: Plan, limitScale: number): (number | null)[] {
  const timeline = timelineOf(plan);
  const state = stateOf(plan);
  const n = timeline.jointCount;
  return plan.moves.map((_, i) => {
    const from = timeline.from.subarray(i * n, i * n + n),
      delta = timeline.delta.subarray(i * n, i * n + n);
    return moveSafeDuration(plan, state, from, delta, timeline.shape[i], limitScale, plan.arm.controlRateHz).durationS;
  });
}

/**
 * The shortest safe duration (s) of every move with its own shape (instant moves included: the duration
 * that would replace the instant step): the least duration at which none of speed, acceleration, effort
 * and tool speed faults (the report's `minSafeDuration`); `null` for a move that no duration fixes.
 */
export function shortestSafeDurations(plan: Plan, options: TimingOptions = {}): (number | null)[] {
  return safeDurationsOf(plan, options.limitScale ?? 1);
}

/**
 * The plan with every timed move set to its shortest safe duration (instant moves unchanged; a
 * zero-length timed move keeps its duration, since 0 would make it an instant move; a move that no
 * duration fixes keeps its duration).
 */
export function withShortestDurations(plan: Plan, options: TimingOptions = {}): Plan {
  const shortest = shortestSafeDurations(plan, options);
  return {
    ...plan,
    moves: plan.moves.map((move, i) => {
      const d = shortest[i];
      return move.duration === 0 || d === null || d === 0 ? move : { ...move, duration: d };
    }),
  };
}

/** The plan with every move's duration multiplied by `factor` (> 0). */
export function scalePlan(plan: Plan, factor: number): Plan {
  if (!(factor > 0) || !Number.isFinite(factor)) throw new RangeError("factor must be a finite number greater than 0");
  return { ...plan, moves: plan.moves.map((move) => ({ ...move, duration: move.duration * factor })) };
}

/** Result of {@link scaleToPass}. */
export interface ScaleResult {
  /**
   * The timing factor (durations × factor), at least 1 unless `allowFaster` was set; `null` when no
   * factor makes every timed move pass its timing-dependent checks (a move that no duration fixes).
   */
  factor: number | null;
  /** The scaled plan (the plan unchanged when `factor` is null). */
  plan: Plan;
  /** The scaled plan's report. */
  report: Report;
  /**
   * Faults no timing factor can fix: `jump` faults of instant moves (0 × s is still 0), `range` and
   * `clearance` faults, and the timing faults of moves whose `minSafeDuration` is null. Empty when
   * the scaled plan passes.
   */
  unscalable: Finding[];
}

/** Options for {@link scaleToPass}. */
export interface ScaleOptions extends TimingOptions {
  /** Also return factors below 1 when the plan has margin (it then runs faster). Default false. */
  allowFaster?: boolean;
}

/**
 * Scale to pass: the least factor s such that every timed move, with its duration × s, has no fault in
 * any timing-dependent check (speed, acceleration, effort, tool speed), or with `limitScale` =
 * cautionRatio no caution either; the scaled plan and its report. Each move passes exactly when its
 * duration is at least its shortest safe duration, so s is the largest ratio shortest safe
 * duration / duration over the timed moves; `null` when one of them has none.
 */
export function scaleToPass(plan: Plan, options: ScaleOptions = {}): ScaleResult {
  const scale = options.limitScale ?? 1;
  const needed = safeDurationsOf(plan, scale);
  const unscalableOf = (report: Report) =>
    report.findings.filter(
      (f) =>
        f.severity === "fault" &&
        (f.kind === "jump" ||
          f.kind === "range" ||
          f.kind === "clearance" ||
          (f.move !== null && plan.moves[f.move].duration > 0 && needed[f.move] === null)),
    );
  if (plan.moves.some((move, i) => move.duration > 0 && needed[i] === null)) {
    const report = check(plan);
    return { factor: null, plan, report, unscalable: unscalableOf(report) };
  }
  let factor = 0;
  plan.moves.forEach((move, i) => {
    if (move.duration > 0) factor = Math.max(factor, (needed[i] ?? 0) / move.duration);
  });
  if (!options.allowFaster) factor = Math.max(factor, 1);
  if (factor === 0) factor = 1; // nothing timed moves: keep the timing
  // the product duration × factor may round a hair below the needed duration: nudge until it does not
  for (let tries = 0; tries < 64; tries++) {
    const short = plan.moves.some((move, i) => move.duration > 0 && move.duration * factor < (needed[i] ?? 0));
    if (!short) break;
    factor *= 1 + 2 * Number.EPSILON * (tries + 1);
  }
  const scaled = scalePlan(plan, factor);
  const report = check(scaled);
  return { factor, plan: scaled, report, unscalable: unscalableOf(report) };
}
