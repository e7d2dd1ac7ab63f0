import { describe, expect, it } from "vitest";
import { describeRecordingProblem, formatRecordingCsv, parseRecordingCsv } from "@/kinematics/recordings/csv";
import { parseArm, type Arm } from "@/kinematics";
import { alignRecording, repairStream, resampleRecording, streamCheck, validateRecording, type Recording } from "@/kinematics/recordings/stream";

function expectClose(actual: number, expected: number, rel = 1e-9, abs = 1e-12): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(abs + rel * Math.abs(expected));
}

function armOf(rateHz = 1000): Arm {
  const result = parseArm({
    name: "Stream arm",
    controlRateHz: rateHz,
    joints: [
      { name: "base", min: -3, max: 3, maxVelocity: 2 },
      { name: "grip", type: "prismatic", min: 0, max: 0.04, maxVelocity: 0.1 },
    ],
  });
  if (!result.ok) throw new Error(JSON.stringify(result.problems));
  return result.value;
}

function recordingOf(rows: number[][]): Recording {
  const n = rows[0].length - 1;
  return {
    names: ["base", "grip"].slice(0, n),
    jointCount: n,
    count: rows.length,
    timeS: Float64Array.from(rows.map((r) => r[0])),
    position: Float64Array.from(rows.flatMap((r) => r.slice(1))),
  };
}

/** 1 kHz rows where base moves by `steps[k]` at row k + 1 and grip holds 0.02 m. */
function rowsOf(steps: number[]): number[][] {
  const rows = [[0, 0, 0.02]];
  steps.forEach((step, k) => rows.push([(k + 1) / 1000, rows[k][1] + step, 0.02]));
  return rows;
}

describe("stream check", () => {
  it("a step above maxVelocity / controlRateHz is a jump fault at the later sample", () => {
    const report = streamCheck(armOf(), recordingOf(rowsOf([0.001, 0.001, 0.01, 0.001])));
    const jump = report.findings.find((f) => f.kind === "jump");
    expect(jump).toMatchObject({ severity: "fault", joint: 0, sample: 3, endSample: 3, limit: 0.002 });
    expectClose(jump!.value, 0.01);
    expectClose(jump!.time, 0.003);
    expect(report.verdict).toBe("fault");
    expect(report.samples).toBe(5);
    expectClose(report.rateHz, 1000);
  });

  it("a step above cautionRatio of the step limit and not above it is a caution; equal to it passes", () => {
    const caution = streamCheck(armOf(), recordingOf(rowsOf([0.0019])));
    expect(caution.findings.map((f) => [f.kind, f.severity])).toEqual([["jump", "caution"], ["speed-over", "caution"]]);
    const equal = streamCheck(armOf(), recordingOf(rowsOf([0.0018])));
    expect(equal.verdict).toBe("pass");
  });

  it("speed-over uses the finite-difference speed |Δq| / Δt, separately from the jump rule", () => {
    // 100 Hz log, control rate 10 Hz: a step of 0.05 rad in 10 ms is 5 rad/s (> 2) but within one 0.1 s period (0.2 rad)
    const rows = [[0, 0, 0.02], [0.01, 0.05, 0.02], [0.02, 0.05, 0.02]];
    const report = streamCheck(armOf(10), recordingOf(rows));
    expect(report.findings.map((f) => [f.kind, f.severity, f.sample])).toEqual([["speed-over", "fault", 1]]);
    expectClose(report.findings[0].value, 5);
    expect(report.findings[0].limit).toBe(2);
  });

  it("merges a run of consecutive offending steps of one kind and joint into one finding", () => {
    const report = streamCheck(armOf(), recordingOf(rowsOf([0.001, 0.005, 0.006, 0.0055, 0.001, 0.004])));
    const jumps = report.findings.filter((f) => f.kind === "jump");
    expect(jumps.map((f) => [f.sample, f.endSample])).toEqual([[2, 4], [6, 6]]);
    expectClose(jumps[0].value, 0.006);
    expect(jumps[0].message).toContain("samples 2–4");
  });

  it("a sample outside travel is a range fault", () => {
    const rows = [[0, 0, 0.02], [0.001, 0, 0.05], [0.002, 0, 0.02]];
    const report = streamCheck(armOf(), recordingOf(rows));
    const range = report.findings.find((f) => f.kind === "range");
    expect(range).toMatchObject({ severity: "fault", joint: 1, sample: 1, endSample: 1, value: 0.05, limit: 0.04 });
  });

  it("a smooth recording passes", () => {
    const report = streamCheck(armOf(), recordingOf(rowsOf(new Array(50).fill(0.0005))));
    expect(report).toMatchObject({ verdict: "pass", findings: [] });
  });
});

