/**
 * The recording scan of {@link scanRecording}, fed as byte chunks: for an upload that is streamed to
 * storage and must never be held whole. Chunks may split the file anywhere (inside a UTF-8 sequence,
 * between a CR and its LF); the result is the whole-file scan's — the same problems with the same
 * lines and columns, the same counts, joint count, duration and stream-check findings (capped the
 * same way) — while the state is one line, one previous sample and the open runs per joint, never
 * the samples.
 *
 * Two parts of the whole-file scan cannot be done in one pass in bounded memory, and are bounded
 * another way, never by guessing:
 * - **Lines longer than `maxLineBytes`** (1 MiB by default; a recording's lines are a few hundred
 *   bytes) are refused with their own problem instead of being read: their text would have to be
 *   held whole. Such a file is refused either way, never passed.
 * - **Gaps**: a step is a gap when it is longer than 10 × the mean step (see `validateRecording`),
 *   which is known only at the end. The longest `maxGapCandidates` steps are kept with their lines;
 *   when a step that was not kept turns out to be a gap (more gaps than candidates), the result is
 *   `{ rescan: { maxGapS } }`: the file is refused either way, and feeding it again to a scanner
 *   made with that `maxGapS` gives its exact problem list in one more pass.
 *
 * The CSV reading below is the one of `csv.ts`, line by line; the stream check the one of
 * `stream-check.ts`, sample by sample. A property test (tests/unit/kinematics/recordings/scan-stream.test.ts)
 * pins the results equal on generated files split at random.
 *
 * @module
 */
import type { Arm } from "../plan/arm";
import { findingKinds, limitTolerance, type Verdict } from "../check/report";
import { formatNumber } from "../check/wording";
import { alignRecording, headerLine, lineOfSample, problemList, type RecordingProblem } from "./recording";
import type { RefusedRecording, ScanOptions } from "./scan";
import { JUMP, RANGE, SPEED, streamFinding, type StreamFinding, type StreamReport } from "./stream-check";

/** Options for {@link createRecordingScanner}: those of {@link scanRecording} and two bounds. */
export interface StreamScanOptions extends ScanOptions {
  /** Longest line read (bytes, without its line end); a longer one is a problem. Default 1 MiB. */
  maxLineBytes?: number;
  /** Longest steps kept as possible gaps until the mean step is known. Default 4096. */
  maxGapCandidates?: number;
}

/** What a streamed scan keeps of an accepted recording: its shape, not its samples. */
export interface RecordingSummary {
  /** Joint names, in the arm's joint order when scanned with an arm (else in column order). */
  names: string[];
  jointCount: number;
  /** Number of samples. */
  count: number;
  /** Time of the first sample, s (0 without samples). */
  startTimeS: number;
  /** Time of the last sample minus that of the first, s (0 without samples). */
  durationS: number;
}

/** An accepted recording: its summary and stream check (`null` when scanned without an arm). */
export interface StreamScannedRecording<R> {
  summary: RecordingSummary;
  report: R;
}

/**
 * A refused file whose gap problems cannot be listed from one pass (see the module note): feed the
 * same bytes to a scanner made with these options for its exact problems.
 */
export interface RescanNeeded {
  rescan: { maxGapS: number };
}

/** The result of a streamed scan. */
export type StreamScanResult<R> = StreamScannedRecording<R> | RefusedRecording | RescanNeeded;

/** A push-style recording scanner: `push` the file's bytes in order, then `end` once. */
export interface RecordingScanner<R> {
  push(chunk: Uint8Array): void;
  end(): StreamScanResult<R>;
}

const COMMA = 44;
const LF = 10;
const CR = 13;
const SPACE = 32;
const TAB = 9;
const MINUS = 45;
const PLUS = 43;
const DOT = 46;
const ZERO = 48;
const NINE = 57;
const LOWER_E = 101;
const UPPER_E = 69;

/** Exact powers of ten 10⁰ … 10²² (every one is an exact double). */
const powersOfTen = Float64Array.from({ length: 23 }, (_, i) => Number(`1e${i}`));
/** 2^53: integers below it are exact doubles. */
const twoTo53 = 9007199254740992;
const textDecoder = new TextDecoder();
/** A lone line feed: the line end given to a row that arrived without one (csv.ts appends one too). */
const emptyRow = new Uint8Array([LF]);

