import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  createRecordingScanner,
  scanRecording,
  type Arm,
  type StreamScanOptions,
  type StreamScanResult,
  type StreamReport,
} from "@/kinematics";
import { armOf } from "./helpers";

const encoder = new TextEncoder();

/** Second passes asked for so far (the property test checks it reached that path). */
let rescans = 0;

/** Feeds `bytes` to a scanner in the pieces cut at `cuts`, and once more with the gap limit it asks for. */
function scanInChunks(
  arm: Arm | null,
  bytes: Uint8Array,
  cuts: number[],
  options: StreamScanOptions,
): StreamScanResult<StreamReport | null> {
  const run = (opts: StreamScanOptions) => {
    const scanner = arm ? createRecordingScanner(arm, opts) : createRecordingScanner(null, opts);
    let at = 0;
    for (const cut of [...cuts.filter((c) => c > 0 && c < bytes.length)].sort((a, b) => a - b)) {
      scanner.push(bytes.subarray(at, cut));
      at = cut;
    }
    scanner.push(bytes.subarray(at));
    return scanner.end();
  };
  const first = run(options);
  if (!("rescan" in first)) return first;
  rescans++;
  const second = run({ ...options, maxGapS: first.rescan.maxGapS });
  expect("rescan" in second).toBe(false);
  return second;
}

/** The streamed result beside the whole-file one: equal problems, or equal shape and stream check. */
function expectSameAsWholeFile(
  arm: Arm | null,
  bytes: Uint8Array,
  cuts: number[],
  options: StreamScanOptions,
): "refused" | "accepted" {
  const whole = arm ? scanRecording(arm, bytes, options) : scanRecording(null, bytes, options);
  const streamed = scanInChunks(arm, bytes, cuts, options);
  if ("problems" in whole) {
    expect(streamed).toEqual({ problems: whole.problems });
    return "refused";
  }
  if (!("summary" in streamed)) throw new Error(`refused by the streamed scan: ${JSON.stringify(streamed)}`);
  const { recording } = whole;
  expect(streamed.summary).toEqual({
    names: recording.names,
    jointCount: recording.jointCount,
    count: recording.count,
    startTimeS: recording.count > 0 ? recording.timeS[0] : 0,
    durationS: recording.count > 0 ? recording.timeS[recording.count - 1] - recording.timeS[0] : 0,
  });
  expect(streamed.report).toEqual(whole.report);
  return "accepted";
}

// ---- generated recordings: mostly well-formed, with the faults the stream check finds and the breakages the reader refuses

const headers = [
  "t,base,grip",
  "t,grip,base",
  "t, base ,grip",
  "t,base",
  "t,base,grip,wrist",
  "t,base,base",
  "t,,grip",
  "time,base,grip",
  "t",
  "t,bäse,grip",
];

/** A base step (rad): quiet, near the 0.002 rad jump limit of the 1 kHz arm, over it, or out of travel. */
const baseStep = fc.oneof(
  { weight: 6, arbitrary: fc.double({ min: -0.0015, max: 0.0015, noNaN: true }) },
  { weight: 2, arbitrary: fc.double({ min: -0.0025, max: 0.0025, noNaN: true }) },
  { weight: 1, arbitrary: fc.double({ min: -0.5, max: 0.5, noNaN: true }) },
  { weight: 1, arbitrary: fc.constantFrom(4, -4) },
);
/** A time step (s): 1 ms, a little uneven, a gap, or not forward. */
const timeStep = fc.oneof(
  { weight: 20, arbitrary: fc.constant(0.001) },
  { weight: 4, arbitrary: fc.double({ min: 0.0005, max: 0.002, noNaN: true }) },
  { weight: 1, arbitrary: fc.constantFrom(0.05, 0.2, 1) },
  { weight: 1, arbitrary: fc.constantFrom(0, -0.001) },
);
/** How a number is written. */
const numberStyle = fc.constantFrom("plain", "plain", "plain", "fixed", "exp", "long", "padded", "plus");
/** A field written in place of a number: each is refused by the reader. */
const badField = fc.constantFrom("abc", "", "1e", "1.2.3", "--1", "1e400", "0x10", "\u0000", "1\u00002", "é", " ");
/** What may happen to a line: mostly nothing. */
const lineEdit = fc.oneof(
  { weight: 120, arbitrary: fc.constant<{ kind: "none" }>({ kind: "none" }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("bad" as const), field: fc.nat(3), text: badField }) },
  { weight: 1, arbitrary: fc.constant<{ kind: "drop" }>({ kind: "drop" }) },
  { weight: 1, arbitrary: fc.constant<{ kind: "extra" }>({ kind: "extra" }) },
  { weight: 1, arbitrary: fc.constant<{ kind: "blank" }>({ kind: "blank" }) },
  { weight: 1, arbitrary: fc.constant<{ kind: "blanks" }>({ kind: "blanks" }) },
  { weight: 1, arbitrary: fc.constant<{ kind: "lone-cr" }>({ kind: "lone-cr" }) },
  { weight: 1, arbitrary: fc.constant<{ kind: "cr-first" }>({ kind: "cr-first" }) },
);

