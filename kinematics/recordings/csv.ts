/**
 * Recording CSV: a header `t,<joint names…>` (`t` in seconds), then one row per sample, comma-separated
 * decimal numbers (rad or m). Parsed from bytes by hand into Float64Arrays (a 50 MB log in well under a
 * second, no string per value); blank lines are allowed only at the end; `\r\n` line ends are accepted.
 *
 * Number parsing: digits are gathered into an integer mantissa m and a decimal exponent e; when m is below
 * 2^53 and |e| ≤ 22, m and 10^|e| are both exact doubles and one correctly rounded
 * multiplication or division gives the correctly rounded value (Clinger, "How to Read Floating Point
 * Numbers Accurately", 1990 — the fast path). Anything else goes through `Number()`.
 *
 * @module
 */
import { headerLine, problemList, type Recording, type RecordingProblem } from "./recording";

/** Result of {@link parseRecordingCsv}: the recording, or `null` with the problems that refused it. */
export interface CsvResult {
  recording: Recording | null;
  problems: RecordingProblem[];
}

/** Options for {@link parseRecordingCsv}. */
export interface CsvOptions {
  /** Most problems to list (default 20); the rest are counted in one last line. */
  maxProblems?: number;
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

/** Parses a recording CSV from its bytes (UTF-8). */
export function parseRecordingCsv(input: Uint8Array, options: CsvOptions = {}): CsvResult {
  // a plain Uint8Array ending in a line feed: the byte loops below then never read past the end
  // (out-of-bounds reads would make them slow), and Node Buffers share one code path with browser arrays
  let bytes = new Uint8Array(input.buffer, input.byteOffset, input.byteLength);
  if (bytes.length > 0 && bytes[bytes.length - 1] !== LF) {
    const copy = new Uint8Array(bytes.length + 1);
    copy.set(bytes);
    copy[bytes.length] = LF;
    bytes = copy;
  }
  const list = problemList(options.maxProblems ?? 20);
  const add = (line: number, column: string | null, message: string) => list.add({ line, column, message });
  const length = bytes.length;
  let pos = 0;
  if (length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) pos = 3; // UTF-8 byte-order mark
  let headerEnd = pos;
  while (headerEnd < length && bytes[headerEnd] !== LF) headerEnd++;
  const header = textDecoder
    .decode(bytes.subarray(pos, headerEnd))
    .replace(/\r$/, "")
    .split(",")
    .map((name) => name.trim());
  if (header.length < 2 || header[0] !== "t") {
    add(headerLine, null, 'header must be "t" followed by one column per joint, e.g. "t,base,shoulder"');
    return { recording: null, problems: list.done() };
  }
  const names = header.slice(1);
  names.forEach((name, j) => {
    if (name === "") add(headerLine, null, `column ${j + 2} has no name`);
  });
  const n = names.length;
  const columns = n + 1;
  pos = headerEnd + 1;

  // capacity from the first data line's length; grown by doubling if the estimate is short
  let firstEnd = pos;
  while (firstEnd < length && bytes[firstEnd] !== LF) firstEnd++;
  let capacity = Math.max(16, Math.ceil(((length - pos) / Math.max(1, firstEnd - pos + 1)) * 1.05) + 1);
  let timeS = new Float64Array(capacity);
  let position = new Float64Array(capacity * n);

  let row = 0;
  // the file's line of the current row: the header is line 1; blank lines count too
  let line = headerLine + 1;
  let blankLine = 0;
  while (pos < length) {
    // a blank line ends the data; only blank lines may follow it
    if (bytes[pos] === LF || (bytes[pos] === CR && (pos + 1 >= length || bytes[pos + 1] === LF))) {
      if (blankLine === 0) blankLine = line;
      line++;
      pos += bytes[pos] === CR ? 2 : 1;
      continue;
    }
    if (blankLine !== 0) {
      add(blankLine, null, "blank line inside the data (blank lines are allowed only at the end)");
      blankLine = 0;
    }
    if (row === capacity) {
      capacity *= 2;
      const t = new Float64Array(capacity);
      t.set(timeS);
      timeS = t;
      const p = new Float64Array(capacity * n);
      p.set(position);
      position = p;
    }
    let col = 0;
    let bad = false;
    // one row: fields separated by commas up to the end of the line
    for (;;) {
      const fieldStart = pos;
      let c = bytes[pos];
      while (c === SPACE || c === TAB) c = bytes[++pos];
      let negative = false;
      if (c === MINUS || c === PLUS) {
        negative = c === MINUS;
        c = bytes[++pos];
      }
      // digits accumulate into the mantissa without counting; the digit and exponent counts come
      // from the positions, so each digit costs one multiply-add and one compare
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
      const endOfField = pos >= length || c === COMMA || c === LF || c === CR;
      if (!endOfField) {
        valid = false;
        while (pos < length && bytes[pos] !== COMMA && bytes[pos] !== LF && bytes[pos] !== CR) pos++;
      }
      let value: number;
      if (!valid) {
        value = NaN;
      } else if (mantissa < twoTo53 && exponent >= -22 && exponent <= 22) {
        // Clinger's fast path: exact mantissa, exact power of ten, one rounding. The running
        // mantissa is exact while it stays below 2^53 (every partial value is then an exact
        // integer), and once a partial value reaches 2^53 rounding keeps it there or above.
        value = exponent < 0 ? mantissa / powersOfTen[-exponent] : mantissa * powersOfTen[exponent];
        if (negative) value = -value;
      } else {
        value = Number(textDecoder.decode(bytes.subarray(fieldStart, numberEnd)));
      }
      if (!valid || !Number.isFinite(value)) {
        if (!bad) {
          const text = textDecoder.decode(bytes.subarray(fieldStart, pos)).trim();
          add(
            line,
            col === 0 ? "t" : (names[col - 1] ?? null),
            `not a number (${text === "" ? "empty" : JSON.stringify(text)})`,
          );
        }
        bad = true;
      }
      if (col === 0) timeS[row] = value;
      else if (col <= n) position[row * n + col - 1] = value;
      col++;
      if (pos < length && bytes[pos] === COMMA) {
        pos++;
        continue;
      }
      // end of line (or file)
      if (pos < length && bytes[pos] === CR) pos++;
      if (pos < length && bytes[pos] === LF) pos++;
      break;
    }
    if (col !== columns) add(line, null, `has ${col} values; the header has ${columns} columns`);
    row++;
    line++;
  }
  const problems = list.done();
  if (problems.length > 0) return { recording: null, problems };
  return {
    recording: {
      names,
      jointCount: n,
      count: row,
      timeS: timeS.subarray(0, row),
      position: position.subarray(0, row * n),
    },
    problems,
  };
}

/**
 * Writes a recording as CSV text (header `t,<names>`, shortest round-trip decimals, `\n` line ends).
 */
export function formatRecordingCsv(recording: Recording): string {
  const { count, jointCount: n, timeS, position, names } = recording;
  const chunks: string[] = [`t,${names.join(",")}\n`];
  let lines: string[] = [];
  for (let k = 0; k < count; k++) {
    let line = String(timeS[k]);
    for (let j = 0; j < n; j++) line += "," + String(position[k * n + j]);
    lines.push(line);
    if (lines.length === 8192) {
      chunks.push(lines.join("\n") + "\n");
      lines = [];
    }
  }
  if (lines.length > 0) chunks.push(lines.join("\n") + "\n");
  return chunks.join("");
}

/** A recording problem as one line: `line 19, column "elbow": not a number ("abc")`. */
export function describeRecordingProblem(problem: RecordingProblem): string {
  if (problem.line === null) return `(more): ${problem.message}`;
  const column = problem.column ? `, column "${problem.column}"` : "";
  return `line ${problem.line}${column}: ${problem.message}`;
}
