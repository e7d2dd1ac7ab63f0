import "server-only";
import { and, desc, eq, inArray, isNull, lt, or, sql } from "drizzle-orm";
import { db } from "@/db";
import { mailOutbox, type MailOutboxRow } from "@/db/schema/mail";

/** A Drizzle transaction (or the client itself): outbox rows are written inside the action's transaction. */
export type Tx = Parameters<Parameters<typeof db.transaction>[0]>[0];

/** One message to queue; `dedupeKey` names the event (e.g. `submission-received:<id>:<instructor>`). */
export type OutboxInput = {
  kind: string;
  dedupeKey: string;
  toAddress: string;
  subject: string;
  text: string;
  html: string;
};

/** Queues messages in the caller's transaction; an event already queued adds nothing. Returns the new rows' ids. */
export async function insertOutbox(tx: Tx, rows: OutboxInput[]): Promise<string[]> {
  if (rows.length === 0) return [];
  const inserted = await tx
    .insert(mailOutbox)
    .values(rows)
    .onConflictDoNothing({ target: mailOutbox.dedupeKey })
    .returning({ id: mailOutbox.id });
  return inserted.map((r) => r.id);
}

/** Queues messages outside any other write (invitations, account e-mails). */
export async function queueMail(rows: OutboxInput[]): Promise<string[]> {
  return db.transaction((tx) => insertOutbox(tx, rows));
}

/**
 * Claims one message for sending: only a queued message, or one whose earlier claim expired (its
 * worker died), can be claimed, and only by one worker at a time — the UPDATE's WHERE is the lock.
 */
export async function claimOutbox({ id, leaseS }: { id: string; leaseS: number }): Promise<MailOutboxRow | undefined> {
  const [row] = await db
    .update(mailOutbox)
    .set({
      status: "sending",
      attempts: sql`${mailOutbox.attempts} + 1`,
      claimedUntil: sql`now() + make_interval(secs => ${leaseS})`,
    })
    .where(
      and(
        eq(mailOutbox.id, id),
        or(
          eq(mailOutbox.status, "queued"),
          and(eq(mailOutbox.status, "sending"), lt(mailOutbox.claimedUntil, sql`now()`)),
        ),
      ),
    )
    .returning();
  return row;
}

/** Marks a claimed message as handed to the SMTP server. */
export async function markOutboxSent({ id, messageId }: { id: string; messageId: string }): Promise<void> {
  await db
    .update(mailOutbox)
    .set({ status: "sent", sentAt: new Date(), messageId, claimedUntil: null, lastError: null })
    .where(and(eq(mailOutbox.id, id), eq(mailOutbox.status, "sending")));
}

/** Releases a claimed message after a failed attempt: queued again for the next retry, or failed for good. */
export async function markOutboxAttemptFailed({
  id,
  error,
  final,
}: {
  id: string;
  error: string;
  final: boolean;
}): Promise<void> {
  await db
    .update(mailOutbox)
    .set({ status: final ? "failed" : "queued", lastError: error.slice(0, 1000), claimedUntil: null })
    .where(and(eq(mailOutbox.id, id), eq(mailOutbox.status, "sending")));
}

/** Messages waiting whose job was never created (the enqueue after commit failed) or is older than `staleBefore`. */
export async function listOutboxToEnqueue({
  staleBefore,
  limit = 100,
}: {
  staleBefore: Date;
  limit?: number;
}): Promise<string[]> {
  const rows = await db
    .select({ id: mailOutbox.id })
    .from(mailOutbox)
    .where(
      and(eq(mailOutbox.status, "queued"), or(isNull(mailOutbox.enqueuedAt), lt(mailOutbox.enqueuedAt, staleBefore))),
    )
    .orderBy(mailOutbox.createdAt)
    .limit(limit);
  return rows.map((r) => r.id);
}

export async function markOutboxEnqueued({ ids }: { ids: string[] }): Promise<void> {
  if (ids.length === 0) return;
  await db.update(mailOutbox).set({ enqueuedAt: new Date() }).where(inArray(mailOutbox.id, ids));
}

/** The newest outbox rows, for the development mail page. */
export async function listOutbox({ limit = 100 }: { limit?: number } = {}): Promise<MailOutboxRow[]> {
  return db.select().from(mailOutbox).orderBy(desc(mailOutbox.createdAt)).limit(limit);
}

export async function getOutboxById({ id }: { id: string }): Promise<MailOutboxRow | undefined> {
  const [row] = await db.select().from(mailOutbox).where(eq(mailOutbox.id, id));
  return row;
}
