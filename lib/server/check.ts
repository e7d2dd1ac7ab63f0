/** Running the engine for the API: the check, and the summary stored beside each plan version. */
import type { Plan, Report } from "@/kinematics";
import { runCheck } from "./check-pool";
import { summarize, type ReportSummary } from "./report-summary";

export { summarize, type ReportSummary } from "./report-summary";

/**
 * Runs the engine on a parsed plan in the check pool (lib/server/check-pool.ts: 422 over the work
 * budget, 503 past the time limit); `pathPrefix` names the document in the request (e.g. "document").
 */
export async function checkPlan(plan: Plan, pathPrefix = ""): Promise<{ report: Report; summary: ReportSummary }> {
  const { report } = await runCheck(plan, pathPrefix);
  return { report, summary: summarize(plan, report) };
}
