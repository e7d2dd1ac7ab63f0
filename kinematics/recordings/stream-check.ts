/**
 * Stream check of a recording, as if streamed to the controller with every sample an instant move.
 *
 * Per step from sample k−1 to sample k and joint j, with Δq = qₖ − qₖ₋₁ and Δt = tₖ − tₖ₋₁:
 * - `jump` when |Δq| is above maxVelocity / controlRateHz (the step must fit in one control period —
 *   the jump-too-far fault; common practice), caution above cautionRatio of that;
 * - `speed-over` when the finite-difference speed |Δq| / Δt is above maxVelocity (backward difference),
 *   caution above cautionRatio of it;
 * - `range` when a sample lies outside the joint's travel.
 * A run of consecutive offending steps (or samples, for `range`) of one kind and joint is one finding
 * from `sample` to `endSample`, with the run's worst value and severity. Messages name the samples by
 * the lines of the recording's CSV file (see `recording.ts`).
 *
 * @module
 */
import type { Arm } from "../plan/arm";
import { findingKinds, limitTolerance, type FindingKind, type Severity, type Verdict } from "../check/report";
import { formatNumber, formatQuantity, jointLabel, limitLevel } from "../check/wording";
import { lineOfSample, type Recording } from "./recording";

/** One stream-check finding, over the samples `sample`..`endSample` (0-based indexes). */
export interface StreamFinding {
  kind: FindingKind;
  severity: Severity;
  joint: number;
  /** Index of the later sample of the first offending step (or the first offending sample, for `range`). */
  sample: number;
  /** Index of the later sample of the last offending step of the run. */
  endSample: number;
  /** The CSV file's line of `sample` (header = line 1). */
  line: number;
  /** The CSV file's line of `endSample`. */
  endLine: number;
  /** Time of `sample`, s. */
  time: number;
  /** The run's worst value: step (rad or m) for `jump`, speed (rad/s or m/s) for `speed-over`, position for `range`. */
  value: number;
  /** The limit compared with, same unit as `value`. */
  limit: number;
  message: string;
}

/** The stream check's result. */
export interface StreamReport {
  verdict: Verdict;
  /** Number of samples checked. */
  samples: number;
  /** Mean sample rate of the recording, Hz ((samples − 1) / duration; 0 below two samples). */
  rateHz: number;
  findings: StreamFinding[];
}

/** The run kinds of the stream check (also the streaming scan's). */
export const RANGE = 0;
export const JUMP = 1;
export const SPEED = 2;

/** Options for {@link streamCheck}. */
export interface StreamOptions {
  /** Most findings to keep (default: all). The verdict still counts every step. */
  maxFindings?: number;
}

/**
 * The stream check of a valid recording (see {@link validateRecording}) against the arm's limits.
 * One pass over the samples, no allocation per sample.
 */
