import { inTransaction } from "@/lib/server/transaction";
import { z } from "zod";
import { createArm, listArmsForUser } from "@/db/queries/arms";
import { recordAudit } from "@/db/queries/audit";
import { json, readJson, readParams, route, uuidParam } from "@/lib/server/route";
import { loadProject, membershipOf } from "@/lib/server/loaders";
import { createArmSchema } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";

const params = z.object({ projectId: uuidParam });

/** GET /api/v1/projects/:projectId/arms — the built-in arms and this project's own. */
export const GET = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "arm:read");
  return json({ arms: await listArmsForUser({ userId: actor.userId, projectId }) });
});

/** POST /api/v1/projects/:projectId/arms — a custom arm with its first revision (owners, editors). */
export const POST = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const body = await readJson(request, createArmSchema);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "arm:write");
  const created = await inTransaction(async () => {
    const created = await createArm({
      projectId,
      name: body.name,
      description: body.description,
      note: body.note,
      userId: actor.userId,
    });
    if (!created)
      throw new AppError("conflict:arm-name", "This project already has an arm with that name.", {
        issues: [{ path: "name", message: "is taken" }],
      });
    await recordAudit({
      actorId: actor.userId,
      action: "arm.create",
      targetType: "arm",
      targetId: created.armId,
      projectId,
    });
    return created;
  });
  return json({ arm: { id: created.armId, name: body.name, projectId }, revision: created.revision }, 201);
});
