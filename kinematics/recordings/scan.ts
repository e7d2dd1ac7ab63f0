/**
 * The recording scan: the one pipeline the command line, the API and the recordings page run on an
 * uploaded file — parse the CSV, put its columns in the arm's joint order, check its times and
 * values, and stream-check it. A file that fails any step is refused with its problems (named by
 * the file's lines) and never reaches the stream check, so no verdict is given for a file that could
 * not be read whole.
 *
 * @module
 */
import type { Arm } from "../plan/arm";
import { parseRecordingCsv } from "./csv";
import { alignRecording, validateRecording, type Recording, type RecordingProblem } from "./recording";
import { streamCheck, type StreamReport } from "./stream-check";

/** Options for {@link scanRecording}. */
export interface ScanOptions {
  /** Most problems to list (default 20); the rest are counted in one last line. */
  maxProblems?: number;
  /** Most findings to keep in the report (default: all); the verdict still counts every step. */
  maxFindings?: number;
  /** A step longer than this (s) is a gap (see `validateRecording`). */
  maxGapS?: number;
}

/** A scanned recording: in the arm's joint order, with its stream check (`null` when scanned without an arm). */
export interface ScannedRecording<R> {
  recording: Recording;
  report: R;
}

/** A refused recording: its problems, in file order. */
export interface RefusedRecording {
  problems: RecordingProblem[];
}

const encoder = new TextEncoder();

/**
 * Scans a recording file (its bytes, or its text) against an arm: parse → align → validate → stream
 * check. With `arm` `null` (a recording kept without an arm), the file is parsed and validated but not
 * aligned or stream-checked, and `report` is `null`.
 */
export function scanRecording(
  arm: Arm,
  input: Uint8Array | string,
  options?: ScanOptions,
): ScannedRecording<StreamReport> | RefusedRecording;
export function scanRecording(
  arm: null,
  input: Uint8Array | string,
  options?: ScanOptions,
): ScannedRecording<null> | RefusedRecording;
export function scanRecording(
  arm: Arm | null,
  input: Uint8Array | string,
  options: ScanOptions = {},
): ScannedRecording<StreamReport | null> | RefusedRecording {
  const bytes = typeof input === "string" ? encoder.encode(input) : input;
  const parsed = parseRecordingCsv(bytes, { maxProblems: options.maxProblems });
  if (!parsed.recording) return { problems: parsed.problems };
  let recording = parsed.recording;
  if (arm) {
    const aligned = alignRecording(arm, recording);
    if (!aligned.recording) return { problems: aligned.problems };
    recording = aligned.recording;
  }
  const invalid = validateRecording(arm, recording, { maxGapS: options.maxGapS, maxProblems: options.maxProblems });
  if (invalid.length > 0) return { problems: invalid };
  return { recording, report: arm ? streamCheck(arm, recording, { maxFindings: options.maxFindings }) : null };
}
