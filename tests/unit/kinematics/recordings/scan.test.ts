import { describe, expect, it } from "vitest";
import { describeRecordingProblem, scanRecording } from "@/kinematics";
import { armOf } from "./helpers";

/** A 1 kHz log, header `t,<names>`; `base` moves by `steps[k]` at sample k + 1, on line k + 3 (the header is line 1). */
function csvOf(steps: number[], names = ["base", "grip"]): string {
  const lines = [`t,${names.join(",")}`];
  let q = 0;
  [0, ...steps].forEach((step, k) => {
    q += step;
    const values: Record<string, number> = { base: q, grip: 0.02 };
    lines.push([k / 1000, ...names.map((n) => values[n] ?? 0)].join(","));
  });
  return lines.join("\n") + "\n";
}

describe("recording scan (parse → align → validate → stream check)", () => {
  it("gives the same report for the file's text and its bytes, with findings named by the file's line", () => {
    const text = csvOf([0.001, 0.001, 0.01, 0.001]);
    const fromText = scanRecording(armOf(), text);
    const fromBytes = scanRecording(armOf(), new TextEncoder().encode(text));
    if ("problems" in fromText || "problems" in fromBytes) throw new Error("refused");
    expect(fromBytes.report).toEqual(fromText.report);
    const jump = fromText.report.findings.find((f) => f.kind === "jump");
    // the 0.01 rad step is sample 3, on line 5 of the file (header = line 1)
    expect(jump).toMatchObject({ severity: "fault", sample: 3, line: 5, endLine: 5 });
    expect(jump?.message).toContain("line 5 (t = 0.003 s)");
  });

  it("refuses a time that does not strictly increase, naming its line, and gives no report", () => {
    const text = "t,base,grip\n0,0,0.02\n0.001,0,0.02\n0.0005,0,0.02\n0.002,0,0.02\n";
    const scanned = scanRecording(armOf(), text);
    expect("report" in scanned).toBe(false);
    if (!("problems" in scanned)) return;
    expect(scanned.problems.map(describeRecordingProblem)).toEqual([
      'line 4, column "t": time 0.0005 s is not after the previous line\'s 0.001 s',
    ]);
  });

  it("validates a recording kept without an arm the same way, and stream-checks nothing", () => {
    const backwards = scanRecording(null, "t,a,b\n0,0,0\n0.01,0,0\n0.01,0,0\n");
    expect("problems" in backwards && backwards.problems.map((p) => p.line)).toEqual([4]);
    const fine = scanRecording(null, "t,a,b\n0,0,0\n0.01,0,0\n0.02,0,0\n");
    if ("problems" in fine) throw new Error("refused");
    expect(fine.report).toBeNull();
    expect(fine.recording.count).toBe(3);
  });

  it("puts the columns in the arm's joint order and refuses an unknown column on line 1", () => {
    const swapped = scanRecording(armOf(), "t,grip,base\n0,0.02,0.5\n0.001,0.02,0.5005\n");
    if ("problems" in swapped) throw new Error("refused");
    expect(Array.from(swapped.recording.position)).toEqual([0.5, 0.02, 0.5005, 0.02]);
    expect(swapped.report.verdict).toBe("pass");
    const unknown = scanRecording(armOf(), "t,base,wrist\n0,0,0\n0.001,0,0\n");
    expect("problems" in unknown && unknown.problems.map(describeRecordingProblem)).toEqual([
      'line 1, column "wrist": is not a joint of the arm "Stream arm"',
      'line 1, column "grip": is a joint of the arm but has no column',
    ]);
  });

  it("refuses a value that is not a number before any check, naming line and column", () => {
    const scanned = scanRecording(armOf(), "t,base,grip\n0,0,0.02\n0.001,x,0.02\n");
    expect("problems" in scanned && scanned.problems.map(describeRecordingProblem)).toEqual([
      'line 3, column "base": not a number ("x")',
    ]);
  });

  it("keeps at most maxFindings findings while the verdict still counts every step", () => {
    const scanned = scanRecording(armOf(), csvOf([0.01, 0, 0.01, 0, 0.01]), { maxFindings: 1 });
    if ("problems" in scanned) throw new Error("refused");
    expect(scanned.report.findings).toHaveLength(1);
    expect(scanned.report.verdict).toBe("fault");
  });
});
