import { inTransaction } from "@/lib/server/transaction";
import { recordAudit } from "@/db/queries/audit";
import { createProject, listProjectsPageForUser } from "@/db/queries/projects";
import { json, readJson, readQuery, route } from "@/lib/server/route";
import { createProjectSchema } from "@/lib/shared/schemas/api";
import { projectsPageQuery } from "@/lib/server/paging";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeSite } from "@/lib/server/permissions";

/**
 * GET /api/v1/projects — one page of the caller's projects, newest activity first
 * (`?archived=include` adds archived ones; `?limit=&cursor=` pages, `nextCursor` null on the last page).
 */
export const GET = route(async (request) => {
  const query = readQuery(request, projectsPageQuery);
  const actor = await requireActor(request);
  const page = await listProjectsPageForUser({
    userId: actor.userId,
    includeArchived: query.archived === "include",
    limit: query.limit,
    after: query.cursor,
  });
  return json({ projects: page.items, nextCursor: page.nextCursor });
});

/** POST /api/v1/projects — a new project with the caller as owner; course projects need an instructor. */
export const POST = route(async (request) => {
  const body = await readJson(request, createProjectSchema);
  const actor = await requireActor(request);
  authorizeSite(actor, body.kind === "course" ? "project:create-course" : "project:create");
  const project = await inTransaction(async () => {
    const project = await createProject({ name: body.name, kind: body.kind, userId: actor.userId });
    await recordAudit({
      actorId: actor.userId,
      action: "project.create",
      targetType: "project",
      targetId: project.id,
      projectId: project.id,
    });
    return project;
  });
  return json({ project }, 201);
});
