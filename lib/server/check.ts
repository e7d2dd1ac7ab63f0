/** Running the engine for the API: the check, and the summary stored beside each plan version. */
import { check, type Plan, type Report } from "@/kinematics";
import { AppError } from "./errors";

/**
 * Most control periods one request may check (one hour at 1 kHz). The check samples the whole plan
 * at the control rate, so without a cap a tiny body with a huge duration would hold the server.
 */
export const MAX_CHECK_PERIODS = 3_600_000;

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
    worst: worst && { kind: worst.kind, severity: worst.severity, move: worst.move, joint: worst.joint, message: worst.message },
  };
}

/** Runs the engine on a parsed plan; `pathPrefix` names the document in the request (e.g. "document"). */
export function checkPlan(plan: Plan, pathPrefix = ""): { report: Report; summary: ReportSummary } {
  const durationS = plan.moves.reduce((s, m) => s + m.duration, 0);
  const periods = durationS * plan.arm.controlRateHz;
  if (periods > MAX_CHECK_PERIODS) {
    const maxS = MAX_CHECK_PERIODS / plan.arm.controlRateHz;
    throw new AppError("unprocessable:plan-too-long", `The plan lasts ${durationS} s; one check covers at most ${maxS} s at this control rate. Split it into shorter plans.`, {
      issues: [{ path: pathPrefix ? `${pathPrefix}.moves` : "moves", message: `must last at most ${maxS} s in total` }],
    });
  }
  const report = check(plan);
  return { report, summary: summarize(plan, report) };
}
