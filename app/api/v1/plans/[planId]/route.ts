import { inTransaction } from "@/lib/server/transaction";
import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { deletePlan } from "@/db/queries/plans";
import { json, readParams, route, uuidParam } from "@/lib/server/route";
import { loadPlan, membershipOf } from "@/lib/server/loaders";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";

const params = z.object({ planId: uuidParam });

/** GET /api/v1/plans/:planId */
export const GET = route(async (request, context) => {
  const { planId } = await readParams(context, params);
  const actor = await requireActor(request);
  const plan = await loadPlan(actor, planId);
  authorizeProject(membershipOf(plan), "plan:read");
  return json({ plan });
});

/** DELETE /api/v1/plans/:planId — removes the plan and its versions (owners, editors). */
export const DELETE = route(async (request, context) => {
  const { planId } = await readParams(context, params);
  const actor = await requireActor(request);
  const plan = await loadPlan(actor, planId);
  authorizeProject(membershipOf(plan), "plan:delete");
  await inTransaction(async () => {
    if (!(await deletePlan({ planId, userId: actor.userId }))) throw new AppError("not_found:plan", "No such plan.");
    await recordAudit({
      actorId: actor.userId,
      action: "plan.delete",
      targetType: "plan",
      targetId: planId,
      projectId: plan.projectId,
      detail: { name: plan.name },
    });
  });
  return json({ deleted: planId });
});
