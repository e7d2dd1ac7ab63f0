import { describe, expect, it } from "vitest";
import { streamCheck } from "@/kinematics";
import { armOf, expectClose, recordingOf, rowsOf } from "./helpers";

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
    expect(caution.findings.map((f) => [f.kind, f.severity])).toEqual([
      ["jump", "caution"],
      ["speed-over", "caution"],
    ]);
    const equal = streamCheck(armOf(), recordingOf(rowsOf([0.0018])));
    expect(equal.verdict).toBe("pass");
  });

  it("speed-over uses the finite-difference speed |Δq| / Δt, separately from the jump rule", () => {
    // 100 Hz log, control rate 10 Hz: a step of 0.05 rad in 10 ms is 5 rad/s (> 2) but within one 0.1 s period (0.2 rad)
    const rows = [
      [0, 0, 0.02],
      [0.01, 0.05, 0.02],
      [0.02, 0.05, 0.02],
    ];
    const report = streamCheck(armOf(10), recordingOf(rows));
    expect(report.findings.map((f) => [f.kind, f.severity, f.sample])).toEqual([["speed-over", "fault", 1]]);
    expectClose(report.findings[0].value, 5);
    expect(report.findings[0].limit).toBe(2);
  });

  it("merges a run of consecutive offending steps of one kind and joint into one finding", () => {
    const report = streamCheck(armOf(), recordingOf(rowsOf([0.001, 0.005, 0.006, 0.0055, 0.001, 0.004])));
    const jumps = report.findings.filter((f) => f.kind === "jump");
    expect(jumps.map((f) => [f.sample, f.endSample])).toEqual([
      [2, 4],
      [6, 6],
    ]);
    expectClose(jumps[0].value, 0.006);
    expect(jumps.map((f) => [f.line, f.endLine])).toEqual([
      [4, 6],
      [8, 8],
    ]);
    expect(jumps[0].message).toContain("lines 4–6");
  });

  it("a sample outside travel is a range fault", () => {
    const rows = [
      [0, 0, 0.02],
      [0.001, 0, 0.05],
      [0.002, 0, 0.02],
    ];
    const report = streamCheck(armOf(), recordingOf(rows));
    const range = report.findings.find((f) => f.kind === "range");
    expect(range).toMatchObject({ severity: "fault", joint: 1, sample: 1, endSample: 1, value: 0.05, limit: 0.04 });
  });

  it("a smooth recording passes", () => {
    const report = streamCheck(armOf(), recordingOf(rowsOf(new Array(50).fill(0.0005))));
    expect(report).toMatchObject({ verdict: "pass", findings: [] });
  });
});
