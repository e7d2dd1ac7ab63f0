import "server-only";
import { and, desc, eq, gt, isNull, or } from "drizzle-orm";
import { db } from "@/db";
import { apiTokens, users, type SiteRole } from "@/db/schema";
import { toPage, type Page, type PageAfter } from "@/lib/server/paging";
import { newestFirst, pageOrderBy, pastCursor, timestampPageKey } from "./paging";

export type TokenListItem = {
  id: string;
  name: string;
  prefix: string;
  createdAt: Date;
  lastUsedAt: Date | null;
  expiresAt: Date | null;
  revokedAt: Date | null;
};
const listColumns = {
  id: apiTokens.id,
  name: apiTokens.name,
  prefix: apiTokens.prefix,
  createdAt: apiTokens.createdAt,
  lastUsedAt: apiTokens.lastUsedAt,
  expiresAt: apiTokens.expiresAt,
  revokedAt: apiTokens.revokedAt,
};

export async function createApiToken(input: {
  userId: string;
  name: string;
  tokenHash: string;
  prefix: string;
  expiresAt: Date | null;
}): Promise<TokenListItem> {
  const [row] = await db.insert(apiTokens).values(input).returning(listColumns);
  return row;
}

const tokensOrder = newestFirst(apiTokens.createdAt, apiTokens.id);

/** The user's tokens, newest first (the tokens page shows them all). */
export async function listApiTokens({ userId }: { userId: string }): Promise<TokenListItem[]> {
  return db.select(listColumns).from(apiTokens).where(eq(apiTokens.userId, userId)).orderBy(desc(apiTokens.createdAt));
}

/** One page of the user's tokens, newest first. */
export async function listApiTokensPage({
  userId,
  limit,
  after,
}: {
  userId: string;
  limit: number;
  after?: PageAfter;
}): Promise<Page<TokenListItem>> {
  const rows = await db
    .select({ ...listColumns, pageKey: timestampPageKey(apiTokens.createdAt) })
    .from(apiTokens)
    .where(and(eq(apiTokens.userId, userId), pastCursor(tokensOrder, after)))
    .orderBy(...pageOrderBy(tokensOrder))
    .limit(limit + 1);
  return toPage(
    rows,
    limit,
    (r) => r.id,
    ({ pageKey: _key, ...token }) => token,
  );
}

/** Revokes one of the user's own tokens; undefined when it is not theirs or does not exist. */
export async function revokeApiToken({
  id,
  userId,
}: {
  id: string;
  userId: string;
}): Promise<TokenListItem | undefined> {
  const [row] = await db
    .update(apiTokens)
    .set({ revokedAt: new Date() })
    .where(and(eq(apiTokens.id, id), eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)))
    .returning(listColumns);
  return row;
}

/** The owner of a live token (not revoked, not expired, owner not disabled), and marks it used (to the minute). */
export async function getTokenOwner({
  tokenHash,
}: {
  tokenHash: string;
}): Promise<{ tokenId: string; userId: string; siteRole: SiteRole } | undefined> {
  const now = new Date();
  const [found] = await db
    .select({ tokenId: apiTokens.id, userId: users.id, siteRole: users.siteRole, lastUsedAt: apiTokens.lastUsedAt })
    .from(apiTokens)
    .innerJoin(users, eq(users.id, apiTokens.userId))
    .where(
      and(
        eq(apiTokens.tokenHash, tokenHash),
        isNull(apiTokens.revokedAt),
        or(isNull(apiTokens.expiresAt), gt(apiTokens.expiresAt, now)),
        isNull(users.disabledAt),
      ),
    );
  if (!found) return undefined;
  const { lastUsedAt, ...row } = found;
  // "Last used" is kept to the minute: a script calling many times a second would otherwise write
  // (and wait for) the same row on every request, one commit each, all queued on its lock.
  if (!lastUsedAt || now.getTime() - lastUsedAt.getTime() >= lastUsedPrecisionMs)
    await db.update(apiTokens).set({ lastUsedAt: now }).where(eq(apiTokens.id, row.tokenId));
  return row;
}

/** How stale a token's `lastUsedAt` may be before a request writes it again (ms). */
export const lastUsedPrecisionMs = 60_000;
