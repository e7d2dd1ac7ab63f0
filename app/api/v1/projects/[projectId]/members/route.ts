import { inTransaction } from "@/lib/server/transaction";
import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { countOwners, listMembers, listMembersPage, upsertMember } from "@/db/queries/projects";
import { memberPageQuery } from "@/lib/server/paging";
import { json, readJson, readParams, readQuery, route, uuidParam } from "@/lib/server/route";
import { loadProject, membershipOf } from "@/lib/server/loaders";
import { addMemberSchema } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { assertKeepsAnOwner, authorizeProject } from "@/lib/server/permissions";

const params = z.object({ projectId: uuidParam });

/** GET /api/v1/projects/:projectId/members — one page of the project's members, by e-mail. */
export const GET = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const query = readQuery(request, memberPageQuery);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "member:list");
  const page = await listMembersPage({ projectId, userId: actor.userId, limit: query.limit, after: query.cursor });
  return json({ members: page.items, nextCursor: page.nextCursor });
});

/** POST /api/v1/projects/:projectId/members — add a member by e-mail, or change their role (owners). */
export const POST = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const body = await readJson(request, addMemberSchema);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "member:manage");
  const existing = (await listMembers({ projectId, userId: actor.userId })).find((m) => m.email === body.email);
  if (existing?.role === "owner")
    assertKeepsAnOwner({
      currentRole: existing.role,
      nextRole: body.role,
      ownerCount: await countOwners({ projectId }),
    });
  const member = await inTransaction(async () => {
    const member = await upsertMember({ projectId, ownerId: actor.userId, email: body.email, role: body.role });
    if (!member)
      throw new AppError("unprocessable:unknown-user", "No active account has this e-mail.", {
        issues: [{ path: "email", message: "has no account" }],
      });
    await recordAudit({
      actorId: actor.userId,
      action: "member.set",
      targetType: "user",
      targetId: member.userId,
      projectId,
      detail: { role: body.role },
    });
    return member;
  });
  return json({ member }, existing ? 200 : 201);
});
