/**
 * The report a check returns: verdict, per-move figures and findings. The JSON shape is part of the
 * product's contract (web app, API, command line): `verdict`, `moves[]`, `findings[]`.
 *
 * @module
 */
import type { ShapeName } from "../plan/document";

/**
 * What a finding is about. `range`, `speed-over`, `accel-over` and `jump` come from the joint checks;
 * `effort-over`, `clearance` and `tool-speed` are reserved for the arm-model checks (chain, payload,
 * keep-out zones, tool point), which add their findings to the same report. `glitch` and `gap` come from
 * the timed-replay audit of recordings (kinematics/recordings/timed-replay.ts).
 */
export type FindingKind =
  "range" | "speed-over" | "accel-over" | "jump" | "effort-over" | "clearance" | "tool-speed" | "glitch" | "gap";

/** All finding kinds, in the order reports and tables list them. */
export const findingKinds: readonly FindingKind[] = [
  "range",
  "jump",
  "speed-over",
  "accel-over",
  "effort-over",
  "clearance",
  "tool-speed",
  "glitch",
  "gap",
];

/** How bad one finding is: `fault` (the controller would refuse or stop) or `caution` (close to a limit). */
export type Severity = "caution" | "fault";

/** The outcome of a check: `pass`, `caution` (some value within the caution ratio of a limit) or `fault`. */
export type Verdict = "pass" | "caution" | "fault";

/** One problem found in a plan. */
export interface Finding {
  kind: FindingKind;
  severity: Severity;
  /** Index of the move, or `null` for the start pose (and for plan-wide findings). */
  move: number | null;
  /** Index of the joint, or `null` when the finding is not about one joint (e.g. clearance). */
  joint: number | null;
  /** The offending value, in the limit's unit (rad, m, rad/s, m/s, rad/s², m/s², …). */
  value: number;
  /** The limit it is compared with, same unit as `value`. */
  limit: number;
  /** Plain-language description naming the joint, the value, the limit and the fix. */
  message: string;
  /**
   * When the worst instant happens, in seconds from the plan's start (`check()` always sets it):
   * the peak for `speed-over` and `accel-over` (the first one, when a shape peaks twice), the
   * instant move's start for `jump`, the move's end for `range` (0 for the start pose), the worst
   * sample for `effort-over`, `clearance` and `tool-speed` (0 for the start pose's effort).
   */
  timeS?: number;
  /** `clearance` only: the name of the link that intrudes. */
  link?: string;
  /** `clearance` only: what it intrudes into, `work surface` or the keep-out box's name. */
  zone?: string;
}

/** Figures for one move of a plan. */
export interface MoveReport {
  index: number;
  /** Duration in seconds (0 for an instant move). */
  duration: number;
  shape: ShapeName;
  /** Largest |q̇ⱼ| over the move per joint, rad/s or m/s; for an instant move |Δqⱼ| × control rate. */
  peakVelocity: number[];
  /** Largest |q̈ⱼ| over the move per joint, rad/s² or m/s²; `null` for an instant move. */
  peakAcceleration: (number | null)[];
  /**
   * Shortest duration (s) with this move's shape at which none of the timing-dependent checks
   * (speed, acceleration, effort with friction, tool speed) faults on this move; `null` when one
   * faults at every duration (e.g. gravity alone above an effort limit). For an instant move, the
   * duration that would replace its step.
   */
  minSafeDuration: number | null;
  /** The findings of this move (the same objects as in the report's `findings`). */
  findings: Finding[];
  /**
   * Arm model only (the arm has a `chain`): largest |τⱼ| over the move per joint (N·m or N),
   * rigid-body dynamics with payload plus friction; `null` for joints outside the chain (a gripper).
   * For an instant move, the effort to hold the goal pose.
   */
  peakEffort?: (number | null)[];
  /** Arm model only: largest tool-point speed over the move (m/s); for an instant move its step × control rate. */
  peakToolSpeed?: number;
}

/** What `check(plan)` returns. */
export interface Report {
  verdict: Verdict;
  moves: MoveReport[];
  findings: Finding[];
}

/**
 * Relative tolerance for "equal to the limit": a value within one part in 10¹² above a limit counts as
 * equal and passes, so float rounding in a value designed to sit exactly on a limit does not fault.
 */
export const limitTolerance = 1e-12;

/**
 * The severity of a value against a limit: `fault` above the limit, `caution` above
 * `cautionRatio` × limit (and not above the limit), `null` otherwise. Equal to a limit passes.
 */
export function severityOf(value: number, limit: number, cautionRatio: number): Severity | null {
  if (value > faultLevel(limit)) return "fault";
  if (value > cautionLevel(limit, cautionRatio)) return "caution";
  return null;
}

/** The value above which {@link severityOf} says `fault`. */
export function faultLevel(limit: number): number {
  return limit * (1 + limitTolerance);
}

/** The value above which {@link severityOf} says `caution` (when not `fault`). */
function cautionLevel(limit: number, cautionRatio: number): number {
  return cautionRatio * limit * (1 + limitTolerance);
}

/**
 * The values {@link severityOf} compares a peak with (fault, then caution), for a scan that must
 * land on the same side of each; none without a limit.
 */
export function severityLevels(limit: number | undefined, cautionRatio: number): number[] {
  if (limit === undefined) return [];
  return [faultLevel(limit), cautionLevel(limit, cautionRatio)];
}

/** The verdict over a list of findings: `fault` if any is a fault, else `caution` if any, else `pass`. */
export function verdictOf(findings: readonly { severity: Severity }[]): Verdict {
  let verdict: Verdict = "pass";
  for (const finding of findings) {
    if (finding.severity === "fault") return "fault";
    verdict = "caution";
  }
  return verdict;
}
