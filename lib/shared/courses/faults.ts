/**
 * The faults of a submission's stored report (the server's check at submission time), read back
 * from JSON for the approval rule and the approval dialog. Pure, so the review page lists the same
 * faults the decision route counts.
 */
import { z } from "zod";

const storedFinding = z.looseObject({
  kind: z.string(),
  severity: z.string(),
  move: z.number().nullable(),
  joint: z.number().nullable(),
  message: z.string(),
});
const storedReport = z.looseObject({ verdict: z.string(), findings: z.array(z.unknown()) });

/** One fault as the reviewer is shown it. `move` and `joint` are 0-based (JSON); screens add 1 to `move`. */
export type SubmissionFault = { kind: string; move: number | null; joint: number | null; message: string };

/** The fault findings of a stored report, in the report's order; findings that cannot be read are skipped here and caught by `hasFaults`. */
export function reportFaults(report: unknown): SubmissionFault[] {
  const parsed = storedReport.safeParse(report);
  if (!parsed.success) return [];
  return parsed.data.findings.flatMap((f) => {
    const finding = storedFinding.safeParse(f);
    return finding.success && finding.data.severity === "fault"
      ? [{ kind: finding.data.kind, move: finding.data.move, joint: finding.data.joint, message: finding.data.message }]
      : [];
  });
}

/**
 * Whether approving needs the reviewer's confirmation: the stored verdict is a fault, any finding is
 * one, or the report cannot be read (an unreadable check is never taken for a clean one).
 */
export function hasFaults(submission: { verdict: string; report: unknown }): boolean {
  if (submission.verdict === "fault") return true;
  const parsed = storedReport.safeParse(submission.report);
  if (!parsed.success || parsed.data.verdict === "fault") return true;
  return reportFaults(submission.report).length > 0;
}
