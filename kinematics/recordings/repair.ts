/**
 * Repair of a recording for streaming: rate-limiting each joint (a slew-rate limiter) so that the
 * stream check passes, optionally after resampling at a uniform rate.
 *
 * @module
 */
import type { Arm } from "../plan/arm";
import type { Recording } from "./recording";

/** Options for {@link repairStream}. */
export interface RepairOptions {
  /**
   * Share of each limit the repaired stream may use (default: the arm's cautionRatio, so the repaired
   * stream passes without cautions).
   */
  limitScale?: number;
  /** Resample the recording at this uniform rate (Hz, linear interpolation) before rate-limiting. */
  resampleHz?: number;
}

/** Result of {@link repairStream}. */
export interface RepairResult {
  recording: Recording;
  /** Largest |repaired − original| per joint, rad or m (against the resampled original when resampling). */
  maxDeviation: number[];
  /** Index of the sample with the largest deviation, per joint (−1 when the joint is unchanged). */
  maxDeviationSample: number[];
}

/** Linear resampling of a recording at a uniform rate from its first to its last time. */
export function resampleRecording(recording: Recording, rateHz: number): Recording {
  if (!(rateHz > 0)) throw new RangeError("rateHz must be greater than 0");
  const { count, jointCount: n, timeS, position } = recording;
  if (count === 0) return { ...recording, timeS: new Float64Array(0), position: new Float64Array(0) };
  const t0 = timeS[0];
  const spanS = timeS[count - 1] - t0;
  const outCount = Math.floor(spanS * rateHz + 1e-9) + 1;
  const outTime = new Float64Array(outCount);
  const outPosition = new Float64Array(outCount * n);
  let i = 0;
  for (let k = 0; k < outCount; k++) {
    const t = t0 + k / rateHz;
    outTime[k] = t;
    while (i < count - 2 && timeS[i + 1] <= t) i++;
    const a = timeS[i];
    const b = i + 1 < count ? timeS[i + 1] : a;
    const w = b > a ? Math.min(1, Math.max(0, (t - a) / (b - a))) : 0; // linear interpolation weight
    for (let j = 0; j < n; j++) {
      const qa = position[i * n + j];
      const qb = i + 1 < count ? position[(i + 1) * n + j] : qa;
      outPosition[k * n + j] = (1 - w) * qa + w * qb;
    }
  }
  return { names: [...recording.names], jointCount: n, count: outCount, timeS: outTime, position: outPosition };
}

/**
 * Repair: rate-limits a valid recording so that its stream check passes. Each joint follows the
 * recording, clamped into its travel, but moves at most limitScale × maxVelocity × min(Δt, 1/controlRateHz)
 * per step (a slew-rate limiter), so no step is a jump or a speed-over. The repaired path lags the
 * original where the original was too fast; `maxDeviation` says by how much.
 */
export function repairStream(arm: Arm, recording: Recording, options: RepairOptions = {}): RepairResult {
  const source = options.resampleHz ? resampleRecording(recording, options.resampleHz) : recording;
  const { count, jointCount: n, timeS, position } = source;
  const scale = (options.limitScale ?? arm.cautionRatio) * (1 - 1e-9); // a hair inside, against rounding
  const out = new Float64Array(count * n);
  const maxDeviation = new Array<number>(n).fill(0);
  const maxDeviationSample = new Array<number>(n).fill(-1);
  const periodS = 1 / arm.controlRateHz;
  for (let j = 0; j < n; j++) {
    const joint = arm.joints[j];
    const speed = scale * joint.maxVelocity;
    let previous = 0;
    for (let k = 0; k < count; k++) {
      const target = Math.min(joint.max, Math.max(joint.min, position[k * n + j]));
      let q = target;
      if (k > 0) {
        const dt = timeS[k] - timeS[k - 1];
        const maxStep = speed * Math.min(dt, periodS); // slew-rate limit for this step
        const want = target - previous;
        q = want > maxStep ? previous + maxStep : want < -maxStep ? previous - maxStep : target;
      }
      out[k * n + j] = q;
      previous = q;
      const deviation = Math.abs(q - position[k * n + j]);
      if (deviation > maxDeviation[j]) {
        maxDeviation[j] = deviation;
        maxDeviationSample[j] = k;
      }
    }
  }
  return {
    recording: { names: [...source.names], jointCount: n, count, timeS: Float64Array.from(timeS), position: out },
    maxDeviation,
    maxDeviationSample,
  };
}