export function streamCheck(arm: Arm, recording: Recording, options: StreamOptions = {}): StreamReport {
  const { count, jointCount: n, timeS, position } = recording;
  const joints = arm.joints;
  const ratio = arm.cautionRatio;
  const tol = 1 + limitTolerance;
  const jumpFault = new Float64Array(n);
  const jumpCaution = new Float64Array(n);
  const speedFault = new Float64Array(n);
  const speedCaution = new Float64Array(n);
  const min = new Float64Array(n);
  const max = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const v = joints[j].maxVelocity;
    jumpFault[j] = (v / arm.controlRateHz) * tol; // step limit: one control period at maxVelocity
    jumpCaution[j] = ((ratio * v) / arm.controlRateHz) * tol;
    speedFault[j] = v * tol;
    speedCaution[j] = ratio * v * tol;
    min[j] = joints[j].min;
    max[j] = joints[j].max;
  }
  // open runs per (kind, joint): first sample (−1 when closed), worst value, worst severity (1 caution, 2 fault)
  const runStart = new Int32Array(3 * n).fill(-1);
  const runWorst = new Float64Array(3 * n);
  const runLevel = new Uint8Array(3 * n);
  // joints with an open run of any kind (so the quiet fast path below never skips closing one)
  const openRuns = new Uint8Array(n);
  const found: StreamFinding[] = [];
  let faults = 0;
  let cautions = 0;
  const maxFindings = options.maxFindings ?? Infinity;

  const close = (slot: number, endSample: number) => {
    const kind = (slot / n) | 0;
    const j = slot - kind * n;
    const level = runLevel[slot];
    if (level === 2) faults++;
    else cautions++;
    if (found.length < maxFindings) {
      found.push(
        streamFinding(
          arm,
          kind,
          j,
          runStart[slot],
          endSample,
          timeS[runStart[slot]],
          timeS[endSample],
          runWorst[slot],
          level === 2 ? "fault" : "caution",
        ),
      );
    }
    runStart[slot] = -1;
    openRuns[j] = runStart[j] >= 0 || runStart[n + j] >= 0 || runStart[2 * n + j] >= 0 ? 1 : 0;
  };
  const note = (slot: number, k: number, value: number, level: number) => {
    if (runStart[slot] < 0) {
      openRuns[slot % n] = 1;
      runStart[slot] = k;
      runWorst[slot] = value;
      runLevel[slot] = level;
    } else {
      if (value > runWorst[slot]) runWorst[slot] = value;
      if (level > runLevel[slot]) runLevel[slot] = level;
    }
  };

  for (let k = 0; k < count; k++) {
    const row = k * n;
    const dt = k > 0 ? timeS[k] - timeS[k - 1] : 0;
    for (let j = 0; j < n; j++) {
      const q = position[row + j];
      if (k > 0 && openRuns[j] === 0 && q >= min[j] && q <= max[j]) {
        // fast path: a quiet step (below both caution thresholds) with no run to close
        const quiet = Math.abs(q - position[row - n + j]);
        if (quiet <= jumpCaution[j] && quiet <= speedCaution[j] * dt) continue;
      }
      // range: this sample within travel
      if (q < min[j] || q > max[j]) note(RANGE * n + j, k, q, 2);
      else if (runStart[RANGE * n + j] >= 0) close(RANGE * n + j, k - 1);
      if (k === 0) continue;
      const step = Math.abs(q - position[row - n + j]);
      // jump: the step against one control period's travel at maxVelocity
      if (step > jumpCaution[j]) note(JUMP * n + j, k, step, step > jumpFault[j] ? 2 : 1);
      else if (runStart[JUMP * n + j] >= 0) close(JUMP * n + j, k - 1);
      // speed-over: backward finite difference |Δq|/Δt against maxVelocity (compared as |Δq| > v·Δt)
      if (step > speedCaution[j] * dt) note(SPEED * n + j, k, step / dt, step > speedFault[j] * dt ? 2 : 1);
      else if (runStart[SPEED * n + j] >= 0) close(SPEED * n + j, k - 1);
    }
  }
  for (let slot = 0; slot < 3 * n; slot++) if (runStart[slot] >= 0) close(slot, count - 1);
  found.sort(
    (a, b) => a.sample - b.sample || a.joint - b.joint || findingKinds.indexOf(a.kind) - findingKinds.indexOf(b.kind),
  );
  const verdict: Verdict = faults > 0 ? "fault" : cautions > 0 ? "caution" : "pass";
  const spanS = count > 1 ? timeS[count - 1] - timeS[0] : 0;
  return { verdict, samples: count, rateHz: spanS > 0 ? (count - 1) / spanS : 0, findings: found };
}

/**
 * Builds one stream finding with its message: a run of `kind` (RANGE, JUMP, SPEED) on joint j from
 * `sample` at `time` to `endSample` at `endTime`, its worst `value`. Shared by the streaming scan
 * (scan-stream.ts), which holds no samples and so passes the end time itself.
 */
export function streamFinding(
  arm: Arm,
  kind: number,
  j: number,
  sample: number,
  endSample: number,
  time: number,
  endTime: number,
  value: number,
  severity: Severity,
): StreamFinding {
  const joint = arm.joints[j];
  const v = joint.maxVelocity;
  const line = lineOfSample(sample);
  const endLine = lineOfSample(endSample);
  const span =
    endSample > sample
      ? `lines ${line}–${endLine} (t = ${formatNumber(time)}–${formatNumber(endTime)} s)`
      : `line ${line} (t = ${formatNumber(time)} s)`;
  const head = `${jointLabel(joint)[0].toUpperCase()}${jointLabel(joint).slice(1)}, ${span}`;
  const fix = "Repair the recording (rate-limit it) before streaming it, or slow its playback.";
  const where = { severity, joint: j, sample, endSample, line, endLine, time, value };
  if (kind === RANGE) {
    return {
      ...where,
      kind: "range",
      limit: value > joint.max ? joint.max : joint.min,
      message:
        `${head}: position ${formatQuantity(value, joint, "position")} is outside its travel ` +
        `${formatQuantity(joint.min, joint, "position")} to ${formatQuantity(joint.max, joint, "position")}; the controller would refuse ` +
        `these targets. Repair clamps them into the travel.`,
    };
  }
  if (kind === JUMP) {
    const limit = v / arm.controlRateHz;
    const outcome =
      severity === "fault"
        ? "the controller would stop with a jump-too-far fault"
        : "the controller would follow, close to its jump limit";
    return {
      ...where,
      kind: "jump",
      limit,
      message:
        `${head}: steps of up to ${formatQuantity(value, joint, "step")} per sample, ` +
        `${limitLevel(severity, arm.cautionRatio, `${formatQuantity(limit, joint, "step")} per control period`)} ` +
        `(${formatQuantity(v, joint, "velocity")} at ${formatNumber(arm.controlRateHz)} Hz); streamed as instant moves, ${outcome}. ${fix}`,
    };
  }
  return {
    ...where,
    kind: "speed-over",
    limit: v,
    message:
      `${head}: speed up to ${formatQuantity(value, joint, "velocity")} between samples, ` +
      `${limitLevel(severity, arm.cautionRatio, formatQuantity(v, joint, "velocity"))}. ${fix}`,
  };
}
