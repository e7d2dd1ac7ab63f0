import "server-only";
import { and, eq, gt, isNull, sql } from "drizzle-orm";
import { db } from "@/db";
import { accountTokens, type AccountTokenPurpose } from "@/db/schema/account-tokens";
import { users } from "@/db/schema/users";

/** Stores a one-time account token (hashed) for a user found by e-mail; undefined when no active user has it. */
export async function createAccountToken({
  email,
  purpose,
  tokenHash,
  expiresAt,
}: {
  email: string;
  purpose: AccountTokenPurpose;
  tokenHash: string;
  expiresAt: Date;
}): Promise<{ userId: string; name: string; email: string } | undefined> {
  return db.transaction(async (tx) => {
    const [user] = await tx
      .select({ id: users.id, name: users.name, email: users.email })
      .from(users)
      .where(and(eq(users.email, email), isNull(users.disabledAt)));
    if (!user) return undefined;
    await tx.insert(accountTokens).values({ userId: user.id, purpose, tokenHash, expiresAt });
    return { userId: user.id, name: user.name, email: user.email };
  });
}

/** Uses a token once: unexpired, unused, for this purpose. Returns its user id, or undefined. */
export async function consumeAccountToken({
  tokenHash,
  purpose,
}: {
  tokenHash: string;
  purpose: AccountTokenPurpose;
}): Promise<string | undefined> {
  const [row] = await db
    .update(accountTokens)
    .set({ usedAt: new Date() })
    .where(
      and(
        eq(accountTokens.tokenHash, tokenHash),
        eq(accountTokens.purpose, purpose),
        isNull(accountTokens.usedAt),
        gt(accountTokens.expiresAt, sql`now()`),
      ),
    )
    .returning({ userId: accountTokens.userId });
  return row?.userId;
}

/** Marks the user's address as verified (after `consumeAccountToken` for `email-verification`). */
export async function markEmailVerified({ userId }: { userId: string }): Promise<void> {
  await db
    .update(users)
    .set({ emailVerifiedAt: new Date() })
    .where(and(eq(users.id, userId), isNull(users.emailVerifiedAt)));
}
