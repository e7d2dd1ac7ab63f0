import { z } from "zod";
import { inTransaction } from "@/lib/server/transaction";
import { recordAudit } from "@/db/queries/audit";
import { revokeApiToken } from "@/db/queries/tokens";
import { json, readParams, route, uuidParam } from "@/lib/server/route";
import { assertNotToken, requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeSite } from "@/lib/server/permissions";

const params = z.object({ tokenId: uuidParam });

/** DELETE /api/v1/tokens/:tokenId — revokes one of the caller's tokens, effective at once. */
export const DELETE = route(async (request, context) => {
  const { tokenId } = await readParams(context, params);
  const actor = await requireActor(request);
  assertNotToken(actor, "manage API tokens");
  authorizeSite(actor, "token:manage");
  const token = await inTransaction(async () => {
    const revoked = await revokeApiToken({ id: tokenId, userId: actor.userId });
    if (!revoked) throw new AppError("not_found:token", "No such live token.");
    await recordAudit({ actorId: actor.userId, action: "token.revoke", targetType: "api_token", targetId: tokenId });
    return revoked;
  });
  return json({ token });
});
