/**
 * Stream check and repair of a recording (a sampled joint log: times and positions, uneven spacing
 * allowed), as if streamed to the controller with every sample an instant move.
 *
 * Per step from sample k−1 to sample k and joint j, with Δq = qₖ − qₖ₋₁ and Δt = tₖ − tₖ₋₁:
 * - `jump` when |Δq| is above maxVelocity / controlRateHz (the step must fit in one control period —
 *   the jump-too-far fault; common practice), caution above cautionRatio of that;
 * - `speed-over` when the finite-difference speed |Δq| / Δt is above maxVelocity (backward difference),
 *   caution above cautionRatio of it;
 * - `range` when a sample lies outside the joint's travel.
 * A run of consecutive offending steps (or samples, for `range`) of one kind and joint is one finding
 * from `sample` to `endSample`, with the run's worst value and severity.
 *
 * @module
 */
import type { Arm } from "../plan/arm";
import { limitTolerance, type FindingKind, type Severity, type Verdict } from "../check/report";
import { formatNumber, formatPercent, formatQuantity, jointLabel } from "../check/wording";

/** A recording: `timeS[k]` (s) and joint positions `position[k·jointCount + j]` (rad or m). */
export interface Recording {
  /** Joint names, in column order. */
  names: string[];
  jointCount: number;
  /** Number of samples. */
  count: number;
  timeS: Float64Array;
  position: Float64Array;
}

/** The `row` of the summary line that counts problems left off the list. */
export const moreProblemsRow = -2;

/** A problem with a recording's input: `row` is the 0-based data row (−1 for the header, −2 for the "and N more" line). */
export interface RecordingProblem {
  row: number;
  /** Column name, when the problem is about one column. */
  column: string | null;
  message: string;
}

/** One stream-check finding, over the samples `sample`..`endSample` (0-based data rows). */
export interface StreamFinding {
  kind: FindingKind;
  severity: Severity;
  joint: number;
  /** Row of the later sample of the first offending step (or the first offending sample, for `range`). */
  sample: number;
  /** Row of the later sample of the last offending step of the run. */
  endSample: number;
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

/** Options for {@link validateRecording}. */
export interface ValidateOptions {
  /**
   * A step longer than this (s) is a gap. Default: 10 × the recording's mean sample spacing, at least
   * 10 control periods of the arm (a sample lost here and there is not a gap).
   */
  maxGapS?: number;
  /** Most problems to list (default 20); the rest are counted in one last line. */
  maxProblems?: number;
}

/**
 * Checks a recording's times and values: every value a finite number, times strictly increasing,
 * no gap longer than `maxGapS`. Returns the problems with their rows (empty when valid).
 */
export function validateRecording(arm: Arm, recording: Recording, options: ValidateOptions = {}): RecordingProblem[] {
  const { count, jointCount: n, timeS, position, names } = recording;
  const maxProblems = options.maxProblems ?? 20;
  const problems: RecordingProblem[] = [];
  let extra = 0;
  const add = (problem: RecordingProblem) => {
    if (problems.length < maxProblems) problems.push(problem);
    else extra++;
  };
  if (n !== arm.joints.length) {
    add({ row: -1, column: null, message: `has ${n} joint columns; the arm has ${arm.joints.length} joints` });
  }
  if (count === 0) add({ row: -1, column: null, message: "has no data rows" });
  const spanS = count > 1 ? timeS[count - 1] - timeS[0] : 0;
  const meanStepS = count > 1 ? spanS / (count - 1) : 0;
  const maxGapS = options.maxGapS ?? Math.max(10 * meanStepS, 10 / arm.controlRateHz);
  for (let k = 0; k < count; k++) {
    const t = timeS[k];
    if (!Number.isFinite(t)) add({ row: k, column: "t", message: `time is not a finite number (${t})` });
    else if (k > 0 && Number.isFinite(timeS[k - 1])) {
      const dt = t - timeS[k - 1];
      if (!(dt > 0)) add({ row: k, column: "t", message: `time ${t} s is not after the previous row's ${timeS[k - 1]} s` });
      else if (dt > maxGapS) {
        add({ row: k, column: "t", message: `gap of ${formatNumber(dt)} s after the previous row (longer than ${formatNumber(maxGapS)} s)` });
      }
    }
    for (let j = 0; j < n; j++) {
      const q = position[k * n + j];
      if (!Number.isFinite(q)) add({ row: k, column: names[j] ?? null, message: `position is not a finite number (${q})` });
    }
  }
  if (extra > 0) problems.push({ row: moreProblemsRow, column: null, message: `and ${extra} more problems` });
  return problems;
}

/**
 * Puts a recording's columns in the arm's joint order. Every arm joint needs exactly one column of the
 * same name; unknown or missing names are problems (row −1, the header).
 */
export function alignRecording(arm: Arm, recording: Recording): { recording: Recording | null; problems: RecordingProblem[] } {
  const problems: RecordingProblem[] = [];
  const columnOf = new Map<string, number>();
  recording.names.forEach((name, c) => {
    if (columnOf.has(name)) problems.push({ row: -1, column: name, message: "appears twice in the header" });
    else columnOf.set(name, c);
  });
  const armNames = new Set(arm.joints.map((joint) => joint.name));
  for (const name of recording.names) {
    if (!armNames.has(name)) problems.push({ row: -1, column: name, message: `is not a joint of the arm "${arm.name}"` });
  }
  const order = arm.joints.map((joint) => columnOf.get(joint.name) ?? -1);
  arm.joints.forEach((joint, j) => {
    if (order[j] < 0) problems.push({ row: -1, column: joint.name, message: "is a joint of the arm but has no column" });
  });
  if (problems.length > 0) return { recording: null, problems };
  if (order.every((c, j) => c === j)) return { recording, problems };
  const n = arm.joints.length;
  const position = new Float64Array(recording.count * n);
  for (let k = 0; k < recording.count; k++) {
    for (let j = 0; j < n; j++) position[k * n + j] = recording.position[k * recording.jointCount + order[j]];
  }
  return { recording: { ...recording, names: arm.joints.map((joint) => joint.name), position }, problems };
}

const RANGE = 0;
const JUMP = 1;
const SPEED = 2;
const kindNames: FindingKind[] = ["range", "jump", "speed-over"];
const kindOrder = [0, 1, 2];

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
      found.push(streamFinding(arm, kind, j, runStart[slot], endSample, timeS[runStart[slot]], runWorst[slot], level === 2 ? "fault" : "caution", recording));
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
  found.sort((a, b) => a.sample - b.sample || a.joint - b.joint || kindRank(a.kind) - kindRank(b.kind));
  const verdict: Verdict = faults > 0 ? "fault" : cautions > 0 ? "caution" : "pass";
  const spanS = count > 1 ? timeS[count - 1] - timeS[0] : 0;
  return { verdict, samples: count, rateHz: spanS > 0 ? (count - 1) / spanS : 0, findings: found };
}