const fileArb = fc.record({
  header: fc.oneof(
    { weight: 8, arbitrary: fc.constant(headers[0]) },
    { weight: 4, arbitrary: fc.constantFrom(...headers) },
  ),
  bom: fc.boolean(),
  crlf: fc.boolean(),
  finalNewline: fc.constantFrom("lf", "none", "blank", "blanks", "cr", "blank-cr"),
  // half the files keep every line as generated, so that long files reach the checks after reading too
  edited: fc.boolean(),
  // a 50 ms gap every 25 rows: several gaps, more than the few candidates a test scanner keeps
  gapEvery: fc.constantFrom(0, 0, 0, 25),
  // half the files keep their times moving forward
  forward: fc.boolean(),
  styles: numberStyle,
  rows: fc.array(
    fc.record({
      dt: timeStep,
      step: baseStep,
      grip: fc.double({ min: -0.01, max: 0.05, noNaN: true }),
      edit: lineEdit,
    }),
    {
      maxLength: 200,
      size: "max",
    },
  ),
});

function written(value: number, style: string): string {
  switch (style) {
    case "fixed":
      return value.toFixed(6);
    case "exp":
      return value.toExponential(8);
    case "long":
      return value.toFixed(20); // more digits than a double holds: the reader's slow path
    case "padded":
      return ` ${value}\t`;
    case "plus":
      return value >= 0 ? `+${value}` : String(value);
    default:
      return String(value);
  }
}

/** The file's text, in the generated header's column order. */
function fileText(file: FileSpec): string {
  const eol = file.crlf ? "\r\n" : "\n";
  const names = file.header
    .split(",")
    .slice(1)
    .map((n) => n.trim());
  const lines = [(file.bom ? "\ufeff" : "") + file.header];
  let t = 0;
  let base = 0;
  file.rows.forEach((row, k) => {
    if (k > 0)
      t += file.gapEvery > 0 && k % file.gapEvery === 0 ? 0.05 : file.forward ? Math.max(row.dt, 0.0005) : row.dt;
    base += row.step;
    const cells = [written(t, file.styles), ...names.map((n) => written(n === "grip" ? row.grip : base, file.styles))];
    const edit = file.edited ? row.edit : { kind: "none" };
    if (edit.kind === "bad") cells[Math.min(edit.field ?? 0, cells.length - 1)] = edit.text ?? "";
    if (edit.kind === "drop") cells.pop();
    if (edit.kind === "extra") cells.push("0");
    if (edit.kind === "blank") lines.push("");
    if (edit.kind === "blanks") lines.push("", "");
    const text = cells.join(",");
    lines.push(edit.kind === "lone-cr" ? `${text}\r${text}` : edit.kind === "cr-first" ? `\r${text}` : text);
  });
  let text = lines.join(eol);
  if (file.finalNewline === "lf") text += eol;
  if (file.finalNewline === "blank") text += eol + eol;
  if (file.finalNewline === "blanks") text += eol + eol + eol;
  if (file.finalNewline === "cr") text += "\r";
  if (file.finalNewline === "blank-cr") text += eol + "\r";
  return text;
}

type FileSpec = {
  header: string;
  bom: boolean;
  crlf: boolean;
  finalNewline: string;
  edited: boolean;
  gapEvery: number;
  forward: boolean;
  styles: string;
  rows: { dt: number; step: number; grip: number; edit: { kind: string; field?: number; text?: string } }[];
};

const optionsArb = fc.record(
  {
    maxProblems: fc.integer({ min: 1, max: 6 }),
    maxFindings: fc.integer({ min: 0, max: 4 }),
    maxGapCandidates: fc.integer({ min: 1, max: 3 }),
  },
  { requiredKeys: [] },
);

