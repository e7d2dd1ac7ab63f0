/** Shared builders for the recording tests: a two-joint arm, recordings from rows, 1 kHz step rows. */
import { expect } from "vitest";
import { parseArm, type Arm, type Recording } from "@/kinematics";

export function expectClose(actual: number, expected: number, rel = 1e-9, abs = 1e-12): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(abs + rel * Math.abs(expected));
}

export function armOf(rateHz = 1000): Arm {
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

export function recordingOf(rows: number[][]): Recording {
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
export function rowsOf(steps: number[]): number[][] {
  const rows = [[0, 0, 0.02]];
  steps.forEach((step, k) => rows.push([(k + 1) / 1000, rows[k][1] + step, 0.02]));
  return rows;
}