describe("recording input problems", () => {
  it("reports non-increasing times with the row", () => {
    const problems = validateRecording(armOf(), recordingOf([[0, 0, 0.02], [0.001, 0, 0.02], [0.001, 0, 0.02]]));
    expect(problems.map(describeRecordingProblem)).toEqual([
      'line 4, column "t": time 0.001 s is not after the previous row\'s 0.001 s',
    ]);
  });

  it("reports a gap with the row", () => {
    const rows = rowsOf(new Array(30).fill(0.0001));
    rows.push([5, rows[rows.length - 1][1], 0.02]);
    const problems = validateRecording(armOf(), recordingOf(rows));
    expect(problems).toHaveLength(1);
    expect(problems[0].row).toBe(31);
    expect(problems[0].message).toContain("gap");
  });

  it("reports NaN positions with row and column", () => {
    const problems = validateRecording(armOf(), recordingOf([[0, 0, 0.02], [0.001, NaN, 0.02]]));
    expect(problems).toEqual([{ row: 1, column: "base", message: "position is not a finite number (NaN)" }]);
  });

  it("reports wrong column counts and non-numbers from the CSV with their lines", () => {
    const text = "t,base,grip\n0,0,0.02\n0.001,0.001\n0.002,abc,0.02\n0.003,NaN,0.02\n";
    const result = parseRecordingCsv(new TextEncoder().encode(text));
    expect(result.recording).toBeNull();
    expect(result.problems.map(describeRecordingProblem)).toEqual([
      "line 3: has 2 values; the header has 3 columns",
      'line 4, column "base": not a number ("abc")',
      'line 5, column "base": not a number ("NaN")',
    ]);
  });

  it("matches columns to the arm's joints by name, in any order", () => {
    const text = "t,grip,base\n0,0.02,0.5\n0.001,0.021,0.5005\n";
    const parsed = parseRecordingCsv(new TextEncoder().encode(text));
    const aligned = alignRecording(armOf(), parsed.recording!);
    expect(Array.from(aligned.recording!.position)).toEqual([0.5, 0.02, 0.5005, 0.021]);
    const unknown = alignRecording(armOf(), { ...parsed.recording!, names: ["grip", "wrist"] });
    expect(unknown.problems.map((p) => p.message)).toEqual([
      'is not a joint of the arm "Stream arm"',
      "is a joint of the arm but has no column",
    ]);
  });
});

describe("repair", () => {
  it("rate-limits a jump so the stream passes and reports the largest departure per joint", () => {
    const original = recordingOf(rowsOf([0.001, 0.02, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0]));
    const { recording, maxDeviation, maxDeviationSample } = repairStream(armOf(), original);
    expect(streamCheck(armOf(), recording).verdict).toBe("pass");
    // the slew limit is 0.9 × 2 rad/s × 1 ms = 0.0018 rad per step: right after the jump the repair lags by 0.02 − 0.0018
    expectClose(maxDeviation[0], 0.02 - 0.0018, 1e-6);
    expect(maxDeviationSample[0]).toBe(2);
    expect(maxDeviation[1]).toBe(0);
    // it catches up with the recording once the recording holds still
    expectClose(recording.position[(recording.count - 1) * 2], original.position[(original.count - 1) * 2], 1e-12);
  });

  it("resamples an uneven log at a uniform rate before rate-limiting", () => {
    const original = recordingOf([[0, 0, 0.02], [0.0015, 0.001, 0.02], [0.002, 0.0012, 0.02], [0.004, 0.002, 0.02]]);
    const resampled = resampleRecording(original, 1000);
    expect(Array.from(resampled.timeS)).toEqual([0, 0.001, 0.002, 0.003, 0.004]);
    expectClose(resampled.position[2], 0.001 / 1.5);
    const repaired = repairStream(armOf(), original, { resampleHz: 1000 });
    expect(repaired.recording.count).toBe(5);
    expect(streamCheck(armOf(), repaired.recording).verdict).toBe("pass");
  });

  it("writes a CSV that parses back to the same numbers", () => {
    const original = recordingOf(rowsOf([0.001, 0.0003, -0.0017]));
    const parsed = parseRecordingCsv(new TextEncoder().encode(formatRecordingCsv(original)));
    expect(parsed.problems).toEqual([]);
    expect(Array.from(parsed.recording!.position)).toEqual(Array.from(original.position));
    expect(Array.from(parsed.recording!.timeS)).toEqual(Array.from(original.timeS));
  });
});
