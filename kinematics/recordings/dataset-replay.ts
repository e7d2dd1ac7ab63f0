/**
 * The replay plan of an episode: from a rest pose, ease in to the episode's first frame over the
 * shortest duration at which that move passes the check's timing limits, then one move per frame
 * (each reached in the time between frames, cubic), then ease back to rest the same way. The plan is
 * checked like any plan; the caller shows its report with the safety caution.
 *
 * @module
 */
import type { Arm } from "../plan/arm";
import { homePose } from "../plan/arm";
import { planFormat, planVersion, type Move, type Plan } from "../plan/document";
import { check } from "../check/check";
import type { Report } from "../check/report";
import type { Recording } from "./recording";

/** Result of {@link replayPlanOf}. */
export interface ReplayPlan {
  plan: Plan;
  report: Report;
  /** Durations (s) of the ease-in and ease-out moves. */
  easeInS: number;
  easeOutS: number;
}

/** Rounds a duration up to whole milliseconds (never shorter than the shortest safe one). */
function upToMs(durationS: number): number {
  return Math.ceil(durationS * 1000 - 1e-9) / 1000;
}

/** The shortest passing duration of one quintic move from `from` to `to` (at least 0.1 s). */
function easeDuration(arm: Arm, from: number[], to: number[]): number {
  const probe: Plan = {
    format: planFormat,
    version: planVersion,
    arm,
    start: from,
    moves: [{ goal: to, duration: 1, shape: "quintic" }],
  } as Plan;
  const minSafe = check(probe).moves[0]?.minSafeDuration ?? 1;
  return Math.max(0.1, upToMs(Number.isFinite(minSafe) ? minSafe : 1));
}

/**
 * Builds and checks the replay plan of a valid episode (columns in the arm's joint order).
 * `rest` defaults to the arm's home pose (0 where the travel allows, else mid-travel).
 */
export function replayPlanOf(arm: Arm, recording: Recording, rest: number[] = homePose(arm)): ReplayPlan {
  const { count, jointCount: n, timeS, position } = recording;
  const frame = (k: number) => Array.from(position.subarray(k * n, k * n + n));
  const first = frame(0);
  const last = frame(count - 1);
  const easeInS = easeDuration(arm, rest, first);
  const easeOutS = easeDuration(arm, last, rest);
  const moves: Move[] = [{ goal: first, duration: easeInS, shape: "quintic" }];
  for (let k = 1; k < count; k++) moves.push({ goal: frame(k), duration: timeS[k] - timeS[k - 1], shape: "cubic" });
  moves.push({ goal: [...rest], duration: easeOutS, shape: "quintic" });
  const plan = { format: planFormat, version: planVersion, arm, start: [...rest], moves } as Plan;
  return { plan, report: check(plan), easeInS, easeOutS };
}
