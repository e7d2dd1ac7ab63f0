import { describe, expect, it } from "vitest";
import { alignRecording, describeRecordingProblem, parseRecordingCsv, validateRecording } from "@/kinematics";
import { armOf, recordingOf, rowsOf } from "./helpers";

describe("recording input problems", () => {
  it("reports non-increasing times with the file's line", () => {
    const problems = validateRecording(
      armOf(),
      recordingOf([
        [0, 0, 0.02],
        [0.001, 0, 0.02],
        [0.001, 0, 0.02],
      ]),
    );
    expect(problems.map(describeRecordingProblem)).toEqual([
      'line 4, column "t": time 0.001 s is not after the previous line\'s 0.001 s',
    ]);
  });

  it("reports a gap with the file's line", () => {
    const rows = rowsOf(new Array(30).fill(0.0001));
    rows.push([5, rows[rows.length - 1][1], 0.02]);
    const problems = validateRecording(armOf(), recordingOf(rows));
    expect(problems).toHaveLength(1);
    expect(problems[0].line).toBe(33); // sample 31, after the header
    expect(problems[0].message).toContain("gap");
  });

  it("reports NaN positions with the file's line and the column", () => {
    const problems = validateRecording(
      armOf(),
      recordingOf([
        [0, 0, 0.02],
        [0.001, NaN, 0.02],
      ]),
    );
    expect(problems).toEqual([{ line: 3, column: "base", message: "position is not a finite number (NaN)" }]);
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