/**
 * A scanner for a recording file fed in chunks, giving {@link scanRecording}'s result (see the module
 * note for the two bounds). With `arm` `null` the file is parsed and validated only, and `report` is `null`.
 */
export function createRecordingScanner(arm: Arm, options?: StreamScanOptions): RecordingScanner<StreamReport>;
export function createRecordingScanner(arm: null, options?: StreamScanOptions): RecordingScanner<null>;
export function createRecordingScanner(
  arm: Arm | null,
  options: StreamScanOptions = {},
): RecordingScanner<StreamReport | null> {
  return new Scanner(arm, options);
}

class Scanner implements RecordingScanner<StreamReport | null> {
  private readonly arm: Arm | null;
  private readonly maxProblems: number;
  private readonly maxLineBytes: number;
  private readonly givenGapS: number | undefined;
  private ended = false;

  // header
  private header: Uint8Array[] = [];
  private headerBytes = 0;
  private inHeader = true;
  /** A problem that ends the scan at the header (as csv.ts returns at once), or null. */
  private headerRefusal: RecordingProblem | null = null;

  // lines and rows (csv.ts)
  private names: string[] = [];
  private n = 0;
  private columns = 0;
  private parse = problemList(20);
  private parseFailed = false;
  private line = headerLine + 1;
  private blankLine = 0;
  private row = 0;
  /** Bytes of a row split across chunks (with room for its line end). */
  private carry = new Uint8Array(256);
  private carryLength = 0;
  /** The row being carried is longer than `maxLineBytes`: skipped to its end, then one problem. */
  private carryTooLong = false;
  /** The last chunk ended on a CR that ended a row; an LF that follows belongs to it. */
  private swallowLF = false;
  /** The last chunk ended on a CR at the start of a row: blank if an LF follows, else an empty row. */
  private pendingCR = false;
  private values = new Float64Array(0);

  // alignment: column (0-based among the joints) of each of the recording's joints
  private alignProblems: RecordingProblem[] = [];
  private order = new Int32Array(0);
  private alignedNames: string[] = [];

  // validation (recording.ts)
  private count = 0;
  private firstT = 0;
  private prevT = 0;
  private timeProblems: RecordingProblem[] = [];
  private timeProblemCount = 0;
  private gapDt = new Float64Array(0);
  private gapK = new Float64Array(0);
  private gapSize = 0;
  private readonly gapCapacity: number;
  /** Longest step dropped from the candidates (−∞ when none was dropped). */
  private droppedDt = -Infinity;

  // stream check (stream-check.ts)
  private prevQ = new Float64Array(0);
  private curQ = new Float64Array(0);
  private jumpFault = new Float64Array(0);
  private jumpCaution = new Float64Array(0);
  private speedFault = new Float64Array(0);
  private speedCaution = new Float64Array(0);
  private min = new Float64Array(0);
  private max = new Float64Array(0);
  private runStart = new Int32Array(0);
  private runTime = new Float64Array(0);
  private runWorst = new Float64Array(0);
  private runLevel = new Uint8Array(0);
  private openRuns = new Uint8Array(0);
  private found: StreamFinding[] = [];
  private faults = 0;
  private cautions = 0;
  private readonly maxFindings: number;

  constructor(arm: Arm | null, options: StreamScanOptions) {
    this.arm = arm;
    this.maxProblems = options.maxProblems ?? 20;
    this.maxLineBytes = options.maxLineBytes ?? 1024 * 1024;
    this.givenGapS = options.maxGapS;
    this.maxFindings = options.maxFindings ?? Infinity;
    this.gapCapacity = Math.max(1, options.maxGapCandidates ?? 4096);
    this.parse = problemList(this.maxProblems);
  }

