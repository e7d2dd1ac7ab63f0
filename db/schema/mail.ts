import { sql } from "drizzle-orm";
import { check, index, integer, pgEnum, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";

/** Outbox state of one e-mail: waiting (or retrying), handed to the SMTP server, or given up. */
export const mailStatus = pgEnum("mail_status", ["queued", "sending", "sent", "failed"]);

/**
 * The e-mail outbox. A row is written in the same transaction as the action that causes it, so a
 * failing mail server never loses the message; the pg-boss worker (lib/server/mail/worker.ts) claims the
 * row, sends it and marks it sent, which is what makes each message go out once. `dedupeKey`
 * stops the same event from queueing two messages.
 */
export const mailOutbox = pgTable(
  "mail_outbox",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    kind: text("kind").notNull(),
    dedupeKey: text("dedupe_key").notNull().unique(),
    toAddress: text("to_address").notNull(),
    subject: text("subject").notNull(),
    text: text("text").notNull(),
    html: text("html").notNull(),
    status: mailStatus("status").notNull().default("queued"),
    attempts: integer("attempts").notNull().default(0),
    lastError: text("last_error"),
    /** A claim older than this is abandoned (the worker died mid-send) and may be taken again. */
    claimedUntil: timestamp("claimed_until", { withTimezone: true }),
    enqueuedAt: timestamp("enqueued_at", { withTimezone: true }),
    messageId: text("message_id"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    sentAt: timestamp("sent_at", { withTimezone: true }),
  },
  (t) => [
    check("mail_outbox_attempts_nonnegative", sql`${t.attempts} >= 0`),
    index("mail_outbox_status_time").on(t.status, t.createdAt),
  ],
);

export type MailOutboxRow = typeof mailOutbox.$inferSelect;
