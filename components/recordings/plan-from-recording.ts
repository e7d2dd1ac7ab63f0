/** A plan made from a (repaired) recording, for "Save as plan". */
import { check, planFromPoses, shortestSafeDurations, type Arm, type Recording } from "@/kinematics";
import { waypointIndices } from "./read-file";
import type { PlanPreview } from "./recording-session";

/**
 * A plan from a recording: waypoints every `spacingS`, each move lasting as long as the recording
 * took, lengthened to its shortest safe duration (rounded up to the millisecond) where rest-to-rest
 * needs more time. A move that no duration fixes keeps its duration, and the plan's check shows the fault.
 */
export function planFromRecording(arm: Arm, rec: Recording, spacingS: number): PlanPreview {
  const n = rec.jointCount;
  const idx = waypointIndices(rec.timeS, spacingS);
  const poseAt = (k: number) => Array.from(rec.position.subarray(k * n, k * n + n));
  const goals = idx.slice(1).map(poseAt);
  const durations = idx.slice(1).map((k, i) => rec.timeS[k] - rec.timeS[idx[i]]);
  const draft = planFromPoses(arm, poseAt(idx[0]), goals, durations, "quintic");
  const safe = shortestSafeDurations(draft);
  const longer = (i: number, duration: number): number | null => {
    const d = safe[i];
    return d !== null && d > duration ? Math.ceil(d * 1000) / 1000 : null;
  };
  const lengthened = draft.moves.filter((m, i) => longer(i, m.duration) !== null).length;
  const plan = {
    ...draft,
    moves: draft.moves.map((m, i) => {
      const d = longer(i, m.duration);
      return d === null ? m : { ...m, duration: d };
    }),
  };
  return { plan, lengthened, report: check(plan) };
}
