/**
 * Episode repair for the timed replay: glitches replaced by the mean of their neighbours, gaps filled
 * by linear interpolation (the filled frames marked), then every joint clamped into its travel and
 * rate-limited to cautionRatio × maxVelocity × Δt per step (a slew-rate limiter, as the recording
 * repair does, with the frame step instead of the control period). The caller audits the result
 * again; the repair itself promises nothing it has not checked.
 *
 * @module
 */
import type { Arm } from "../plan/arm";
import { limitTolerance } from "../check/report";
import type { Recording } from "./recording";
import { gapFactor, medianStepS, replayFindings } from "./timed-replay";

/** Result of {@link repairEpisode}. */
export interface EpisodeRepair {
  recording: Recording;
  /** 1 for a frame inserted to fill a gap, 0 for a recorded frame. */
  filled: Uint8Array;
  /** Glitch frames replaced by the mean of their neighbours. */
  glitchesReplaced: number;
  /** Frames inserted into gaps. */
  framesFilled: number;
  /** Largest |repaired − recorded| per joint over the recorded frames, rad or m. */
  maxDeviation: number[];
}

/**
 * Repairs a valid episode (see `episodeProblems`) so that its timed replay passes: glitches, then
 * gaps, then travel and speed. Does not change the input.
 */
export function repairEpisode(arm: Arm, recording: Recording): EpisodeRepair {
  const { count, jointCount: n, timeS } = recording;
  const source = Float64Array.from(recording.position);

  // 1. glitches: the spike frame takes the mean of its neighbours
  let glitchesReplaced = 0;
  for (const f of replayFindings(arm, recording)) {
    if (f.kind !== "glitch" || f.joint === null) continue;
    const k = f.sample;
    const j = f.joint;
    source[k * n + j] = 0.5 * (source[(k - 1) * n + j] + source[(k + 1) * n + j]);
    glitchesReplaced++;
  }

  // 2. gaps: m = round(Δt / median) − 1 frames evenly spaced, linearly interpolated
  const median = medianStepS(timeS, count);
  const gapLimit = gapFactor * median;
  let extra = 0;
  const insertAfter = new Int32Array(count);
  for (let k = 1; k < count; k++) {
    const dt = timeS[k] - timeS[k - 1];
    if (dt > gapLimit * (1 + limitTolerance)) {
      const m = Math.max(1, Math.round(dt / median) - 1);
      insertAfter[k] = m;
      extra += m;
    }
  }
  const outCount = count + extra;
  const outTime = new Float64Array(outCount);
  const target = new Float64Array(outCount * n);
  const filled = new Uint8Array(outCount);
  const recordedAt = new Int32Array(count); // output frame of each recorded frame
  let o = 0;
  for (let k = 0; k < count; k++) {
    const m = insertAfter[k];
    if (m > 0) {
      const t0 = timeS[k - 1];
      const t1 = timeS[k];
      for (let i = 1; i <= m; i++) {
        const w = i / (m + 1); // linear interpolation weight
        outTime[o] = t0 + w * (t1 - t0);
        for (let j = 0; j < n; j++) target[o * n + j] = (1 - w) * source[(k - 1) * n + j] + w * source[k * n + j];
        filled[o] = 1;
        o++;
      }
    }
    outTime[o] = timeS[k];
    for (let j = 0; j < n; j++) target[o * n + j] = source[k * n + j];
    recordedAt[k] = o;
    o++;
  }

  // 3. travel and speed: clamp the target, then move at most cautionRatio × maxVelocity × Δt per step
  const scale = arm.cautionRatio * (1 - 1e-9); // a hair inside, against rounding
  const out = new Float64Array(outCount * n);
  for (let j = 0; j < n; j++) {
    const joint = arm.joints[j];
    const speed = scale * joint.maxVelocity;
    let previous = 0;
    for (let k = 0; k < outCount; k++) {
      const want = Math.min(joint.max, Math.max(joint.min, target[k * n + j]));
      let q = want;
      if (k > 0) {
        const maxStep = speed * (outTime[k] - outTime[k - 1]); // slew-rate limit for this step
        const d = want - previous;
        q = d > maxStep ? previous + maxStep : d < -maxStep ? previous - maxStep : want;
      }
      out[k * n + j] = q;
      previous = q;
    }
  }

  const maxDeviation = new Array<number>(n).fill(0);
  for (let k = 0; k < count; k++) {
    for (let j = 0; j < n; j++) {
      const d = Math.abs(out[recordedAt[k] * n + j] - recording.position[k * n + j]);
      if (d > maxDeviation[j]) maxDeviation[j] = d;
    }
  }
  return {
    recording: { names: [...recording.names], jointCount: n, count: outCount, timeS: outTime, position: out },
    filled,
    glitchesReplaced,
    framesFilled: extra,
    maxDeviation,
  };
}