  push(input: Uint8Array): void {
    if (this.ended) throw new Error("push after end");
    // a plain Uint8Array view (Node Buffers then share the byte loops' one code path, as in csv.ts)
    const chunk = new Uint8Array(input.buffer, input.byteOffset, input.byteLength);
    let pos = 0;
    if (this.inHeader) {
      const lf = chunk.indexOf(LF);
      const end = lf < 0 ? chunk.length : lf;
      if (this.headerRefusal === null) {
        this.headerBytes += end;
        if (this.headerBytes > this.maxLineBytes + 3) {
          this.headerRefusal = {
            line: headerLine,
            column: null,
            message: `is longer than ${this.maxLineBytes} bytes; a recording's header names its joints in far fewer`,
          };
          this.header = [];
        } else this.header.push(chunk.slice(0, end));
      }
      if (lf < 0) return;
      this.endHeader();
      pos = lf + 1;
    }
    if (this.headerRefusal !== null) return;
    this.lines(chunk, pos);
  }

  /** Reads the data lines of `chunk` from `pos` (the data part of csv.ts's loop, one line at a time). */
  private lines(chunk: Uint8Array, pos: number): void {
    const length = chunk.length;
    let lf = -1;
    let cr = -1;
    while (pos < length) {
      if (this.swallowLF) {
        this.swallowLF = false;
        if (chunk[pos] === LF) {
          pos++;
          continue;
        }
      }
      if (this.pendingCR) {
        this.pendingCR = false;
        if (chunk[pos] === LF) {
          this.blank();
          pos++;
          continue;
        }
        // a CR not followed by an LF at the start of a row: a row with one empty value (as csv.ts reads it)
        this.rowAt(emptyRow, 0, 0);
      }
      if (this.carryLength === 0 && !this.carryTooLong) {
        // at the start of a row: a blank line is an LF or a CR LF
        const c = chunk[pos];
        if (c === LF) {
          this.blank();
          pos++;
          continue;
        }
        if (c === CR) {
          if (pos + 1 >= length) {
            this.pendingCR = true;
            return;
          }
          if (chunk[pos + 1] === LF) {
            this.blank();
            pos += 2;
          } else {
            this.rowAt(emptyRow, 0, 0);
            pos++;
          }
          continue;
        }
      }
      // the row runs to the first CR or LF
      if (lf < pos) {
        lf = chunk.indexOf(LF, pos);
        if (lf < 0) lf = length;
      }
      if (cr < pos) {
        cr = chunk.indexOf(CR, pos);
        if (cr < 0) cr = length;
      }
      const end = lf < cr ? lf : cr;
      if (end >= length) {
        this.carryOn(chunk, pos, length);
        return;
      }
      if (this.carryLength > 0 || this.carryTooLong) {
        this.carryOn(chunk, pos, end);
        if (this.carryTooLong) this.longRow();
        else {
          this.carry[this.carryLength] = LF;
          this.rowAt(this.carry, 0, this.carryLength);
        }
        this.carryLength = 0;
        this.carryTooLong = false;
      } else if (end - pos > this.maxLineBytes) this.longRow();
      else this.rowAt(chunk, pos, end);
      // the line end: LF, CR LF, or a CR alone
      if (chunk[end] === CR) {
        if (end + 1 >= length) {
          this.swallowLF = true;
          return;
        }
        pos = chunk[end + 1] === LF ? end + 2 : end + 1;
      } else pos = end + 1;
    }
  }

  /** Keeps `chunk[from, to)` as part of the row being carried to the next chunk. */
  private carryOn(chunk: Uint8Array, from: number, to: number): void {
    if (this.carryTooLong) return;
    const size = this.carryLength + (to - from);
    if (size > this.maxLineBytes) {
      this.carryTooLong = true;
      this.carryLength = 0;
      this.carry = new Uint8Array(256);
      return;
    }
    if (size + 1 > this.carry.length) {
      const grown = new Uint8Array(Math.max(size + 1, this.carry.length * 2));
      grown.set(this.carry.subarray(0, this.carryLength));
      this.carry = grown;
    }
    this.carry.set(chunk.subarray(from, to), this.carryLength);
    this.carryLength = size;
  }

