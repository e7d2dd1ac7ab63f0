/**
 * The mail queue on pg-boss (jobs in PostgreSQL). The outbox row is the source of truth and is
 * written in the action's own transaction; a job only says "try to send outbox row X now". The
 * first job for a row has the row's id as its job id, so enqueueing twice creates one job. If
 * enqueueing fails after the commit, the worker's sweep finds the row and enqueues it.
 */
import PgBoss from "pg-boss";
import { markOutboxEnqueued } from "@/db/queries/mail";
import { env } from "@/lib/server/env";
import { mailEnv } from "./config";

export const MAIL_QUEUE = "mail-send";

/** How long a job may run before pg-boss treats it as lost and retries it. */
export const JOB_EXPIRE_S = 120;

const globalForBoss = globalThis as unknown as { jointproofBoss?: Promise<PgBoss> };

/**
 * One started pg-boss client per process, used to enqueue (and by the worker to work). Its own
 * small pool; maintenance is left to the worker process (`supervise` there).
 */
export function getBoss({ supervise = false }: { supervise?: boolean } = {}): Promise<PgBoss> {
  globalForBoss.jointproofBoss ??= (async () => {
    const boss = new PgBoss({
      connectionString: env().DATABASE_URL,
      max: 3,
      supervise,
      schedule: false,
      application_name: "jointproof-mail",
    });
    boss.on("error", (err) => console.error("[mail] queue error:", err.message));
    await boss.start();
    await boss.createQueue(MAIL_QUEUE);
    return boss;
  })().catch((err: unknown) => {
    globalForBoss.jointproofBoss = undefined;
    throw err;
  });
  return globalForBoss.jointproofBoss;
}

/** Stops this process's pg-boss client (tests, worker shutdown). */
export async function stopBoss(): Promise<void> {
  const pending = globalForBoss.jointproofBoss;
  globalForBoss.jointproofBoss = undefined;
  if (pending) await (await pending).stop({ graceful: true, wait: true, timeout: 5_000 });
}

/** The retry policy of a mail job: exponential back-off from MAIL_RETRY_DELAY_S. */
export function retryOptions() {
  const e = mailEnv();
  return {
    retryLimit: e.MAIL_RETRY_LIMIT,
    retryDelay: e.MAIL_RETRY_DELAY_S,
    retryBackoff: true,
    expireInSeconds: JOB_EXPIRE_S,
  };
}

/**
 * Asks the worker to send these outbox rows. Never throws: the rows are already committed, and a
 * row whose job could not be created is picked up by the worker's sweep.
 */
export async function enqueueMail(ids: string[], options: { jobId?: "row" | "fresh" } = {}): Promise<void> {
  if (ids.length === 0) return;
  try {
    const boss = await getBoss();
    for (const id of ids) {
      await boss.send(
        MAIL_QUEUE,
        { outboxId: id },
        { ...retryOptions(), ...(options.jobId === "fresh" ? {} : { id }) },
      );
    }
    await markOutboxEnqueued({ ids });
  } catch (err) {
    console.error("[mail] could not enqueue (the sweep will retry):", err instanceof Error ? err.message : err);
  }
}
