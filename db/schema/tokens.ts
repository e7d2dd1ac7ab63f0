import { sql } from "drizzle-orm";
import { check, index, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { users } from "./users";

/**
 * Personal API tokens, sent as `Authorization: Bearer …` (RFC 6750). Only the SHA-256
 * of the token is stored; the token itself is shown once, when it is created.
 */
export const apiTokens = pgTable(
  "api_tokens",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    userId: uuid("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    /** Hex SHA-256 of the whole token. */
    tokenHash: text("token_hash").notNull().unique(),
    /** The first characters of the token, so a user can tell tokens apart in a list. */
    prefix: text("prefix").notNull(),
    lastUsedAt: timestamp("last_used_at", { withTimezone: true }),
    expiresAt: timestamp("expires_at", { withTimezone: true }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("api_tokens_name_length", sql`char_length(${t.name}) between 1 and 80`),
    check("api_tokens_hash_hex", sql`${t.tokenHash} ~ '^[0-9a-f]{64}$'`),
    index("api_tokens_user").on(t.userId),
  ],
);

export type ApiToken = typeof apiTokens.$inferSelect;