/** Report order of the stream finding kinds. */
function kindRank(kind: FindingKind): number {
  return kindOrder[kindNames.indexOf(kind)];
}

/** Builds one stream finding with its message. */
function streamFinding(
  arm: Arm,
  kind: number,
  j: number,
  sample: number,
  endSample: number,
  time: number,
  value: number,
  severity: Severity,
  recording: Recording,
): StreamFinding {
  const joint = arm.joints[j];
  const v = joint.maxVelocity;
  const span =
    endSample > sample
      ? `samples ${sample}–${endSample} (t = ${formatNumber(time)}–${formatNumber(recording.timeS[endSample])} s)`
      : `sample ${sample} (t = ${formatNumber(time)} s)`;
  const head = `${jointLabel(joint)[0].toUpperCase()}${jointLabel(joint).slice(1)}, ${span}`;
  const fix = "Repair the recording (rate-limit it) before streaming it, or slow its playback.";
  const near = `above ${formatPercent(arm.cautionRatio)} of`;
  if (kind === RANGE) {
    const limit = value > joint.max ? joint.max : joint.min;
    return {
      kind: "range",
      severity,
      joint: j,
      sample,
      endSample,
      time,
      value,
      limit,
      message:
        `${head}: position ${formatQuantity(value, joint, "position")} is outside its travel ` +
        `${formatQuantity(joint.min, joint, "position")} to ${formatQuantity(joint.max, joint, "position")}; the controller will refuse ` +
        `these targets. Repair clamps them into the travel.`,
    };
  }
  if (kind === JUMP) {
    const limit = v / arm.controlRateHz;
    const outcome = severity === "fault" ? "the controller will stop with a jump-too-far fault" : "the controller will follow, close to its jump limit";
    return {
      kind: "jump",
      severity,
      joint: j,
      sample,
      endSample,
      time,
      value,
      limit,
      message:
        `${head}: steps of up to ${formatQuantity(value, joint, "step")} per sample, ${severity === "fault" ? "above" : near} the ` +
        `${formatQuantity(limit, joint, "step")} the joint can travel in one control period at ${formatQuantity(v, joint, "velocity")}; ` +
        `streamed as instant moves, ${outcome}. ${fix}`,
    };
  }
  return {
    kind: "speed-over",
    severity,
    joint: j,
    sample,
    endSample,
    time,
    value,
    limit: v,
    message:
      `${head}: speed up to ${formatQuantity(value, joint, "velocity")} between samples, ${severity === "fault" ? "above" : near} its limit of ` +
      `${formatQuantity(v, joint, "velocity")}. ${fix}`,
  };
}

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
  /** Row of the largest deviation per joint (−1 when the joint is unchanged). */
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
