import { inTransaction } from "@/lib/server/transaction";
import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { createPlan, listPlansPageForProject } from "@/db/queries/plans";
import { getArmForUser } from "@/db/queries/arms";
import { timePageQuery } from "@/lib/server/paging";
import { json, readJson, readParams, readQuery, route, uuidParam } from "@/lib/server/route";
import { loadProject, membershipOf } from "@/lib/server/loaders";
import { createPlanSchema } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";

const params = z.object({ projectId: uuidParam });

/** GET /api/v1/projects/:projectId/plans — one page of the project's plans with their latest verdict, most recently changed first. */
export const GET = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const query = readQuery(request, timePageQuery);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "plan:read");
  const page = await listPlansPageForProject({
    projectId,
    userId: actor.userId,
    limit: query.limit,
    after: query.cursor,
  });
  return json({ plans: page.items, nextCursor: page.nextCursor });
});

/** POST /api/v1/projects/:projectId/plans — a new, empty plan for a built-in arm or one of this project's arms. */
export const POST = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const body = await readJson(request, createPlanSchema);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "plan:create");
  const arm = await getArmForUser({ armId: body.armId, userId: actor.userId });
  if (!arm || (arm.projectId !== null && arm.projectId !== projectId)) {
    throw new AppError("unprocessable:arm", "The arm is neither built in nor one of this project's arms.", {
      issues: [{ path: "armId", message: "is not an arm of this project" }],
    });
  }
  const plan = await inTransaction(async () => {
    const plan = await createPlan({ projectId, armId: body.armId, name: body.name, userId: actor.userId });
    await recordAudit({
      actorId: actor.userId,
      action: "plan.create",
      targetType: "plan",
      targetId: plan.id,
      projectId,
    });
    return plan;
  });
  return json({ plan }, 201);
});
