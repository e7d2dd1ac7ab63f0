/**
 * Approving a submission whose server check found a fault: refused without the reviewer's
 * confirmation and a typed reason; with both, the reason is stored with the review, shown to the
 * student, and the e-mail says the work was accepted — never that the plan may be run.
 */
import "../api/_env";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { mailOutbox } from "@/db/schema/mail";
import { call, errorOf, makeUser, sessionCookieFor, type Auth, type TestUser } from "../api/_helpers";
import { baseMovePlan, courseWithAssignment, studentPlan } from "./_fixtures";
import * as submitRoute from "@/app/api/v1/assignments/[assignmentId]/submissions/route";
import * as submissionRoute from "@/app/api/v1/submissions/[submissionId]/route";
import * as decisionRoute from "@/app/api/v1/reviews/[submissionId]/decision/route";

let instructor: TestUser;
let student: TestUser;
let asInstructor: Auth;
let asStudent: Auth;

type Body = {
  submission: {
    id: string;
    verdict: string;
    status: string;
    review: { decision: string; faultApprovalReason: string | null } | null;
  };
};

/** The student submits their own plan (one base move of `durationS`) to a fresh assignment (70% of maximum speed). */
async function submitted(durationS: number): Promise<{ id: string; verdict: string }> {
  const { assignment } = await courseWithAssignment(instructor.id, [student.id]);
  const { planId } = await studentPlan(student.id, [baseMovePlan(durationS)]);
  const res = await call(submitRoute.POST, {
    method: "POST",
    path: `/api/v1/assignments/${assignment.id}/submissions`,
    params: { assignmentId: assignment.id },
    auth: asStudent,
    body: { planId, versionNumber: 1 },
  });
  expect(res.status, res.text).toBe(201);
  return (res.body as Body).submission;
}

const decide = (submissionId: string, body: unknown) =>
  call(decisionRoute.POST, {
    method: "POST",
    path: `/api/v1/reviews/${submissionId}/decision`,
    params: { submissionId },
    auth: asInstructor,
    body,
  });

const seenByStudent = async (submissionId: string) =>
  (
    await call(submissionRoute.GET, {
      path: `/api/v1/submissions/${submissionId}`,
      params: { submissionId },
      auth: asStudent,
    })
  ).body as Body;

async function decisionMail(reviewId: string) {
  const [row] = await db
    .select()
    .from(mailOutbox)
    .where(eq(mailOutbox.dedupeKey, `submission-decided:${reviewId}`));
  if (!row) throw new Error("no decision e-mail queued");
  return row;
}

beforeAll(async () => {
  instructor = await makeUser("instructor");
  student = await makeUser("student");
  asInstructor = { cookie: await sessionCookieFor(instructor.id) };
  asStudent = { cookie: await sessionCookieFor(student.id) };
});

afterAll(async () => {
  const { stopBoss } = await import("@/lib/server/mail/queue");
  await stopBoss();
});

describe("approving a submission whose check faults", () => {
  let faulty: { id: string; verdict: string };

  beforeAll(async () => {
    // 1 rad in 0.73 s (quintic) peaks at 1.875 / 0.73 ≈ 2.57 rad/s (derived: the quintic's peak rate
    // is 15/8 of the mean), above 70% of the demo base joint's speed: a speed fault.
    faulty = await submitted(0.73);
    expect(faulty.verdict).toBe("fault");
  });

  it("is refused with 422 unprocessable:unconfirmed-faults listing the faults, and leaves the submission waiting", async () => {
    const res = await decide(faulty.id, { decision: "approved" });
    expect(res.status, res.text).toBe(422);
    const error = errorOf(res) as ReturnType<typeof errorOf> & { faults?: { kind: string; message: string }[] };
    expect(error.code).toBe("unprocessable:unconfirmed-faults");
    expect(error.message).toMatch(/confirm .* and give a reason/);
    expect(error.faults?.length).toBeGreaterThan(0);
    expect(error.faults?.map((f) => f.kind)).toContain("speed-over");
    expect((await seenByStudent(faulty.id)).submission.status).toBe("submitted");
  });

  it.each([
    ["a confirmation without a reason", { decision: "approved", confirmFaults: true }, "reason"],
    ["a reason of blanks", { decision: "approved", confirmFaults: true, reason: "   " }, "reason"],
    [
      "a reason over 1000 characters",
      { decision: "approved", confirmFaults: true, reason: "x".repeat(1001) },
      "reason",
    ],
    ["a reason without the confirmation", { decision: "approved", reason: "Looks fine." }, "confirmFaults"],
    [
      "a confirmation on a return",
      { decision: "returned", summary: "Slow down.", confirmFaults: true, reason: "n/a" },
      "confirmFaults",
    ],
  ])("is a 400 naming the field for %s", async (_what, body, field) => {
    const res = await decide(faulty.id, body);
    expect(res.status, res.text).toBe(400);
    expect(errorOf(res).issues.map((i) => i.path)).toContain(field);
  });

  it("with the confirmation and a reason: approved, the reason stored and shown to the student, the e-mail honest", async () => {
    const reason = "The speed fault is what this exercise is about; we discuss it in class.";
    const res = await decide(faulty.id, {
      decision: "approved",
      summary: "",
      confirmFaults: true,
      reason: `  ${reason}  `,
    });
    expect(res.status, res.text).toBe(201);
    const review = (res.body as { review: { id: string; faultApprovalReason: string | null } }).review;
    expect(review.faultApprovalReason).toBe(reason);

    const seen = await seenByStudent(faulty.id);
    expect(seen.submission.status).toBe("approved");
    expect(seen.submission.review?.faultApprovalReason).toBe(reason);

    const mail = await decisionMail(review.id);
    expect(mail.text).toContain(reason);
    expect(mail.text).toMatch(/check found faults in this plan; they are still there/);
    expect(mail.text).toMatch(/accepted the work/);
    expect(mail.text).toMatch(/not a clearance to run/);
    expect(mail.text).not.toMatch(/may be run|can be run|cleared to run|safe to run/i);
    expect(mail.html).not.toMatch(/may be run/i);
  });
});

describe("approving a submission whose check passes", () => {
  it("needs no confirmation, stores no reason, and its e-mail grants no permission to run", async () => {
    const passing = await submitted(2);
    expect(passing.verdict).not.toBe("fault");
    const res = await decide(passing.id, { decision: "approved" });
    expect(res.status, res.text).toBe(201);
    const review = (res.body as { review: { id: string; faultApprovalReason: string | null } }).review;
    expect(review.faultApprovalReason).toBeNull();
    const mail = await decisionMail(review.id);
    expect(mail.text).toMatch(/accepted the work/);
    expect(mail.text).not.toMatch(/may be run|can be run|cleared to run|safe to run|check found faults/i);
    expect(mail.text).toMatch(/lab's safety rules/);
  });

  it("stores no reason for a passing submission even when a confirmation and a reason are sent", async () => {
    const passing = await submitted(2);
    const res = await decide(passing.id, { decision: "approved", confirmFaults: true, reason: "Just in case." });
    expect(res.status, res.text).toBe(201);
    expect((res.body as { review: { faultApprovalReason: string | null } }).review.faultApprovalReason).toBeNull();
  });
});
