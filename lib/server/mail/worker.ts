/**
 * The mail worker: takes "send outbox row X" jobs from pg-boss and sends each row exactly once.
 *
 * Exactly once: a row is claimed by a compare-and-set UPDATE (queued → sending, with a lease), so
 * two jobs for the same row — a duplicate enqueue, the sweep, a retry after an expired job — never
 * both send it; a sent row is never claimed again. A failed attempt puts the row back to queued and
 * throws, and pg-boss retries the job with exponential back-off. The one window left is a worker
 * dying after the SMTP server accepted the message and before the row is marked sent: the lease
 * expires and the message goes out again with the same Message-ID (see transport.ts).
 */
import type PgBoss from "pg-boss";
import { claimOutbox, listOutboxToEnqueue, markOutboxAttemptFailed, markOutboxSent } from "@/db/queries/mail";
import { enqueueMail, getBoss, JOB_EXPIRE_S, MAIL_QUEUE } from "./queue";
import { deliver } from "./transport";

/** A claim outlives any single SMTP attempt (timeouts in transport.ts) but not a lost job. */
const CLAIM_LEASE_S = 60;

type MailJob = { outboxId: string };

/** Sends one outbox row if it is still to be sent; throws (so pg-boss retries) when the attempt fails. */
export async function sendOutboxRow(outboxId: string, isLastAttempt: boolean): Promise<"sent" | "skipped"> {
  const row = await claimOutbox({ id: outboxId, leaseS: CLAIM_LEASE_S });
  if (!row) return "skipped"; // already sent, given up, or being sent by another worker right now
  try {
    const messageId = await deliver(row);
    await markOutboxSent({ id: row.id, messageId });
    return "sent";
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    await markOutboxAttemptFailed({ id: row.id, error: message, final: isLastAttempt });
    throw err;
  }
}

/** Enqueues rows that have no job (the enqueue after their commit failed) or whose job is long gone. */
export async function sweepOutbox(): Promise<number> {
  const neverEnqueued = await listOutboxToEnqueue({ staleBefore: new Date(0) });
  await enqueueMail(neverEnqueued);
  // A queued row enqueued long ago has lost its job (deleted, or retries given up by pg-boss alone).
  const stale = await listOutboxToEnqueue({ staleBefore: new Date(Date.now() - 4 * JOB_EXPIRE_S * 1000) });
  await enqueueMail(stale, { jobId: "fresh" });
  return neverEnqueued.length + stale.length;
}

export type MailWorker = { stop: () => Promise<void> };

/** Starts working the mail queue in this process; `stop` waits for the job in hand. */
export async function startMailWorker({
  pollingIntervalSeconds = 1,
  sweepIntervalMs = 30_000,
}: { pollingIntervalSeconds?: number; sweepIntervalMs?: number } = {}): Promise<MailWorker> {
  const boss = await getBoss({ supervise: true });
  const workerId = await boss.work<MailJob>(
    MAIL_QUEUE,
    { batchSize: 1, includeMetadata: true, pollingIntervalSeconds },
    async (jobs: PgBoss.JobWithMetadata<MailJob>[]) => {
      for (const job of jobs) {
        await sendOutboxRow(job.data.outboxId, job.retryCount >= job.retryLimit);
      }
    },
  );
  const sweep = () => {
    sweepOutbox().catch((err: unknown) =>
      console.error("[mail] sweep failed:", err instanceof Error ? err.message : err),
    );
  };
  sweep();
  const timer = setInterval(sweep, sweepIntervalMs);
  return {
    stop: async () => {
      clearInterval(timer);
      await boss.offWork({ id: workerId });
    },
  };
}
