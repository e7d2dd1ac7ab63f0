/**
 * The pose on a plan's timeline at any time, without allocating (the 3D view calls it every frame).
 * A time on the boundary between two moves belongs to the later one, as in the engine's sampler.
 */
import { sampleMoveAt, type Timeline } from "@/kinematics";

export interface PoseScratch {
  velocity: Float64Array;
  acceleration: Float64Array;
}

export function createPoseScratch(jointCount: number): PoseScratch {
  return { velocity: new Float64Array(jointCount), acceleration: new Float64Array(jointCount) };
}

/** Index of the move running at `timeS`, or −1 before any move and `moveCount` after the last one. */
export function moveAt(timeline: Timeline, timeS: number): number {
  const m = timeline.moveCount;
  if (m === 0) return -1;
  for (let i = 0; i < m; i++) if (timeS < timeline.startS[i] + timeline.durationS[i]) return i;
  return m;
}

/** Writes the pose at `timeS` into `out` (stride: joint count); returns the running move's index. */
export function poseAt(timeline: Timeline, timeS: number, out: Float64Array, scratch: PoseScratch): number {
  const i = moveAt(timeline, timeS);
  if (i < 0) {
    out.set(timeline.start);
    return i;
  }
  if (i >= timeline.moveCount) {
    const n = timeline.jointCount;
    const base = (timeline.moveCount - 1) * n;
    for (let j = 0; j < n; j++) out[j] = timeline.goal[base + j];
    return i;
  }
  sampleMoveAt(timeline, i, timeS - timeline.startS[i], out, scratch.velocity, scratch.acceleration, 0);
  return i;
}