  /** The header line, as csv.ts reads it: byte-order mark, `\r` at its end, `t` then the joint names. */
  private endHeader(): void {
    this.inHeader = false;
    if (this.headerRefusal !== null) return;
    const bytes = new Uint8Array(this.headerBytes);
    let at = 0;
    for (const part of this.header) {
      bytes.set(part, at);
      at += part.length;
    }
    this.header = [];
    const start = bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
    const header = textDecoder
      .decode(bytes.subarray(start))
      .replace(/\r$/, "")
      .split(",")
      .map((name) => name.trim());
    if (header.length < 2 || header[0] !== "t") {
      this.headerRefusal = {
        line: headerLine,
        column: null,
        message: 'header must be "t" followed by one column per joint, e.g. "t,base,shoulder"',
      };
      return;
    }
    const names = header.slice(1);
    names.forEach((name, j) => {
      if (name === "") this.problem(headerLine, null, `column ${j + 2} has no name`);
    });
    this.names = names;
    const n = names.length;
    this.n = n;
    this.columns = n + 1;
    this.values = new Float64Array(this.columns);
    this.prevQ = new Float64Array(n);
    this.curQ = new Float64Array(n);
    this.order = Int32Array.from({ length: n }, (_, j) => j);
    this.alignedNames = names;
    const arm = this.arm;
    if (arm) {
      // the problems exactly as alignRecording gives them (it reads only the names)
      const aligned = alignRecording(arm, {
        names,
        jointCount: n,
        count: 0,
        timeS: new Float64Array(0),
        position: new Float64Array(0),
      });
      this.alignProblems = aligned.problems;
      if (aligned.problems.length === 0) {
        // every joint has one column and every column is a joint: n equals the arm's joint count
        this.order = Int32Array.from(arm.joints, (joint) => names.indexOf(joint.name));
        this.alignedNames = arm.joints.map((joint) => joint.name);
        this.startStreamCheck(arm);
      }
    }
    this.gapDt = new Float64Array(this.givenGapS === undefined ? this.gapCapacity : 0);
    this.gapK = new Float64Array(this.gapDt.length);
  }

  private problem(line: number, column: string | null, message: string): void {
    this.parseFailed = true;
    this.parse.add({ line, column, message });
  }

  private blank(): void {
    if (this.blankLine === 0) this.blankLine = this.line;
    this.line++;
  }

  /** A row longer than `maxLineBytes`: refused without reading it. */
  private longRow(): void {
    if (this.blankLine !== 0) {
      this.problem(this.blankLine, null, "blank line inside the data (blank lines are allowed only at the end)");
      this.blankLine = 0;
    }
    this.problem(this.line, null, `is longer than ${this.maxLineBytes} bytes; not read`);
    this.row++;
    this.line++;
  }

