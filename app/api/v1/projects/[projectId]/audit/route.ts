import { z } from "zod";
import { listProjectAudit } from "@/db/queries/audit";
import { json, readParams, route, uuidParam } from "@/lib/server/route";
import { loadProject, membershipOf } from "@/lib/server/loaders";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeProject } from "@/lib/server/permissions";

const params = z.object({ projectId: uuidParam });

/** GET /api/v1/projects/:projectId/audit — the project's audit log, newest first (owners). */
export const GET = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "audit:read");
  return json({ entries: await listProjectAudit({ projectId, userId: actor.userId }) });
});
