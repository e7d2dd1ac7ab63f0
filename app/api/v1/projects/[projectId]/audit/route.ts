import { z } from "zod";
import { listProjectAudit } from "@/db/queries/audit";
import { json, readParams, route, uuidParam } from "@/lib/api";
import { loadProject, membershipOf } from "@/lib/api-load";
import { requireActor } from "@/lib/auth-request";
import { authorizeProject } from "@/lib/permissions";

const params = z.object({ projectId: uuidParam });

/** GET /api/v1/projects/:projectId/audit — the project's audit log, newest first (owners). */
export const GET = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "audit:read");
  return json({ entries: await listProjectAudit({ projectId, userId: actor.userId }) });
});
