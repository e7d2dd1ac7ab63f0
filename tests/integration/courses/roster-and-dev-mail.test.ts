/** Roster changes take effect at once; the development mail API exists only outside production or with JP_DEV_MAIL=1. */
import "../api/_env";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { call, makeUser, sessionCookieFor } from "../api/_helpers";
import { baseMovePlan, courseWithAssignment, studentPlan } from "./_fixtures";
import { startMailHarness, type MailHarness } from "./_mail";
import * as courseRoute from "@/app/api/v1/courses/[courseId]/route";
import * as joinRoute from "@/app/api/v1/courses/join/route";
import * as rosterMemberRoute from "@/app/api/v1/courses/[courseId]/roster/[userId]/route";
import * as submitRoute from "@/app/api/v1/assignments/[assignmentId]/submissions/route";
import * as devMailRoute from "@/app/api/dev/mail/route";
import { getCourseForUser } from "@/db/queries/courses";
import { queueMail } from "@/db/queries/mail";

let mail: MailHarness;
beforeAll(async () => {
  mail = await startMailHarness();
});
afterAll(async () => {
  const { stopBoss } = await import("@/lib/server/mail/queue");
  await stopBoss();
  await mail?.close();
});

describe("roster", () => {
  it("a removed student loses the course at once and cannot submit; joining again with the code restores it", async () => {
    const instructor = await makeUser("instructor");
    const student = await makeUser("student");
    const { course, assignment } = await courseWithAssignment(instructor.id, [student.id]);
    const asStudent = { cookie: await sessionCookieFor(student.id) };
    const { planId } = await studentPlan(student.id, [baseMovePlan(2)]);
    expect(
      (
        await call(courseRoute.GET, {
          path: `/api/v1/courses/${course.id}`,
          params: { courseId: course.id },
          auth: asStudent,
        })
      ).status,
    ).toBe(200);

    const removed = await call(rosterMemberRoute.DELETE, {
      method: "DELETE",
      path: `/api/v1/courses/${course.id}/roster/${student.id}`,
      params: { courseId: course.id, userId: student.id },
      auth: { cookie: await sessionCookieFor(instructor.id) },
    });
    expect(removed.status).toBe(200);
    expect(
      (
        await call(courseRoute.GET, {
          path: `/api/v1/courses/${course.id}`,
          params: { courseId: course.id },
          auth: asStudent,
        })
      ).status,
    ).toBe(404);
    const submit = await call(submitRoute.POST, {
      method: "POST",
      path: `/api/v1/assignments/${assignment.id}/submissions`,
      params: { assignmentId: assignment.id },
      auth: asStudent,
      body: { planId, versionNumber: 1 },
    });
    expect(submit.status).toBe(404);

    const code = (await getCourseForUser({ courseId: course.id, userId: instructor.id }))!.joinCode;
    const joined = await call(joinRoute.POST, {
      method: "POST",
      path: "/api/v1/courses/join",
      auth: asStudent,
      body: { code: code.toLowerCase() },
    });
    expect(joined.status).toBe(200);
    expect(
      (
        await call(courseRoute.GET, {
          path: `/api/v1/courses/${course.id}`,
          params: { courseId: course.id },
          auth: asStudent,
        })
      ).status,
    ).toBe(200);
  });

  it("an unknown join code is a 404 and the instructor cannot be removed", async () => {
    const instructor = await makeUser("instructor");
    const { course } = await courseWithAssignment(instructor.id, []);
    const auth = { cookie: await sessionCookieFor(instructor.id) };
    expect(
      (await call(joinRoute.POST, { method: "POST", path: "/api/v1/courses/join", auth, body: { code: "ZZZZZZZZ" } }))
        .status,
    ).toBe(404);
    const self = await call(rosterMemberRoute.DELETE, {
      method: "DELETE",
      path: `/api/v1/courses/${course.id}/roster/${instructor.id}`,
      params: { courseId: course.id, userId: instructor.id },
      auth,
    });
    expect(self.status).toBe(404);
  });
});

describe("development mail API", () => {
  const saved = { NODE_ENV: process.env.NODE_ENV, JP_DEV_MAIL: process.env.JP_DEV_MAIL };
  afterAll(() => {
    Object.assign(process.env, saved);
    if (saved.JP_DEV_MAIL === undefined) delete process.env.JP_DEV_MAIL;
  });

  it("is a 404 in production without JP_DEV_MAIL=1", async () => {
    Object.assign(process.env, { NODE_ENV: "production" });
    delete process.env.JP_DEV_MAIL;
    const res = await call(devMailRoute.GET, { path: "/api/dev/mail" });
    expect(res.status).toBe(404);
  });

  it("lists what the SMTP fake received to a signed-in admin when JP_DEV_MAIL=1", async () => {
    Object.assign(process.env, { NODE_ENV: "production", JP_DEV_MAIL: "1" });
    const { startMailWorker } = await import("@/lib/server/mail/worker");
    const worker = await startMailWorker({ pollingIntervalSeconds: 0.5, sweepIntervalMs: 1_000 });
    try {
      const to = `dev-page-${Date.now()}@example.com`;
      const ids = await queueMail([
        {
          kind: "test",
          dedupeKey: `dev-page:${to}`,
          toAddress: to,
          subject: "Shown on the dev page",
          text: "t",
          html: "<p>t</p>",
        },
      ]);
      const { enqueueMail } = await import("@/lib/server/mail/queue");
      await enqueueMail(ids);
      await mail.waitFor((m) => m.to === to);
      const admin = await makeUser("admin");
      const res = await call(devMailRoute.GET, {
        path: "/api/dev/mail",
        auth: { cookie: await sessionCookieFor(admin.id) },
      });
      expect(res.status).toBe(200);
      const body = res.body as {
        messages: { to: string; subject: string }[];
        outbox: { toAddress: string; status: string }[];
      };
      expect(body.messages.find((m) => m.to === to)?.subject).toBe("Shown on the dev page");
      expect(body.outbox.find((r) => r.toAddress === to)?.status).toBe("sent");
    } finally {
      await worker.stop();
    }
  });
});
