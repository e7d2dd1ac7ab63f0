/**
 * What the checkers see and the shape of a checker: the contexts `check()` builds for each plan
 * and move, and the options that choose the checkers. Imports no checker, so every checker and
 * `check()` itself can depend on it without a cycle.
 *
 * @module
 */
import type { Arm } from "../plan/arm";
import type { Move, Plan } from "../plan/document";
import type { Finding, MoveReport } from "./report";
import type { SafeDuration } from "./safe-duration";
import type { Timeline } from "../motion/timeline";

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
  /**
   * Shortest duration (s) with the move's shape at which no timing-dependent check (speed,
   * acceleration, effort, tool speed) faults, and what sets it; `durationS` null when none passes.
   */
  minSafe: SafeDuration;
  /** The same within the caution ratio of every limit (no timing-dependent caution either); `check()` finds it only when a checker reads it. */
  minCalm: SafeDuration;
  /**
   * Start time of the move (s) that finding times are counted from: `check()` passes 0 and adds the
   * move's start from the plan's start to each finding's `timeS` afterwards, so a move's findings do
   * not depend on when it starts (and are reused when only an earlier move changed). A checker
   * writes `timeS` as `startS + t` and keeps absolute times out of its messages.
   */
  startS: number;
  /** Rate (Hz) the sampled arm checks use; undefined means the arm's control rate. */
  sampleRateHz?: number;
  /** How the sampled arm checks find their peaks (see {@link CheckOptions}). */
  sampling: CheckSampling;
  /** Arm model only: extra per-move figures copied into the move's report. */
  figures?: Pick<MoveReport, "peakEffort" | "peakToolSpeed">;
}

/** A check run once per plan; pushes its findings to `out`. */
export type PlanChecker = (context: PlanContext, out: Finding[]) => void;

/** A check run once per move; pushes its findings (with `move` = `context.index`) to `out`. */
export type MoveChecker = (context: MoveContext, out: Finding[]) => void;

/**
 * How the arm-model checks find effort and tool-speed peaks: `path` (default) evaluates the move's
 * cached path terms on a coarse grid and refines where a curvature bound cannot rule a higher value
 * out; `control-rate` evaluates every control period (slower; the reference the path mode is tested
 * against). Clearance is scanned at the control rate in both modes.
 */
export type CheckSampling = "path" | "control-rate";

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
  /** Default `path`; see {@link CheckSampling}. */
  sampling?: CheckSampling;
  /**
   * Reuse the results of moves checked before with exactly the same inputs (default true): editing
   * one move then rechecks that move and the next. False checks every move afresh.
   */
  reuse?: boolean;
}