  /**
   * One data row `bytes[start, end)` (`bytes[end]` is its CR or LF): the fields of csv.ts's row loop,
   * then the sample's validation and stream check while the file has no problem.
   */
  private rowAt(bytes: Uint8Array, start: number, end: number): void {
    if (this.blankLine !== 0) {
      this.problem(this.blankLine, null, "blank line inside the data (blank lines are allowed only at the end)");
      this.blankLine = 0;
    }
    const n = this.n;
    const values = this.values;
    const line = this.line;
    let pos = start;
    let col = 0;
    let bad = false;
    for (;;) {
      const fieldStart = pos;
      let c = bytes[pos];
      while (c === SPACE || c === TAB) c = bytes[++pos];
      let negative = false;
      if (c === MINUS || c === PLUS) {
        negative = c === MINUS;
        c = bytes[++pos];
      }
      let mantissa = 0;
      let exponent = 0;
      const intStart = pos;
      while (c >= ZERO && c <= NINE) {
        mantissa = mantissa * 10 + (c - ZERO);
        c = bytes[++pos];
      }
      let digits = pos - intStart;
      if (c === DOT) {
        const fracStart = ++pos;
        c = bytes[pos];
        while (c >= ZERO && c <= NINE) {
          mantissa = mantissa * 10 + (c - ZERO);
          c = bytes[++pos];
        }
        digits += pos - fracStart;
        exponent = fracStart - pos;
      }
      let valid = digits > 0;
      if (valid && (c === LOWER_E || c === UPPER_E)) {
        c = bytes[++pos];
        let expNegative = false;
        if (c === MINUS || c === PLUS) {
          expNegative = c === MINUS;
          c = bytes[++pos];
        }
        let e = 0;
        let expDigits = 0;
        while (c >= ZERO && c <= NINE) {
          if (e < 100000) e = e * 10 + (c - ZERO);
          expDigits++;
          c = bytes[++pos];
        }
        if (expDigits === 0) valid = false;
        exponent += expNegative ? -e : e;
      }
      const numberEnd = pos;
      while (c === SPACE || c === TAB) c = bytes[++pos];
      if (pos < end && c !== COMMA) {
        valid = false;
        while (pos < end && bytes[pos] !== COMMA) pos++;
      }
      let value: number;
      if (!valid) {
        value = NaN;
      } else if (mantissa < twoTo53 && exponent >= -22 && exponent <= 22) {
        // Clinger's fast path, as in csv.ts
        value = exponent < 0 ? mantissa / powersOfTen[-exponent] : mantissa * powersOfTen[exponent];
        if (negative) value = -value;
      } else {
        value = Number(textDecoder.decode(bytes.subarray(fieldStart, numberEnd)));
      }
      if (!valid || !Number.isFinite(value)) {
        if (!bad) {
          const text = textDecoder.decode(bytes.subarray(fieldStart, pos)).trim();
          this.problem(
            line,
            col === 0 ? "t" : (this.names[col - 1] ?? null),
            `not a number (${text === "" ? "empty" : JSON.stringify(text)})`,
          );
        }
        bad = true;
      }
      if (col <= n) values[col] = value;
      col++;
      if (pos < end) {
        pos++; // the comma
        continue;
      }
      break;
    }
    if (col !== this.columns) this.problem(line, null, `has ${col} values; the header has ${this.columns} columns`);
    const k = this.row;
    this.row++;
    this.line++;
    if (!this.parseFailed && this.alignProblems.length === 0) this.sample(k, values);
  }

  /** Sample k of a file without problems so far: its time checks (recording.ts) and stream check. */
  private sample(k: number, values: Float64Array): void {
    const t = values[0];
    const n = this.n;
    const order = this.order;
    const q = this.curQ;
    for (let j = 0; j < n; j++) q[j] = values[1 + order[j]];
    this.count = k + 1;
    // every value is finite here: a value that is not is a problem of the CSV reading above
    if (k === 0) this.firstT = t;
    else {
      const prev = this.prevT;
      const dt = t - prev;
      if (!(dt > 0)) {
        this.timeProblem({
          line: lineOfSample(k),
          column: "t",
          message: `time ${t} s is not after the previous line's ${prev} s`,
        });
      } else if (this.givenGapS !== undefined) {
        if (dt > this.givenGapS) this.timeProblem(gapProblem(k, dt, this.givenGapS));
      } else this.gapCandidate(dt, k);
    }
    if (this.runStart.length > 0) this.checkStep(k, t, k > 0 ? t - this.prevT : 0);
    this.prevT = t;
    this.curQ = this.prevQ;
    this.prevQ = q;
  }

  private timeProblem(problem: RecordingProblem): void {
    if (this.timeProblems.length < this.maxProblems) this.timeProblems.push(problem);
    this.timeProblemCount++;
  }

  /** Keeps the `gapCapacity` longest steps (a min-heap on dt); remembers the longest one dropped. */
  private gapCandidate(dt: number, k: number): void {
    const heapDt = this.gapDt;
    const heapK = this.gapK;
    if (this.gapSize < this.gapCapacity) {
      let i = this.gapSize++;
      while (i > 0) {
        const parent = (i - 1) >> 1;
        if (heapDt[parent] <= dt) break;
        heapDt[i] = heapDt[parent];
        heapK[i] = heapK[parent];
        i = parent;
      }
      heapDt[i] = dt;
      heapK[i] = k;
      return;
    }
    if (dt <= heapDt[0]) {
      if (dt > this.droppedDt) this.droppedDt = dt;
      return;
    }
    if (heapDt[0] > this.droppedDt) this.droppedDt = heapDt[0];
    // replace the root and sift down
    const size = this.gapSize;
    let i = 0;
    for (;;) {
      const left = 2 * i + 1;
      if (left >= size) break;
      const right = left + 1;
      const child = right < size && heapDt[right] < heapDt[left] ? right : left;
      if (heapDt[child] >= dt) break;
      heapDt[i] = heapDt[child];
      heapK[i] = heapK[child];
      i = child;
    }
    heapDt[i] = dt;
    heapK[i] = k;
  }

