import { z } from "zod";
import { inTransaction } from "@/lib/server/transaction";
import { recordAudit } from "@/db/queries/audit";
import { updateProject } from "@/db/queries/projects";
import { json, readJson, readParams, route, uuidParam } from "@/lib/server/route";
import { loadProject, membershipOf } from "@/lib/server/loaders";
import { updateProjectSchema } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";

const params = z.object({ projectId: uuidParam });

/** GET /api/v1/projects/:projectId */
export const GET = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "project:read");
  return json({ project });
});

/** PATCH /api/v1/projects/:projectId — rename and/or archive (owners). */
export const PATCH = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const body = await readJson(request, updateProjectSchema);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  const membership = membershipOf(project);
  if (body.archived !== undefined) authorizeProject(membership, "project:archive");
  // Un-archiving and renaming in one request: the rename is judged on the project as it will be.
  if (body.name !== undefined)
    authorizeProject({ ...membership, archived: body.archived ?? membership.archived }, "project:rename");
  // The rename and its audit entry commit together, or neither does.
  const updated = await inTransaction(async () => {
    const row = await updateProject({ projectId, userId: actor.userId, name: body.name, archived: body.archived });
    if (!row) throw new AppError("not_found:project", "No such project.");
    await recordAudit({
      actorId: actor.userId,
      action: "project.update",
      targetType: "project",
      targetId: projectId,
      projectId,
      detail: body,
    });
    return row;
  });
  return json({ project: { ...updated, role: project.role } });
});
