import { describe, expect, it } from "vitest";
import { formatRecordingCsv, parseRecordingCsv, repairStream, resampleRecording, streamCheck } from "@/kinematics";
import { armOf, expectClose, recordingOf, rowsOf } from "./helpers";

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
    const original = recordingOf([
      [0, 0, 0.02],
      [0.0015, 0.001, 0.02],
      [0.002, 0.0012, 0.02],
      [0.004, 0.002, 0.02],
    ]);
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
