import { z } from "zod";
import { listArmRevisions } from "@/db/queries/arms";
import { json, readParams, route, uuidParam } from "@/lib/server/route";
import { loadArm } from "@/lib/server/loaders";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeProject, authorizeSite } from "@/lib/server/permissions";

const params = z.object({ armId: uuidParam });

/** GET /api/v1/arms/:armId — the arm and its revisions, newest first. */
export const GET = route(async (request, context) => {
  const { armId } = await readParams(context, params);
  const actor = await requireActor(request);
  const arm = await loadArm(actor, armId);
  if (arm.role === null) authorizeSite(actor, "arm:read-builtin");
  else authorizeProject({ role: arm.role, archived: arm.projectArchived }, "arm:read");
  return json({ arm, revisions: await listArmRevisions({ armId, userId: actor.userId }) });
});
