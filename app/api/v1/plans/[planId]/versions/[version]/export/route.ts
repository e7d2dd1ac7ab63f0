import { z } from "zod";
import { getPlanVersion } from "@/db/queries/plans";
import { readParams, readQuery, route, uuidParam, versionParam } from "@/lib/server/route";
import { checkPlan } from "@/lib/server/check";
import { planSchema, samplePlan } from "@/kinematics";
import { buildCsvExport, buildJsonExport } from "@/lib/shared/export-format";
import { loadPlan, membershipOf } from "@/lib/server/loaders";
import { EXPORT_MAX_VALUES, exportQuery } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";

const params = z.object({ planId: uuidParam, version: versionParam });

/**
 * GET /api/v1/plans/:planId/versions/:version/export?format=json|csv&rateHz=…
 * The checked waypoint list with the report, the arm revision and a SHA-256 (see lib/shared/export-format.ts).
 */
export const GET = route(async (request, context) => {
  const { planId, version: number } = await readParams(context, params);
  const query = readQuery(request, exportQuery);
  const actor = await requireActor(request);
  const plan = await loadPlan(actor, planId);
  authorizeProject(membershipOf(plan), "plan:read");
  const version = await getPlanVersion({ planId, number, userId: actor.userId });
  if (!version) throw new AppError("not_found:version", "No such version.");

  const document = planSchema.parse(version.document);
  const rateHz = query.rateHz ?? document.arm.controlRateHz;
  const durationS = document.moves.reduce((s, m) => s + m.duration, 0);
  const values = (Math.floor(durationS * rateHz) + 2) * (document.arm.joints.length + 1);
  if (values > EXPORT_MAX_VALUES) {
    throw new AppError(
      "unprocessable:too-many-samples",
      `At ${rateHz} Hz this ${durationS} s plan has too many waypoints for one export; choose a lower rateHz.`,
      {
        issues: [
          {
            path: "query.rateHz",
            message: `must be at most ${Math.floor(EXPORT_MAX_VALUES / (document.arm.joints.length + 1) / Math.max(durationS, 1e-9))} for this plan`,
          },
        ],
      },
    );
  }
  const { report } = await checkPlan(document);
  const samples = samplePlan(document, { rateHz });
  const meta = {
    plan: { id: plan.id, name: plan.name },
    planVersion: version.number,
    savedAt: version.createdAt.toISOString(),
    armRevision: { armId: version.armId, name: plan.armName, revision: version.armRevision },
  };
  const base = `${plan.name.replace(/[^A-Za-z0-9._-]+/g, "-").slice(0, 60) || "plan"}-v${version.number}`;
  const body =
    query.format === "csv"
      ? await buildCsvExport(document, report, samples, meta)
      : await buildJsonExport(document, report, samples, meta);
  return new Response(body, {
    status: 200,
    headers: {
      "Content-Type": query.format === "csv" ? "text/csv; charset=utf-8" : "application/json; charset=utf-8",
      "Content-Disposition": `attachment; filename="${base}.${query.format}"`,
      "Cache-Control": "no-store",
      "X-Jointproof-Verdict": report.verdict,
    },
  });
});
