import { inTransaction } from "@/lib/server/transaction";
import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { countOwners, listMembers, removeMember } from "@/db/queries/projects";
import { json, readParams, route, uuidParam } from "@/lib/server/route";
import { loadProject, membershipOf } from "@/lib/server/loaders";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { assertKeepsAnOwner, authorizeProject } from "@/lib/server/permissions";

const params = z.object({ projectId: uuidParam, userId: uuidParam });

/** DELETE /api/v1/projects/:projectId/members/:userId — remove a member (owners; never the last owner). */
export const DELETE = route(async (request, context) => {
  const { projectId, userId } = await readParams(context, params);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "member:manage");
  const target = (await listMembers({ projectId, userId: actor.userId })).find((m) => m.userId === userId);
  if (!target) throw new AppError("not_found:member", "That user is not a member of this project.");
  if (target.role === "owner")
    assertKeepsAnOwner({ currentRole: target.role, nextRole: null, ownerCount: await countOwners({ projectId }) });
  await inTransaction(async () => {
    await removeMember({ projectId, ownerId: actor.userId, userId });
    await recordAudit({
      actorId: actor.userId,
      action: "member.remove",
      targetType: "user",
      targetId: userId,
      projectId,
    });
  });
  return json({ removed: userId });
});