  private startStreamCheck(arm: Arm): void {
    const n = this.n;
    const joints = arm.joints;
    const ratio = arm.cautionRatio;
    const tol = 1 + limitTolerance;
    this.jumpFault = new Float64Array(n);
    this.jumpCaution = new Float64Array(n);
    this.speedFault = new Float64Array(n);
    this.speedCaution = new Float64Array(n);
    this.min = new Float64Array(n);
    this.max = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      const v = joints[j].maxVelocity;
      this.jumpFault[j] = (v / arm.controlRateHz) * tol; // step limit: one control period at maxVelocity
      this.jumpCaution[j] = ((ratio * v) / arm.controlRateHz) * tol;
      this.speedFault[j] = v * tol;
      this.speedCaution[j] = ratio * v * tol;
      this.min[j] = joints[j].min;
      this.max[j] = joints[j].max;
    }
    this.runStart = new Int32Array(3 * n).fill(-1);
    this.runTime = new Float64Array(3 * n);
    this.runWorst = new Float64Array(3 * n);
    this.runLevel = new Uint8Array(3 * n);
    this.openRuns = new Uint8Array(n);
  }

  /** Step k of the stream check (the loop body of stream-check.ts); `dt` is 0 at k = 0. */
  private checkStep(k: number, t: number, dt: number): void {
    const n = this.n;
    const q = this.curQ;
    const prev = this.prevQ;
    const { min, max, jumpCaution, jumpFault, speedCaution, speedFault, runStart, openRuns } = this;
    for (let j = 0; j < n; j++) {
      const qj = q[j];
      if (k > 0 && openRuns[j] === 0 && qj >= min[j] && qj <= max[j]) {
        // fast path: a quiet step (below both caution thresholds) with no run to close
        const quiet = Math.abs(qj - prev[j]);
        if (quiet <= jumpCaution[j] && quiet <= speedCaution[j] * dt) continue;
      }
      if (qj < min[j] || qj > max[j]) this.note(RANGE * n + j, k, t, qj, 2);
      else if (runStart[RANGE * n + j] >= 0) this.close(RANGE * n + j, k - 1, this.prevT);
      if (k === 0) continue;
      const step = Math.abs(qj - prev[j]);
      if (step > jumpCaution[j]) this.note(JUMP * n + j, k, t, step, step > jumpFault[j] ? 2 : 1);
      else if (runStart[JUMP * n + j] >= 0) this.close(JUMP * n + j, k - 1, this.prevT);
      if (step > speedCaution[j] * dt) this.note(SPEED * n + j, k, t, step / dt, step > speedFault[j] * dt ? 2 : 1);
      else if (runStart[SPEED * n + j] >= 0) this.close(SPEED * n + j, k - 1, this.prevT);
    }
  }

  private note(slot: number, k: number, t: number, value: number, level: number): void {
    if (this.runStart[slot] < 0) {
      this.openRuns[slot % this.n] = 1;
      this.runStart[slot] = k;
      this.runTime[slot] = t;
      this.runWorst[slot] = value;
      this.runLevel[slot] = level;
    } else {
      if (value > this.runWorst[slot]) this.runWorst[slot] = value;
      if (level > this.runLevel[slot]) this.runLevel[slot] = level;
    }
  }

  /** Closes the run of `slot` at `endSample` (whose time is `endTime`), keeping it while under maxFindings. */
  private close(slot: number, endSample: number, endTime: number): void {
    const n = this.n;
    const kind = (slot / n) | 0;
    const j = slot - kind * n;
    const level = this.runLevel[slot];
    if (level === 2) this.faults++;
    else this.cautions++;
    if (this.found.length < this.maxFindings) {
      this.found.push(
        streamFinding(
          this.arm!,
          kind,
          j,
          this.runStart[slot],
          endSample,
          this.runTime[slot],
          endTime,
          this.runWorst[slot],
          level === 2 ? "fault" : "caution",
        ),
      );
    }
    const runStart = this.runStart;
    runStart[slot] = -1;
    this.openRuns[j] = runStart[j] >= 0 || runStart[n + j] >= 0 || runStart[2 * n + j] >= 0 ? 1 : 0;
  }

  end(): StreamScanResult<StreamReport | null> {
    if (this.ended) throw new Error("end called twice");
    if (this.inHeader) this.endHeader();
    this.ended = true;
    if (this.headerRefusal !== null) return { problems: [this.headerRefusal] };
    // what csv.ts reads once it has appended a missing final line feed
    if (this.pendingCR) this.blank();
    else if (this.carryTooLong) this.longRow();
    else if (this.carryLength > 0) {
      this.carry[this.carryLength] = LF;
      this.rowAt(this.carry, 0, this.carryLength);
    }
    const parsed = this.parse.done();
    if (parsed.length > 0) return { problems: parsed };
    if (this.alignProblems.length > 0) return { problems: this.alignProblems };

    // validateRecording's problems, in its order
    const arm = this.arm;
    const count = this.count;
    const spanS = count > 1 ? this.prevT - this.firstT : 0;
    const meanStepS = count > 1 ? spanS / (count - 1) : 0;
    const maxGapS = this.givenGapS ?? Math.max(10 * meanStepS, arm ? 10 / arm.controlRateHz : 0);
    if (this.droppedDt > maxGapS) return { rescan: { maxGapS } };
    const list = problemList(this.maxProblems);
    if (arm && this.n !== arm.joints.length) {
      list.add({
        line: headerLine,
        column: null,
        message: `has ${this.n} joint columns; the arm has ${arm.joints.length} joints`,
      });
    }
    if (count === 0) list.add({ line: headerLine, column: null, message: "has no data rows" });
    const gaps: { k: number; dt: number }[] = [];
    for (let i = 0; i < this.gapSize; i++)
      if (this.gapDt[i] > maxGapS) gaps.push({ k: this.gapK[i], dt: this.gapDt[i] });
    gaps.sort((a, b) => a.k - b.k);
    // the two lists merged by line: every gap is known, and the time problems past the first
    // maxProblems come after all the ones kept
    const time = this.timeProblems;
    let a = 0;
    let b = 0;
    let listed = 0;
    while (listed < this.maxProblems && (a < time.length || b < gaps.length)) {
      if (b >= gaps.length || (a < time.length && (time[a].line as number) < lineOfSample(gaps[b].k)))
        list.add(time[a++]);
      else {
        list.add(gapProblem(gaps[b].k, gaps[b].dt, maxGapS));
        b++;
      }
      listed++;
    }
    const more = this.timeProblemCount + gaps.length - listed;
    const counted: RecordingProblem = { line: null, column: null, message: "" };
    for (let i = 0; i < more; i++) list.add(counted);
    const invalid = list.done();
    if (invalid.length > 0) return { problems: invalid };

    const summary: RecordingSummary = {
      names: this.alignedNames,
      jointCount: this.n,
      count,
      startTimeS: count > 0 ? this.firstT : 0,
      durationS: count > 0 ? this.prevT - this.firstT : 0,
    };
    if (!arm) return { summary, report: null };
    for (let slot = 0; slot < 3 * this.n; slot++) if (this.runStart[slot] >= 0) this.close(slot, count - 1, this.prevT);
    const found = this.found;
    found.sort(
      (x, y) => x.sample - y.sample || x.joint - y.joint || findingKinds.indexOf(x.kind) - findingKinds.indexOf(y.kind),
    );
    const verdict: Verdict = this.faults > 0 ? "fault" : this.cautions > 0 ? "caution" : "pass";
    return {
      summary,
      report: { verdict, samples: count, rateHz: spanS > 0 ? (count - 1) / spanS : 0, findings: found },
    };
  }
}

function gapProblem(k: number, dt: number, maxGapS: number): RecordingProblem {
  return {
    line: lineOfSample(k),
    column: "t",
    message: `gap of ${formatNumber(dt)} s after the previous line (longer than ${formatNumber(maxGapS)} s)`,
  };
}