describe("streamed recording scan", () => {
  it("gives scanRecording's result on generated files (valid and broken) cut into random chunks", () => {
    const arm = armOf();
    const seen = { refused: 0, accepted: 0 };
    fc.assert(
      fc.property(
        fileArb,
        fc.array(fc.nat(), { maxLength: 40, size: "max" }),
        optionsArb,
        fc.boolean(),
        (file, cutSeeds, options, withArm) => {
          const bytes = encoder.encode(fileText(file as FileSpec));
          const cuts = cutSeeds.map((s) => s % (bytes.length + 1));
          seen[expectSameAsWholeFile(withArm ? arm : null, bytes, cuts, options)]++;
        },
      ),
      { numRuns: 500 },
    );
    // both outcomes were reached, so the comparison was not only between two refusals
    expect(seen.accepted).toBeGreaterThan(40);
    expect(seen.refused).toBeGreaterThan(40);
    expect(rescans).toBeGreaterThan(0);
  });

  it("gives the same result when the file is fed one byte at a time (splits inside a UTF-8 sequence, a BOM and a CR LF)", () => {
    const text = "\ufefft,base,grip\r\n0,0,0.02\r\n0.001,0.01,0.02\r\n0.002,é,0.02\r\n0.003,0,0.02";
    const bytes = encoder.encode(text);
    const cuts = Array.from({ length: bytes.length }, (_, i) => i);
    expect(expectSameAsWholeFile(armOf(), bytes, cuts, {})).toBe("refused");
    const valid = encoder.encode("\ufefft,base,grip\r\n0,0,0.02\r\n0.001,0.01,0.02\r\n0.002,0.01,0.02\r\n\r\n");
    expect(
      expectSameAsWholeFile(
        armOf(),
        valid,
        Array.from({ length: valid.length }, (_, i) => i),
        {},
      ),
    ).toBe("accepted");
  });

  it("finds the jump near the end of a long recording, keeping only the findings it is asked for", () => {
    const lines = ["t,base,grip"];
    for (let k = 0; k < 20000; k++) lines.push(`${k / 1000},${(k >= 19950 ? 0.05 : 0) + 0.0001 * k},0.02`);
    const bytes = encoder.encode(lines.join("\n") + "\n");
    const cuts = Array.from({ length: 50 }, (_, i) => Math.floor((i * bytes.length) / 50) + 7);
    expect(expectSameAsWholeFile(armOf(), bytes, cuts, { maxFindings: 50 })).toBe("accepted");
    const streamed = scanInChunks(armOf(), bytes, cuts, { maxFindings: 50 });
    if (!("summary" in streamed) || !streamed.report) throw new Error("refused");
    expect(streamed.summary.count).toBe(20000);
    expect(streamed.report.verdict).toBe("fault");
    expect(streamed.report.findings.find((f) => f.kind === "jump")).toMatchObject({ sample: 19950, line: 19952 });
  });

  it("asks for a second pass when more steps are gaps than it kept as candidates, and that pass lists them as the whole-file scan does", () => {
    // ten 1 s gaps in a 1 kHz recording; two candidates kept
    const lines = ["t,base,grip"];
    let t = 0;
    for (let k = 0; k < 3000; k++) {
      t += k > 0 && k % 300 === 0 ? 1 : 0.001;
      lines.push(`${t},0,0.02`);
    }
    const bytes = encoder.encode(lines.join("\n") + "\n");
    const scanner = createRecordingScanner(armOf(), { maxGapCandidates: 2 });
    scanner.push(bytes);
    const first = scanner.end();
    expect("rescan" in first).toBe(true);
    expect(expectSameAsWholeFile(armOf(), bytes, [1000, 20000], { maxGapCandidates: 2 })).toBe("refused");
    // with room for every gap, one pass is enough
    const roomy = createRecordingScanner(armOf(), { maxGapCandidates: 16 });
    roomy.push(bytes);
    const one = roomy.end();
    const whole = scanRecording(armOf(), bytes);
    expect(one).toEqual({ problems: "problems" in whole ? whole.problems : [] });
  });

  it("refuses a line longer than maxLineBytes with its own problem instead of holding it, however it is cut", () => {
    const long = "1".repeat(5000);
    const bytes = encoder.encode(`t,base,grip\n0,0,0.02\n0.001,${long},0.02\n0.002,0,0.02\n`);
    for (const cuts of [[], [30], [30, 2000, 4000], Array.from({ length: 60 }, (_, i) => i * 97)]) {
      const scanner = createRecordingScanner(armOf(), { maxLineBytes: 1000 });
      let at = 0;
      for (const cut of cuts) {
        scanner.push(bytes.subarray(at, cut));
        at = cut;
      }
      scanner.push(bytes.subarray(at));
      expect(scanner.end()).toEqual({
        problems: [{ line: 3, column: null, message: "is longer than 1000 bytes; not read" }],
      });
    }
    const header = createRecordingScanner(null, { maxLineBytes: 10 });
    header.push(encoder.encode("t,base,grip,wrist\n0,0,0,0\n"));
    expect(header.end()).toEqual({
      problems: [
        {
          line: 1,
          column: null,
          message: "is longer than 10 bytes; a recording's header names its joints in far fewer",
        },
      ],
    });
  });
});
