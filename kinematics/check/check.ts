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
import type { Plan } from "../plan/document";
import { defaultMoveCheckers, defaultPlanCheckers } from "./checkers";
import { instantPeaks, timedPeaks } from "../motion/peaks";
import { sampleRateOf, stateOf } from "./arm-state";
import { moveSafeDuration } from "./safe-duration";
import { verdictOf, type Finding, type MoveReport, type Report } from "./report";
import { timelineOf } from "../motion/timeline";
import type { CheckOptions, MoveChecker, MoveContext } from "./types";

/** Copies a typed array into a plain list (for the JSON report). */
function toList(values: Float64Array): number[] {
  return Array.from(values);
}

/**
 * What the checkers computed for one move, with finding times from the move's start: the checkers
 * run with `startS` 0, so these are exactly the times they compute from the move's own start, and a
 * reused move's findings get the same `startS + t` a check from scratch computes.
 */
interface CachedMove {
  findings: Finding[];
  minSafe: MoveContext["minSafe"];
  figures: NonNullable<MoveContext["figures"]>;
}

/**
 * Move results by everything they depend on (the arm and plan-level fields, the checkers and
 * options, the move's index, start pose, goal, duration and shape), so that editing one move
 * rechecks that move and the next, whose start it changes, and reuses the rest.
 */
const moveCache = new Map<string, CachedMove>();
const maxCachedMoves = 4096;

/** Shortest safe durations (fault and caution limits) by path: everything but the move's duration. */
const safeCache = new Map<string, { minSafe: MoveContext["minSafe"]; minCalm?: MoveContext["minCalm"] }>();

const checkerIds = new WeakMap<object, number>();
let nextCheckerId = 1;
function checkerId(checker: object): number {
  let id = checkerIds.get(checker);
  if (id === undefined) checkerIds.set(checker, (id = nextCheckerId++));
  return id;
}

/** The part of a move's cache key shared by every move of the plan. */
function moveContextKey(
  plan: Plan,
  moveCheckers: readonly MoveChecker[],
  sampling: string,
  sampleRateHz: number | undefined,
): string {
  // by content, not identity: a plan edited in place must not find its old results
  const planFields = JSON.stringify([plan.arm, plan.payload, plan.keepOut, plan.surfaceMargin, plan.maxToolSpeed]);
  return `${planFields}|${moveCheckers.map(checkerId).join(",")}|${sampling}|${sampleRateHz ?? ""}`;
}

/** A copy of the per-move figures (the report must not share arrays with the cache). */
function copyFigures(figures: CachedMove["figures"]): CachedMove["figures"] {
  const out: CachedMove["figures"] = {};
  if (figures.peakEffort) out.peakEffort = [...figures.peakEffort];
  if (figures.peakToolSpeed !== undefined) out.peakToolSpeed = figures.peakToolSpeed;
  return out;
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

  const state = stateOf(plan);
  const sampling = options.sampling ?? "path";
  const reuse = options.reuse ?? true;
  const contextKey = moveContextKey(plan, moveCheckers, sampling, options.sampleRateHz);
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
      startS: 0, // the move's own clock (see CachedMove); shifted by its start below
      sampleRateHz: options.sampleRateHz,
      peakVelocity,
      peakAcceleration: instant ? null : peakAcceleration,
      sampling,
      minSafe: { durationS: 0, joint: -1, check: null },
      minCalm: { durationS: 0, joint: -1, check: null },
      figures: {},
    };
    const startS = timeline.startS[index];
    const key = `${contextKey}|${index}|${move.duration}|${move.shape}|${Array.from(context.from).join(",")}|${move.goal.join(",")}`;
    const cached = reuse ? moveCache.get(key) : undefined;
    let result: CachedMove;
    if (cached) {
      moveCache.delete(key); // most recently used last
      result = cached;
    } else {
      const rateHz = state ? sampleRateOf(state, context) : arm.controlRateHz;
      const from = context.from;
      // The shortest safe durations depend on the path, not on the move's duration or place in the
      // plan: kept by path, so a change of duration does not search again.
      const pathKey = `${contextKey}|${move.shape}|${Array.from(from).join(",")}|${move.goal.join(",")}`;
      let durations = reuse ? safeCache.get(pathKey) : undefined;
      if (durations)
        safeCache.delete(pathKey); // most recently used last
      else durations = { minSafe: moveSafeDuration(plan, state, from, delta, shape, 1, rateHz) };
      if (reuse) {
        safeCache.set(pathKey, durations);
        if (safeCache.size > maxCachedMoves) safeCache.delete(safeCache.keys().next().value as string);
      }
      context.minSafe = durations.minSafe;
      // within the caution ratio: only a caution's message names it, so it is found when first read
      const known = durations;
      Object.defineProperty(context, "minCalm", {
        get: () => (known.minCalm ??= moveSafeDuration(plan, state, from, delta, shape, arm.cautionRatio, rateHz)),
      });
      const moveFindings: Finding[] = [];
      for (const checker of moveCheckers) checker(context, moveFindings);
      // kept with times from the move's start, so a move that only starts later is reused
      result = {
        findings: moveFindings.map((f) => ({ ...f, timeS: f.timeS ?? 0 })),
        minSafe: context.minSafe,
        figures: context.figures ?? {},
      };
    }
    moveCache.set(key, result);
    if (moveCache.size > maxCachedMoves) moveCache.delete(moveCache.keys().next().value as string);
    const moveFindings = result.findings.map((f) => ({ ...f, timeS: startS + (f.timeS ?? 0) }));
    findings.push(...moveFindings);
    return {
      index,
      duration: move.duration,
      shape: move.shape,
      peakVelocity: toList(peakVelocity),
      peakAcceleration: instant ? new Array<null>(n).fill(null) : toList(peakAcceleration),
      minSafeDuration: result.minSafe.durationS,
      findings: moveFindings,
      ...copyFigures(result.figures), // peakEffort, peakToolSpeed when the arm has a chain
    };
  });
  return { verdict: verdictOf(findings), moves, findings };
}
