/** The summary stored beside each plan version and returned with each check (worker-safe: no server imports). */
import type { Plan, Report } from "@/kinematics";

export type ReportSummary = {
  verdict: Report["verdict"];
  moves: number;
  durationS: number;
  faults: number;
  cautions: number;
  /** The first fault (else the first caution), for lists. */
  worst: { kind: string; severity: string; move: number | null; joint: number | null; message: string } | null;
};

export function summarize(plan: Plan, report: Report): ReportSummary {
  const faults = report.findings.filter((f) => f.severity === "fault");
  const cautions = report.findings.filter((f) => f.severity === "caution");
  const worst = faults[0] ?? cautions[0] ?? null;
  return {
    verdict: report.verdict,
    moves: plan.moves.length,
    durationS: plan.moves.reduce((s, m) => s + m.duration, 0),
    faults: faults.length,
    cautions: cautions.length,
    worst: worst && {
      kind: worst.kind,
      severity: worst.severity,
      move: worst.move,
      joint: worst.joint,
      message: worst.message,
    },
  };
}
