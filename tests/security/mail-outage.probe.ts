/**
 * The mail server stopped while students submit through the real server: every submission is
 * saved (201) while mail is down, and once the SMTP fake is back each queued message is delivered
 * exactly once. The probe runs its own SMTP fake (scripts/fakes/smtp.ts, restarted on the same
 * port) and its own mail worker process (lib/server/mail/run-worker.ts) pointed at it. When
 * `npm test` runs a shared worker too, a message may leave through that one (to MAIL_FAKE_DIR's
 * fake), so copies are counted over both mailboxes.
 */
import "./_env";
import { spawn, type ChildProcess } from "node:child_process";
import { mkdtemp } from "node:fs/promises";
import { mkdirSync, openSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { inArray, like } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "@/db";
import { mailOutbox } from "@/db/schema/mail";
import { messageIdFor } from "@/lib/server/mail/transport";
import { readFakeMailbox, startFakeSmtp, type FakeSmtp } from "@/scripts/fakes/smtp";
import { baseMovePlan, courseWithAssignment, studentPlan } from "../integration/courses/_fixtures";
import { http, makeUser, sessionCookieFor } from "./_probe";

const STUDENTS = 5;
let dir = "";
let fake: FakeSmtp | undefined;
let port = 0;
let worker: ChildProcess | undefined;

async function waitUntil<T>(read: () => Promise<T>, ok: (v: T) => boolean, timeoutMs: number, what: string) {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const v = await read();
    if (ok(v)) return v;
    if (Date.now() > until) throw new Error(`${what} not within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

/**
 * `npm test`'s shared mail worker (its pid in JP_SHARED_MAIL_WORKER_PID) would send this probe's
 * messages through the shared fake, which stays up, so the outage would never be met: it is paused
 * (SIGSTOP) for the probe and resumed after.
 */
const sharedWorker = Number(process.env.JP_SHARED_MAIL_WORKER_PID) || 0;

beforeAll(async () => {
  if (sharedWorker) process.kill(sharedWorker, "SIGSTOP");
  dir = await mkdtemp(path.join(tmpdir(), "jp-probe-mail-"));
  fake = await startFakeSmtp({ dir });
  port = fake.port;
  mkdirSync(".data/test", { recursive: true });
  const logFile = `.data/test/probe-mail-worker-${process.env.JP_TEST_PORT ?? 3100}.log`;
  const out = openSync(logFile, "w");
  worker = spawn(process.execPath, ["--conditions=react-server", "--import", "tsx", "lib/server/mail/run-worker.ts"], {
    env: {
      ...process.env,
      SMTP_HOST: "127.0.0.1",
      SMTP_PORT: String(port),
      MAIL_FAKE_DIR: dir,
      MAIL_RETRY_DELAY_S: "1",
    },
    stdio: ["ignore", out, out],
  });
  await waitUntil(
    async () => readFileSync(logFile, "utf8"),
    (log) => log.includes("worker ready") || worker?.exitCode != null,
    30_000,
    "the mail worker's ready line",
  );
  if (worker.exitCode != null) throw new Error(`the mail worker exited; see ${logFile}`);
}, 60_000);

afterAll(async () => {
  if (sharedWorker) process.kill(sharedWorker, "SIGCONT");
  await fake?.stop();
  if (worker && worker.exitCode == null) {
    const exited = new Promise((r) => worker!.once("exit", r));
    worker.kill("SIGTERM");
    await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
    if (worker.exitCode == null) worker.kill("SIGKILL");
  }
});

describe("mail server stopped during submissions", () => {
  it(`${STUDENTS} submissions saved while mail is down; each message delivered exactly once after it returns`, async () => {
    const instructor = await makeUser("instructor", "mail-probe");
    const students = await Promise.all(Array.from({ length: STUDENTS }, (_, i) => makeUser("student", `mail-${i}`)));
    const { assignment } = await courseWithAssignment(
      instructor.id,
      students.map((s) => s.id),
    );
    const plans = await Promise.all(students.map((s) => studentPlan(s.id, [baseMovePlan(2)])));

    await fake!.stop();
    fake = undefined;
    const submissionIds: string[] = [];
    for (const [i, s] of students.entries()) {
      const res = await http(`/api/v1/assignments/${assignment.id}/submissions`, {
        auth: { cookie: await sessionCookieFor(s.id) },
        json: { planId: plans[i].planId, versionNumber: 1 },
      });
      expect(res.status, res.text).toBe(201);
      submissionIds.push((res.body as { submission: { id: string } }).submission.id);
    }
    const keys = submissionIds.map((id) => `submission-received:${id}:${instructor.id}`);
    const outbox = () => db.select().from(mailOutbox).where(inArray(mailOutbox.dedupeKey, keys));
    // let the worker try against the closed port, until a failed attempt is recorded (an attempt is
    // counted when the worker claims the message, before its delivery fails: waiting for the count
    // alone once let the fake come back before that attempt had failed)
    const tried = await waitUntil(
      outbox,
      (rows) => rows.length === STUDENTS && rows.some((r) => r.attempts >= 1 && r.lastError !== null),
      20_000,
      "a failed delivery attempt",
    );
    const failedWhileDown = tried.filter((r) => r.lastError !== null).length;

    fake = await startFakeSmtp({ dir, port });
    const sent = await waitUntil(
      outbox,
      (rows) => rows.every((r) => r.status === "sent"),
      60_000,
      "every message sent",
    );
    // give a duplicate job the chance to run, then count copies in both mailboxes
    await new Promise((r) => setTimeout(r, 4000));
    const mine = await readFakeMailbox(dir);
    const shared = process.env.MAIL_FAKE_DIR ? await readFakeMailbox(process.env.MAIL_FAKE_DIR).catch(() => []) : [];
    const copies = sent.map((row) => [...mine, ...shared].filter((m) => m.messageId === messageIdFor(row.id)).length);
    const rowsNow = await db
      .select()
      .from(mailOutbox)
      .where(like(mailOutbox.dedupeKey, `submission-received:%:${instructor.id}`));
    console.log(
      `[mail] ${STUDENTS} submissions while mail was down; ${failedWhileDown} messages failed at least once; ` +
        `attempts ${JSON.stringify(sent.map((r) => r.attempts))}; copies delivered ${JSON.stringify(copies)}`,
    );
    expect(rowsNow).toHaveLength(STUDENTS);
    expect(copies).toEqual(sent.map(() => 1));
    expect(failedWhileDown).toBeGreaterThan(0);
  }, 120_000);
});
