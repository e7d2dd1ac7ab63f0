import { inTransaction } from "@/lib/server/transaction";
import { z } from "zod";
import { createArmRevision } from "@/db/queries/arms";
import { recordAudit } from "@/db/queries/audit";
import { json, readJson, readParams, route, uuidParam } from "@/lib/server/route";
import { loadArm } from "@/lib/server/loaders";
import { createArmRevisionSchema } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";

const params = z.object({ armId: uuidParam });

/** POST /api/v1/arms/:armId/revisions — a new revision of a custom arm (built-in arms are fixed). */
export const POST = route(async (request, context) => {
  const { armId } = await readParams(context, params);
  const body = await readJson(request, createArmRevisionSchema);
  const actor = await requireActor(request);
  const arm = await loadArm(actor, armId);
  if (arm.role === null)
    throw new AppError("forbidden:arm", "Built-in arms cannot be edited; create a custom arm in your project.");
  authorizeProject({ role: arm.role, archived: arm.projectArchived }, "arm:write");
  const revision = await inTransaction(async () => {
    const revision = await createArmRevision({
      armId,
      description: body.description,
      note: body.note,
      userId: actor.userId,
    });
    await recordAudit({
      actorId: actor.userId,
      action: "arm.revise",
      targetType: "arm",
      targetId: armId,
      projectId: arm.projectId,
      detail: { revision: revision.revision },
    });
    return revision;
  });
  return json({ revision }, 201);
});
