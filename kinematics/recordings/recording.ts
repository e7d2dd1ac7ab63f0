/**
 * A recording (a sampled joint log: times and positions, uneven spacing allowed), its input problems,
 * and the two steps that make it fit an arm: putting its columns in the arm's joint order and
 * checking its times and values.
 *
 * Rows are named one way everywhere, on screens, in messages and in the API: the line of the
 * recording's CSV file, counted from 1 with the header as line 1, so data sample k (0-based) is on
 * line k + 2 ({@link lineOfSample}).
 *
 * @module
 */
import type { Arm } from "../plan/arm";
import { formatNumber } from "../check/wording";

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

/** A problem with a recording's input. */
export interface RecordingProblem {
  /**
   * The line of the CSV file it is on (1 is the header, data sample k is on line k + 2), or `null`
   * for the last line of a cut list that counts the problems left off.
   */
  line: number | null;
  /** Column name, when the problem is about one column. */
  column: string | null;
  message: string;
}

/** The line of the recording's CSV file that holds data sample `k` (0-based): the header is line 1. */
export function lineOfSample(k: number): number {
  return k + 2;
}

/** The line of the header. */
export const headerLine = 1;

/** Collects problems up to a limit and counts the rest in one last `null`-line problem. */
export function problemList(maxProblems: number): {
  add: (problem: RecordingProblem) => void;
  done: () => RecordingProblem[];
} {
  const problems: RecordingProblem[] = [];
  let extra = 0;
  return {
    add: (problem) => {
      if (problems.length < maxProblems) problems.push(problem);
      else extra++;
    },
    done: () =>
      extra > 0 ? [...problems, { line: null, column: null, message: `and ${extra} more problems` }] : problems,
  };
}

/** Options for {@link validateRecording}. */
export interface ValidateOptions {
  /**
   * A step longer than this (s) is a gap. Default: 10 × the recording's mean sample spacing, and with
   * an arm at least 10 of its control periods (a sample lost here and there is not a gap).
   */
  maxGapS?: number;
  /** Most problems to list (default 20); the rest are counted in one last line. */
  maxProblems?: number;
}

/**
 * Checks a recording's times and values: every value a finite number, times strictly increasing,
 * no gap longer than `maxGapS`, and with an arm one column per joint. `arm` may be `null` for a
 * recording stored without an arm. Returns the problems with their lines (empty when valid).
 */
export function validateRecording(
  arm: Arm | null,
  recording: Recording,
  options: ValidateOptions = {},
): RecordingProblem[] {
  const { count, jointCount: n, timeS, position, names } = recording;
  const list = problemList(options.maxProblems ?? 20);
  if (arm && n !== arm.joints.length) {
    list.add({
      line: headerLine,
      column: null,
      message: `has ${n} joint columns; the arm has ${arm.joints.length} joints`,
    });
  }
  if (count === 0) list.add({ line: headerLine, column: null, message: "has no data rows" });
  const spanS = count > 1 ? timeS[count - 1] - timeS[0] : 0;
  const meanStepS = count > 1 ? spanS / (count - 1) : 0;
  const maxGapS = options.maxGapS ?? Math.max(10 * meanStepS, arm ? 10 / arm.controlRateHz : 0);
  for (let k = 0; k < count; k++) {
    const t = timeS[k];
    const line = lineOfSample(k);
    if (!Number.isFinite(t)) list.add({ line, column: "t", message: `time is not a finite number (${t})` });
    else if (k > 0 && Number.isFinite(timeS[k - 1])) {
      const dt = t - timeS[k - 1];
      if (!(dt > 0))
        list.add({ line, column: "t", message: `time ${t} s is not after the previous line's ${timeS[k - 1]} s` });
      else if (dt > maxGapS) {
        list.add({
          line,
          column: "t",
          message: `gap of ${formatNumber(dt)} s after the previous line (longer than ${formatNumber(maxGapS)} s)`,
        });
      }
    }
    for (let j = 0; j < n; j++) {
      const q = position[k * n + j];
      if (!Number.isFinite(q))
        list.add({ line, column: names[j] ?? null, message: `position is not a finite number (${q})` });
    }
  }
  return list.done();
}

/**
 * Puts a recording's columns in the arm's joint order. Every arm joint needs exactly one column of the
 * same name; unknown or missing names are problems on the header line.
 */
export function alignRecording(
  arm: Arm,
  recording: Recording,
): { recording: Recording | null; problems: RecordingProblem[] } {
  const problems: RecordingProblem[] = [];
  const columnOf = new Map<string, number>();
  recording.names.forEach((name, c) => {
    if (columnOf.has(name)) problems.push({ line: headerLine, column: name, message: "appears twice in the header" });
    else columnOf.set(name, c);
  });
  const armNames = new Set(arm.joints.map((joint) => joint.name));
  for (const name of recording.names) {
    if (!armNames.has(name))
      problems.push({ line: headerLine, column: name, message: `is not a joint of the arm "${arm.name}"` });
  }
  const order = arm.joints.map((joint) => columnOf.get(joint.name) ?? -1);
  arm.joints.forEach((joint, j) => {
    if (order[j] < 0)
      problems.push({ line: headerLine, column: joint.name, message: "is a joint of the arm but has no column" });
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
