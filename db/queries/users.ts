import "server-only";
import { and, asc, count, eq, gte, isNull } from "drizzle-orm";
import { db } from "@/db";
import { signInAttempts, users, type SiteRole, type User } from "@/db/schema";

/** The public view of a user: never the password hash. */
export type PublicUser = Pick<User, "id" | "email" | "name" | "siteRole" | "createdAt" | "disabledAt">;
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

export async function recordSignInAttempt(input: { email: string; ip: string | null; succeeded: boolean }): Promise<void> {
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
