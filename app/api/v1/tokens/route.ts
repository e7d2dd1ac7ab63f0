import { inTransaction } from "@/lib/server/transaction";
import { recordAudit } from "@/db/queries/audit";
import { createApiToken, listApiTokensPage } from "@/db/queries/tokens";
import { timePageQuery } from "@/lib/server/paging";
import { json, readJson, readQuery, route } from "@/lib/server/route";
import { createTokenSchema } from "@/lib/shared/schemas/api";
import { assertNotToken, requireActor } from "@/lib/server/auth-request";
import { authorizeSite } from "@/lib/server/permissions";
import { generateToken } from "@/lib/server/tokens";

/** GET /api/v1/tokens — one page of the caller's API tokens, newest first (never the tokens themselves). */
export const GET = route(async (request) => {
  const query = readQuery(request, timePageQuery);
  const actor = await requireActor(request);
  assertNotToken(actor, "manage API tokens");
  authorizeSite(actor, "token:manage");
  const page = await listApiTokensPage({ userId: actor.userId, limit: query.limit, after: query.cursor });
  return json({ tokens: page.items, nextCursor: page.nextCursor });
});

/** POST /api/v1/tokens — a new token, returned once in `token`; only its SHA-256 is stored. */
export const POST = route(async (request) => {
  const body = await readJson(request, createTokenSchema);
  const actor = await requireActor(request);
  assertNotToken(actor, "manage API tokens");
  authorizeSite(actor, "token:manage");
  const { token, hash, prefix } = generateToken();
  const expiresAt = body.expiresInDays ? new Date(Date.now() + body.expiresInDays * 86_400_000) : null;
  const row = await inTransaction(async () => {
    const created = await createApiToken({ userId: actor.userId, name: body.name, tokenHash: hash, prefix, expiresAt });
    await recordAudit({ actorId: actor.userId, action: "token.create", targetType: "api_token", targetId: created.id });
    return created;
  });
  return json({ token, ...row }, 201);
});
