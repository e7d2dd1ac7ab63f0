/**
 * The duration sweep of one move (sweep-chart.tsx draws it): the engine's worst timing ratio of the
 * move at 49 durations around its shortest safe one. The check worker sweeps the selected move right
 * after its report (components/editor/check.worker.ts), with the move's path terms still cached, so a
 * pose edit's sweep neither holds the page nor waits for a second round trip through it.
 */
import { moveTimingSweep, type Plan, type Report } from "@/kinematics";

/** Durations the sweep evaluates (each one a peak evaluation of the move's path). */
export const SWEEP_STEPS = 48;

/** One point of the sweep: a duration (s) and the worst peak-to-limit ratio at it. */
export type SweepPoint = { d: number; r: number };

/** A move's sweep, with what it was swept for. */
export interface MoveSweep {
  /** {@link sweepInputs} of the plan it was swept on. */
  inputs: string;
  index: number;
  /** The report's shortest safe duration of the move (> 0), which sets the range. */
  minSafeS: number;
  currentS: number;
  points: SweepPoint[];
}

/**
 * Everything the sweep of move `index` depends on, as one string: the arm, the plan-level limits,
 * the move's start (the previous goal), goal and shape, and its current duration (which, with the
 * shortest safe one, sets the range). Equal strings, equal sweeps; an edit of another move changes
 * none of it. The shortest safe duration is not in it: the engine finds it from the move's own path
 * and the same limits, so equal strings have equal ones too (tested with the engine's check).
 */
export function sweepInputs(plan: Plan, index: number, currentS: number): string {
  const move = plan.moves[index];
  return JSON.stringify([
    plan.arm,
    plan.payload,
    plan.keepOut,
    plan.surfaceMargin,
    plan.maxToolSpeed,
    index === 0 ? plan.start : plan.moves[index - 1]?.goal,
    move?.goal,
    move?.shape,
    currentS,
  ]);
}

/** The durations swept: from half the shortest safe one to three times it (and past the current one). */
export function sweepDurations(minSafeS: number, currentS: number): number[] {
  const hi = Math.max(minSafeS * 3, currentS * 1.2, 0.2);
  const lo = Math.max(minSafeS * 0.5, 0.01);
  return Array.from({ length: SWEEP_STEPS + 1 }, (_, k) => lo + ((hi - lo) * k) / SWEEP_STEPS);
}

/**
 * The sweep of move `index` of a checked plan, or null when there is nothing to sweep: no such move,
 * an instant move, a move no duration makes safe, or one that moves no joint (the chart says which).
 */
export function sweepOfMove(plan: Plan, report: Report, index: number): MoveSweep | null {
  const move = plan.moves[index];
  const minSafeS = report.moves[index]?.minSafeDuration ?? null;
  if (!move || !(move.duration > 0) || minSafeS === null || !(minSafeS > 0)) return null;
  const points = moveTimingSweep(plan, index, sweepDurations(minSafeS, move.duration)).map((p) => ({
    d: p.durationS,
    r: p.ratio,
  }));
  return { inputs: sweepInputs(plan, index, move.duration), index, minSafeS, currentS: move.duration, points };
}
