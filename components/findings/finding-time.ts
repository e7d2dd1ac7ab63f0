/**
 * When a finding happens on the plan's timeline, so a click on it can move the stage and the plots
 * there, and how findings are ordered and named in the panel. The time itself comes from the engine
 * (`Finding.timeS`: the peak, the jump, the deepest intrusion, …); the bench does not work it out.
 */
import { findingKinds, type Finding, type Timeline } from "@/kinematics";

/**
 * The time (s from the plan's start) of a finding's worst instant: the engine's `timeS`. Reports
 * stored before the engine timed its findings (an old submission's report) lack it; those fall back
 * to the start of the finding's move, which is where the move list would take the playhead.
 */
export function findingTimeS(finding: Finding, timeline: Timeline): number {
  if (finding.timeS !== undefined && Number.isFinite(finding.timeS)) return finding.timeS;
  return finding.move === null ? 0 : (timeline.startS[finding.move] ?? 0);
}

/** Place of a finding kind in the engine's one order of kinds. */
const kindRank = (kind: Finding["kind"]): number => findingKinds.indexOf(kind);

/** Findings worst first: faults before cautions, then the largest overshoot of its limit, then kind. */
export function worstFirst(findings: readonly Finding[]): Finding[] {
  const ratio = (f: Finding) => (f.kind === "range" ? Infinity : f.limit > 0 ? f.value / f.limit : 0);
  return findings.slice().sort((a, b) => {
    if (a.severity !== b.severity) return a.severity === "fault" ? -1 : 1;
    const r = ratio(b) - ratio(a);
    if (r !== 0 && Number.isFinite(r)) return r;
    return kindRank(a.kind) - kindRank(b.kind) || (a.move ?? -1) - (b.move ?? -1);
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
  glitch: "Glitch",
  gap: "Gap",
};
