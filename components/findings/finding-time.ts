/**
 * When a finding happens on the plan's timeline, so a click on it can move the stage and the plots
 * there: the moment of the peak for speed and acceleration, the end of the move for a goal outside
 * the travel, the start of an instant move for a jump.
 */
import type { Finding } from "@/kinematics/report";
import type { Timeline } from "@/kinematics/timeline";

/** τ of the quintic's peak acceleration: s‴ = 0 at τ = (3 − √3)/6 (derived from s = 10τ³ − 15τ⁴ + 6τ⁵). */
const QUINTIC_PEAK_ACCEL_TAU = (3 - Math.sqrt(3)) / 6;

/** The time (s) on the plan's timeline at which a finding's value occurs. */
export function findingTime(finding: Finding, timeline: Timeline, shapes: readonly string[]): number {
  if (finding.move === null) return 0;
  const i = finding.move;
  const start = timeline.startS[i] ?? 0;
  const duration = timeline.durationS[i] ?? 0;
  switch (finding.kind) {
    case "range":
      return start + duration;
    case "jump":
      return start;
    case "accel-over": {
      const shape = shapes[i];
      const tau = shape === "quintic" ? QUINTIC_PEAK_ACCEL_TAU : 0; // cubic and trapezoid peak at the start
      return start + tau * duration;
    }
    default:
      return start + 0.5 * duration; // speed peaks at mid-move for every symmetric shape
  }
}

const kindRank: Record<Finding["kind"], number> = {
  range: 0,
  jump: 1,
  "speed-over": 2,
  "accel-over": 3,
  "effort-over": 4,
  clearance: 5,
  "tool-speed": 6,
};

/** Findings worst first: faults before cautions, then the largest overshoot of its limit, then kind. */
export function worstFirst(findings: readonly Finding[]): Finding[] {
  const ratio = (f: Finding) => (f.kind === "range" ? Infinity : f.limit > 0 ? f.value / f.limit : 0);
  return findings.slice().sort((a, b) => {
    if (a.severity !== b.severity) return a.severity === "fault" ? -1 : 1;
    const r = ratio(b) - ratio(a);
    if (r !== 0 && Number.isFinite(r)) return r;
    return kindRank[a.kind] - kindRank[b.kind] || (a.move ?? -1) - (b.move ?? -1);
  });
}

/** Short words for each finding kind, for headings and chips. */
export const kindWords: Record<Finding["kind"], string> = {
  range: "Outside travel",
  jump: "Jump too far",
  "speed-over": "Speed over limit",
  "accel-over": "Acceleration over limit",
  "effort-over": "Effort over limit",
  clearance: "Clearance",
  "tool-speed": "Tool speed over limit",
};
