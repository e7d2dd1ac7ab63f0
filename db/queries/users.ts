import "server-only";
import { and, asc, count, eq, gt, gte, isNull, sql } from "drizzle-orm";
import { db } from "@/db";
import {
  accountTokens,
  revokedSessions,
  signInAttempts,
  signUpAttempts,
  users,
  type SiteRole,
  type User,
} from "@/db/schema";

/** The public view of a user: never the password hash. */
export type PublicUser = Pick<User, "id" | "email" | "name" | "siteRole" | "createdAt" | "disabledAt">;
/** What a session check needs: the public view plus when the password last changed. */
export type SessionUser = PublicUser & Pick<User, "passwordChangedAt">;
const publicColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  siteRole: users.siteRole,
  createdAt: users.createdAt,
  disabledAt: users.disabledAt,
};

/** For sign-in only: the user with this (lower-cased) e-mail, including the hash. */
export async function getUserForSignIn({ email }: { email: string }): Promise<User | undefined> {
  const [row] = await db.select().from(users).where(eq(users.email, email.toLowerCase()));
  return row;
}

/** An enabled user by id (sessions are re-checked against this on every request). */
export async function getActiveUserById({ id }: { id: string }): Promise<PublicUser | undefined> {
  const [row] = await db
    .select(publicColumns)
    .from(users)
    .where(and(eq(users.id, id), isNull(users.disabledAt)));
  return row;
}

/**
 * The session cookie check (lib/server/auth-request.ts): an enabled user by id, with when their
 * password last changed, provided the session `sessionId` has not been signed out.
 */
export async function getSessionUserById({
  id,
  sessionId,
}: {
  id: string;
  sessionId: string;
}): Promise<SessionUser | undefined> {
  const [row] = await db
    .select({ ...publicColumns, passwordChangedAt: users.passwordChangedAt })
    .from(users)
    .where(
      and(
        eq(users.id, id),
        isNull(users.disabledAt),
        sql`not exists (select 1 from ${revokedSessions} where ${revokedSessions.sessionId} = ${sessionId} and ${revokedSessions.userId} = ${users.id})`,
      ),
    );
  return row;
}

/** Records a signed-out session until its cookie would have expired; a second sign-out is a no-op. Old rows are pruned on the way. */
export async function revokeSession({
  sessionId,
  userId,
  expiresAt,
}: {
  sessionId: string;
  userId: string;
  expiresAt: Date;
}): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.insert(revokedSessions).values({ sessionId, userId, expiresAt }).onConflictDoNothing();
    await tx.delete(revokedSessions).where(sql`${revokedSessions.expiresAt} < now()`);
  });
}

/** Records a sign-up request (new address or not) for the per-address and per-client limits. */
export async function recordSignUpAttempt({ email, ip }: { email: string; ip: string | null }): Promise<void> {
  await db.insert(signUpAttempts).values({ email: email.toLowerCase(), ip });
}

/** Sign-up requests for one address, and from one client, since a moment. */
export async function countSignUpAttempts({
  email,
  ip,
  since,
}: {
  email: string;
  ip: string | null;
  since: Date;
}): Promise<{ byEmail: number; byIp: number }> {
  const [row] = await db
    .select({
      byEmail: sql<number>`count(*) filter (where ${signUpAttempts.email} = ${email.toLowerCase()})`.mapWith(Number),
      byIp: sql<number>`count(*) filter (where ${ip !== null} and ${signUpAttempts.ip} = ${ip ?? ""})`.mapWith(Number),
    })
    .from(signUpAttempts)
    .where(gte(signUpAttempts.attemptedAt, since));
  return { byEmail: row?.byEmail ?? 0, byIp: row?.byIp ?? 0 };
}

/** Creates a user; returns undefined when the e-mail is already taken. */
export async function createUser(input: {
  email: string;
  name: string;
  passwordHash: string;
  siteRole: SiteRole;
}): Promise<PublicUser | undefined> {
  const [row] = await db
    .insert(users)
    .values({ ...input, email: input.email.toLowerCase() })
    .onConflictDoNothing({ target: users.email })
    .returning(publicColumns);
  return row;
}

export async function listUsers(): Promise<PublicUser[]> {
  return db.select(publicColumns).from(users).orderBy(asc(users.email));
}

export async function getUserById({ id }: { id: string }): Promise<PublicUser | undefined> {
  const [row] = await db.select(publicColumns).from(users).where(eq(users.id, id));
  return row;
}

export async function updateUserByAdmin({
  id,
  siteRole,
  disabled,
}: {
  id: string;
  siteRole?: SiteRole;
  disabled?: boolean;
}): Promise<PublicUser | undefined> {
  const [row] = await db
    .update(users)
    .set({
      ...(siteRole ? { siteRole } : {}),
      ...(disabled === undefined ? {} : { disabledAt: disabled ? new Date() : null }),
    })
    .where(eq(users.id, id))
    .returning(publicColumns);
  return row;
}

export async function recordSignInAttempt(input: {
  email: string;
  ip: string | null;
  succeeded: boolean;
}): Promise<void> {
  await db.insert(signInAttempts).values({ ...input, email: input.email.toLowerCase() });
}

