import { recordAudit } from "@/db/queries/audit";
import { createProject, listProjectsForUser } from "@/db/queries/projects";
import { json, readJson, readQuery, route } from "@/lib/server/route";
import { createProjectSchema, listProjectsQuery } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeSite } from "@/lib/server/permissions";

/** GET /api/v1/projects — the caller's projects (`?archived=include` adds archived ones). */
export const GET = route(async (request) => {
  const query = readQuery(request, listProjectsQuery);
  const actor = await requireActor(request);
  const projects = await listProjectsForUser({ userId: actor.userId, includeArchived: query.archived === "include" });
  return json({ projects });
});

/** POST /api/v1/projects — a new project with the caller as owner; course projects need an instructor. */
export const POST = route(async (request) => {
  const body = await readJson(request, createProjectSchema);
  const actor = await requireActor(request);
  authorizeSite(actor, body.kind === "course" ? "project:create-course" : "project:create");
  const project = await createProject({ name: body.name, kind: body.kind, userId: actor.userId });
  await recordAudit({ actorId: actor.userId, action: "project.create", targetType: "project", targetId: project.id, projectId: project.id });
  return json({ project }, 201);
});
