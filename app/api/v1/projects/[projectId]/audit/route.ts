import { z } from "zod";
import { listProjectAuditPage } from "@/db/queries/audit";
import { auditPageQuery } from "@/lib/server/paging";
import { json, readParams, readQuery, route, uuidParam } from "@/lib/server/route";
import { loadProject, membershipOf } from "@/lib/server/loaders";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeProject } from "@/lib/server/permissions";

const params = z.object({ projectId: uuidParam });

/** GET /api/v1/projects/:projectId/audit — one page of the project's audit log, newest first (owners). */
export const GET = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const query = readQuery(request, auditPageQuery);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "audit:read");
  const page = await listProjectAuditPage({ projectId, userId: actor.userId, limit: query.limit, after: query.cursor });
  return json({ entries: page.items, nextCursor: page.nextCursor });
});