/** Failed sign-in attempts for an e-mail since a moment (the rate limit's window). */
export async function countFailedSignIns({ email, since }: { email: string; since: Date }): Promise<number> {
  const [row] = await db
    .select({ n: count() })
    .from(signInAttempts)
    .where(
      and(
        eq(signInAttempts.email, email.toLowerCase()),
        eq(signInAttempts.succeeded, false),
        gte(signInAttempts.attemptedAt, since),
      ),
    );
  return row?.n ?? 0;
}

/** Failed sign-in attempts from one address since a moment, across all e-mails. */
export async function countFailedSignInsFromIp({ ip, since }: { ip: string; since: Date }): Promise<number> {
  const [row] = await db
    .select({ n: count() })
    .from(signInAttempts)
    .where(and(eq(signInAttempts.ip, ip), eq(signInAttempts.succeeded, false), gte(signInAttempts.attemptedAt, since)));
  return row?.n ?? 0;
}

/** Failed attempts counted for a back-off, and when the latest was. */
export type SignInFailures = { failures: number; lastFailureAt: Date | null };

/**
 * Failed sign-in attempts for one e-mail since a moment and after its latest successful sign-in
 * (a correct password ends the back-off), with the time of the latest.
 */
export async function recentFailedSignInsForEmail({
  email,
  since,
}: {
  email: string;
  since: Date;
}): Promise<SignInFailures> {
  const e = email.toLowerCase();
  const [row] = await db
    .select({ n: count(), last: sql<string | null>`max(${signInAttempts.attemptedAt})` })
    .from(signInAttempts)
    .where(
      and(
        eq(signInAttempts.email, e),
        eq(signInAttempts.succeeded, false),
        gte(signInAttempts.attemptedAt, since),
        sql`${signInAttempts.attemptedAt} > coalesce((select max(s.attempted_at) from sign_in_attempts s where s.email = ${e} and s.succeeded), '-infinity'::timestamptz)`,
      ),
    );
  return { failures: row?.n ?? 0, lastFailureAt: row?.last ? new Date(row.last) : null };
}

/** Failed sign-in attempts from one client address since a moment, across all e-mails, with the latest's time. */
export async function recentFailedSignInsFromIp({ ip, since }: { ip: string; since: Date }): Promise<SignInFailures> {
  const [row] = await db
    .select({ n: count(), last: sql<string | null>`max(${signInAttempts.attemptedAt})` })
    .from(signInAttempts)
    .where(and(eq(signInAttempts.ip, ip), eq(signInAttempts.succeeded, false), gte(signInAttempts.attemptedAt, since)));
  return { failures: row?.n ?? 0, lastFailureAt: row?.last ? new Date(row.last) : null };
}

/**
 * Sets a new password with a one-time reset token, in one transaction: the token is used up, the
 * hash and `passwordChangedAt` change together (so no moment exists where the new password works
 * and old sessions still do), and the account's other reset links are voided. Returns the user id,
 * or undefined for an unknown, used or expired token (or a disabled account).
 * It lives here rather than next to the other token queries because it is the password's writer.
 */
export async function setPasswordWithResetToken({
  tokenHash,
  passwordHash,
}: {
  tokenHash: string;
  passwordHash: string;
}): Promise<string | undefined> {
  return db.transaction(async (tx) => {
    const [token] = await tx
      .update(accountTokens)
      .set({ usedAt: new Date() })
      .where(
        and(
          eq(accountTokens.tokenHash, tokenHash),
          eq(accountTokens.purpose, "password-reset"),
          isNull(accountTokens.usedAt),
          gt(accountTokens.expiresAt, sql`now()`),
        ),
      )
      .returning({ userId: accountTokens.userId });
    if (!token) return undefined;
    const [user] = await tx
      .update(users)
      .set({ passwordHash, passwordChangedAt: sql`now()` })
      .where(and(eq(users.id, token.userId), isNull(users.disabledAt)))
      .returning({ id: users.id });
    // A disabled account keeps its password (its token is spent all the same, which is harmless).
    if (!user) return undefined;
    await tx
      .update(accountTokens)
      .set({ usedAt: new Date() })
      .where(
        and(
          eq(accountTokens.userId, token.userId),
          eq(accountTokens.purpose, "password-reset"),
          isNull(accountTokens.usedAt),
        ),
      );
    return token.userId;
  });
}

/**
 * Reset e-mails issued to the active account with this (lower-cased) address since a moment:
 * the reset request limit's count. Each e-mail has exactly one token row, so counting tokens
 * counts e-mails; an unknown address has none (and is sent nothing anyway).
 */
export async function countPasswordResetsSince({ email, since }: { email: string; since: Date }): Promise<number> {
  const [row] = await db
    .select({ n: count() })
    .from(accountTokens)
    .innerJoin(users, eq(users.id, accountTokens.userId))
    .where(
      and(
        eq(users.email, email.toLowerCase()),
        eq(accountTokens.purpose, "password-reset"),
        gte(accountTokens.createdAt, since),
      ),
    );
  return row?.n ?? 0;
}
