/**
 * The arm-model figures of one move in a line of text for the move list: the peak tool-point speed
 * and the joint whose effort comes closest to its `maxEffort` (or, when no joint has a `maxEffort`,
 * the largest effort). Both come from the engine's `MoveReport`; nothing is shown for a report from
 * the joint checks alone (no chain, or the full check still running).
 */
import type { Joint, MoveReport } from "@/kinematics";
import { unitLabel } from "@/lib/shared/units";

export interface MoveFigures {
  /** e.g. `0.412 m/s`, or null when the report has no tool speed. */
  toolSpeed: string | null;
  /** e.g. `shoulder 14.20 N·m (71% of 20.00 N·m)`, or null when the report has no efforts. */
  effort: string | null;
}

export function moveFigures(report: MoveReport | undefined, joints: readonly Joint[]): MoveFigures {
  const toolSpeed =
    report?.peakToolSpeed !== undefined && Number.isFinite(report.peakToolSpeed)
      ? `${report.peakToolSpeed.toFixed(3)} m/s`
      : null;
  let effort: string | null = null;
  const peaks = report?.peakEffort;
  if (peaks) {
    let best = -1,
      bestRatio = -Infinity,
      largest = -1;
    peaks.forEach((tau, j) => {
      if (tau === null || !Number.isFinite(tau) || !joints[j]) return;
      const max = joints[j].maxEffort;
      if (max !== undefined && max > 0 && tau / max > bestRatio) {
        bestRatio = tau / max;
        best = j;
      }
      // N·m and N do not compare, so the fallback "largest" only looks at revolute joints
      if (joints[j].type === "revolute" && (largest < 0 || tau > (peaks[largest] ?? -Infinity))) largest = j;
    });
    const j = best >= 0 ? best : largest;
    if (j >= 0) {
      const joint = joints[j];
      const unit = unitLabel(joint.type, "rad", "effort");
      const tau = peaks[j] ?? 0;
      effort =
        `${joint.name} ${tau.toFixed(2)} ${unit}` +
        (best >= 0 ? ` (${Math.round(bestRatio * 100)}% of ${joint.maxEffort!.toFixed(2)} ${unit})` : "");
    }
  }
  return { toolSpeed, effort };
}
