import { inTransaction } from "@/lib/server/transaction";
import { isDeepStrictEqual } from "node:util";
import { z } from "zod";
import { getArmRevisionForUser } from "@/db/queries/arms";
import { recordAudit } from "@/db/queries/audit";
import { createPlanVersion, listPlanVersionsPage } from "@/db/queries/plans";
import { timePageQuery } from "@/lib/server/paging";
import { json, readJson, readParams, readQuery, route, uuidParam } from "@/lib/server/route";
import { checkPlan } from "@/lib/server/check";
import { armSchema } from "@/kinematics";
import { loadPlan, membershipOf } from "@/lib/server/loaders";
import { createVersionSchema } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";

const params = z.object({ planId: uuidParam });

/** GET /api/v1/plans/:planId/versions — one page of the versions, newest first, without the documents. */
export const GET = route(async (request, context) => {
  const { planId } = await readParams(context, params);
  const query = readQuery(request, timePageQuery);
  const actor = await requireActor(request);
  const plan = await loadPlan(actor, planId);
  authorizeProject(membershipOf(plan), "plan:read");
  const page = await listPlanVersionsPage({ planId, userId: actor.userId, limit: query.limit, after: query.cursor });
  return json({ versions: page.items, nextCursor: page.nextCursor });
});

/**
 * POST /api/v1/plans/:planId/versions — saves a new version: the engine checks the document
 * against the plan's arm revision on the server and the verdict is stored with it. A save whose
 * `baseVersion` is no longer the newest is refused with 409 (no lost update).
 */
export const POST = route(async (request, context) => {
  const { planId } = await readParams(context, params);
  const body = await readJson(request, createVersionSchema);
  const actor = await requireActor(request);
  const plan = await loadPlan(actor, planId);
  authorizeProject(membershipOf(plan), "version:create");

  const revision = await getArmRevisionForUser({ armId: plan.armId, userId: actor.userId, revision: body.armRevision });
  if (!revision) {
    throw new AppError("unprocessable:arm-revision", "The plan's arm has no such revision.", {
      issues: [{ path: "armRevision", message: "is not a revision of the plan's arm" }],
    });
  }
  // The check must run against the stored arm, so the document must describe exactly that arm.
  const storedArm = armSchema.parse(revision.description);
  if (!isDeepStrictEqual(storedArm, body.document.arm)) {
    throw new AppError(
      "unprocessable:arm-mismatch",
      `document.arm differs from revision ${revision.revision} of the plan's arm.`,
      {
        issues: [
          {
            path: "document.arm",
            message: `must equal revision ${revision.revision} of arm "${plan.armName}" (GET /api/v1/arms/${plan.armId})`,
          },
        ],
      },
    );
  }
  const { report, summary } = await checkPlan(body.document, "document");
  const result = await inTransaction(async () => {
    const result = await createPlanVersion({
      planId,
      baseVersion: body.baseVersion,
      document: body.document,
      armRevisionId: revision.id,
      verdict: report.verdict,
      summary,
      note: body.note ?? null,
      authorId: actor.userId,
    });
    if ("conflict" in result) {
      throw new AppError(
        "conflict:version",
        `Version ${result.conflict} was saved after version ${body.baseVersion}, which this edit started from. Load version ${result.conflict} and merge, or save as a new plan.`,
        {
          details: { latestVersion: result.conflict, baseVersion: body.baseVersion },
        },
      );
    }
    await recordAudit({
      actorId: actor.userId,
      action: "version.create",
      targetType: "plan",
      targetId: planId,
      projectId: plan.projectId,
      detail: { number: result.version.number, verdict: report.verdict },
    });
    return result;
  });
  return json({ version: { ...result.version, armRevision: revision.revision }, report }, 201);
});
