import { index, pgEnum, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { users } from "./users";

/** What an account e-mail token is for. */
export const accountTokenPurpose = pgEnum("account_token_purpose", ["password-reset", "email-verification"]);

/** One-time tokens sent by e-mail for a password reset or an address verification; stored hashed. */
export const accountTokens = pgTable(
  "account_tokens",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    userId: uuid("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    purpose: accountTokenPurpose("purpose").notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    usedAt: timestamp("used_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("account_tokens_user_purpose").on(t.userId, t.purpose)],
);

export type AccountTokenPurpose = (typeof accountTokenPurpose.enumValues)[number];
