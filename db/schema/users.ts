import { sql } from "drizzle-orm";
import { check, index, pgEnum, pgTable, text, timestamp, uuid, boolean } from "drizzle-orm/pg-core";

/** A user's role on the whole site; project access comes from memberships (see projects.ts). */
export const siteRole = pgEnum("site_role", ["student", "researcher", "instructor", "admin"]);

export const users = pgTable(
  "users",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    /** Stored lower-cased so that sign-in is case-insensitive and unique. */
    email: text("email").notNull().unique(),
    name: text("name").notNull(),
    /** bcrypt hash (bcryptjs); never the password. */
    passwordHash: text("password_hash").notNull(),
    siteRole: siteRole("site_role").notNull().default("student"),
    /** Hook for the e-mail issue: set when the address has been confirmed. */
    emailVerifiedAt: timestamp("email_verified_at", { withTimezone: true }),
    /** A disabled user can no longer sign in, and their sessions and tokens stop working. */
    disabledAt: timestamp("disabled_at", { withTimezone: true }),
    /**
     * When the password last changed (null: never since sign-up). Session cookies issued before
     * this are refused (lib/server/auth-request.ts), so a reset signs out every other browser.
     */
    passwordChangedAt: timestamp("password_changed_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("users_email_lower", sql`${t.email} = lower(${t.email})`),
    check("users_email_shape", sql`${t.email} ~ '^[^@\\s]+@[^@\\s]+$'`),
    check("users_name_length", sql`char_length(${t.name}) between 1 and 120`),
  ],
);

/**
 * One row per sign-in attempt, kept in PostgreSQL (not in process memory) so that the
 * rate limit holds across several app servers.
 */
export const signInAttempts = pgTable(
  "sign_in_attempts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    email: text("email").notNull(),
    ip: text("ip"),
    succeeded: boolean("succeeded").notNull(),
    attemptedAt: timestamp("attempted_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("sign_in_attempts_email_time").on(t.email, t.attemptedAt)],
);

/**
 * Signed-out sessions: a session cookie carries its id (`sid`); sign-out records it here until the
 * cookie would have expired anyway, and every request refuses a cookie whose id is listed.
 */
export const revokedSessions = pgTable(
  "revoked_sessions",
  {
    sessionId: uuid("session_id").primaryKey(),
    userId: uuid("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
  },
  (t) => [index("revoked_sessions_expires").on(t.expiresAt)],
);

/**
 * One row per sign-up request, new address or not, so sign-up can be limited per address and per
 * client across app servers without revealing which addresses have accounts.
 */
export const signUpAttempts = pgTable(
  "sign_up_attempts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    email: text("email").notNull(),
    ip: text("ip"),
    attemptedAt: timestamp("attempted_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("sign_up_attempts_email_time").on(t.email, t.attemptedAt),
    index("sign_up_attempts_ip_time").on(t.ip, t.attemptedAt),
  ],
);

export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;
export type SiteRole = (typeof siteRole.enumValues)[number];
