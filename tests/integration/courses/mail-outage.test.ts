/**
 * A failing mail server never loses the action and never doubles a message: the submission is
 * saved while the SMTP fake is down, the message goes out once it is back, exactly once; and
 * several workers racing for one outbox row send it once.
 */
import "../api/_env";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { queueMail } from "@/db/queries/mail";
import { mailOutbox } from "@/db/schema/mail";
import { submissions } from "@/db/schema/courses";
import { messageIdFor } from "@/lib/server/mail/transport";
import { startMailWithWorker, type MailHarness, type MailWithWorker } from "./_mail";
import { baseMovePlan, courseWithAssignment, studentPlan } from "./_fixtures";
import { call, makeUser, sessionCookieFor } from "../api/_helpers";
import * as submitRoute from "@/app/api/v1/assignments/[assignmentId]/submissions/route";

let mail: MailHarness;
let harness: MailWithWorker;

beforeAll(async () => {
  harness = await startMailWithWorker();
  mail = harness.mail;
});

afterAll(async () => {
  await harness?.stop();
});

async function waitUntil<T>(read: () => Promise<T>, ok: (v: T) => boolean, timeoutMs = 20_000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const v = await read();
    if (ok(v)) return v;
    if (Date.now() > until) throw new Error(`condition not met within ${timeoutMs} ms: ${JSON.stringify(v)}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

describe("mail server outage", () => {
  it("saves the submission while the server is down and sends its e-mail once when it is back", async () => {
    const instructor = await makeUser("instructor");
    const student = await makeUser("student");
    const { assignment } = await courseWithAssignment(instructor.id, [student.id]);
    const { planId } = await studentPlan(student.id, [baseMovePlan(2)]);

    await mail.down();
    const res = await call(submitRoute.POST, {
      method: "POST",
      path: `/api/v1/assignments/${assignment.id}/submissions`,
      params: { assignmentId: assignment.id },
      auth: { cookie: await sessionCookieFor(student.id) },
      body: { planId, versionNumber: 1 },
    });
    expect(res.status).toBe(201);
    const submissionId = (res.body as { submission: { id: string } }).submission.id;
    const [saved] = await db.select().from(submissions).where(eq(submissions.id, submissionId));
    expect(saved?.status).toBe("submitted");

    // The worker tries, fails against the closed port, and keeps the message queued for a retry.
    const dedupeKey = `submission-received:${submissionId}:${instructor.id}`;
    const failed = await waitUntil(
      async () => (await db.select().from(mailOutbox).where(eq(mailOutbox.dedupeKey, dedupeKey)))[0],
      (row) => row !== undefined && row.attempts >= 1 && row.status === "queued" && row.lastError !== null,
    );
    expect(failed.sentAt).toBeNull();
    expect((await mail.messages()).filter((m) => m.to === instructor.email)).toHaveLength(0);

    await mail.up();
    const arrived = await mail.waitFor((m) => m.to === instructor.email && m.kind === "submission-received", 30_000);
    expect(arrived.messageId).toBe(messageIdFor(failed.id));
    // Give any duplicate job a chance to run, then count.
    await new Promise((r) => setTimeout(r, 4_000));
    const copies = (await mail.messages()).filter((m) => m.messageId === messageIdFor(failed.id));
    expect(copies).toHaveLength(1);
    const [row] = await db.select().from(mailOutbox).where(eq(mailOutbox.id, failed.id));
    expect(row.status).toBe("sent");
    expect(row.attempts).toBeGreaterThanOrEqual(2);
  }, 60_000);

  it("sends a message once when several workers and jobs race for it", async () => {
    const to = `race-${Date.now()}@example.com`;
    const [id] = await queueMail([
      {
        kind: "test",
        dedupeKey: `race:${to}`,
        toAddress: to,
        subject: "Race",
        text: "One copy.",
        html: "<p>One copy.</p>",
      },
    ]);
    const { sendOutboxRow } = await import("@/lib/server/mail/worker");
    const { enqueueMail } = await import("@/lib/server/mail/queue");
    const outcomes = await Promise.all([
      ...Array.from({ length: 5 }, () => sendOutboxRow(id, false)),
      enqueueMail([id]).then(() => "enqueued"),
      enqueueMail([id], { jobId: "fresh" }).then(() => "enqueued"),
    ]);
    // The worker may win the claim instead of one of these calls; what matters is one copy in the mailbox.
    expect(outcomes.filter((o) => o === "sent").length).toBeLessThanOrEqual(1);
    await mail.waitFor((m) => m.to === to);
    await new Promise((r) => setTimeout(r, 3_000));
    expect((await mail.messages()).filter((m) => m.to === to)).toHaveLength(1);
  }, 30_000);

  it("does not queue the same event twice", async () => {
    const row = {
      kind: "test",
      dedupeKey: `dedupe:${Date.now()}`,
      toAddress: "dedupe@example.com",
      subject: "Once",
      text: "x",
      html: "<p>x</p>",
    };
    const first = await queueMail([row]);
    const second = await queueMail([row]);
    expect(first).toHaveLength(1);
    expect(second).toHaveLength(0);
  });
});
