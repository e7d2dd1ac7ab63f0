/**
 * The authorisation matrix of every course, assignment, submission and review route: for each
 * route and each caller (anonymous, the enrolled student, another student, the course's
 * instructor, another instructor, an admin, the student's API token), the expected status —
 * generated from one table. State-changing rows for the instructor run last in their route.
 */
import "../api/_env";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { call, makeUser, sessionCookieFor, tokenFor, type Auth } from "../api/_helpers";
import { baseMovePlan, courseWithAssignment, studentPlan } from "./_fixtures";
import { createSubmission, enrolStudent, getCourseForUser } from "@/db/queries/courses";
import * as coursesRoute from "@/app/api/v1/courses/route";
import * as courseRoute from "@/app/api/v1/courses/[courseId]/route";
import * as joinRoute from "@/app/api/v1/courses/join/route";
import * as invitationsRoute from "@/app/api/v1/courses/[courseId]/invitations/route";
import * as assignmentsRoute from "@/app/api/v1/courses/[courseId]/assignments/route";
import * as rosterRoute from "@/app/api/v1/courses/[courseId]/roster/route";
import * as rosterMemberRoute from "@/app/api/v1/courses/[courseId]/roster/[userId]/route";
import * as gradesRoute from "@/app/api/v1/courses/[courseId]/grades/route";
import * as assignmentRoute from "@/app/api/v1/assignments/[assignmentId]/route";
import * as submitRoute from "@/app/api/v1/assignments/[assignmentId]/submissions/route";
import * as mySubmissionsRoute from "@/app/api/v1/submissions/route";
import * as submissionRoute from "@/app/api/v1/submissions/[submissionId]/route";
import * as queueRoute from "@/app/api/v1/reviews/route";
import * as commentsRoute from "@/app/api/v1/reviews/[submissionId]/comments/route";
import * as decisionRoute from "@/app/api/v1/reviews/[submissionId]/decision/route";
import { demoArmRevision } from "./_fixtures";

type Caller = "anonymous" | "student" | "otherStudent" | "instructor" | "otherInstructor" | "admin" | "studentToken";
const callers: Caller[] = [
  "anonymous",
  "student",
  "otherStudent",
  "otherInstructor",
  "admin",
  "studentToken",
  "instructor",
];

type Handler = Parameters<typeof call>[0];
type Row = {
  name: string;
  handler: Handler;
  method: string;
  path: (ids: Ids) => string;
  params: (ids: Ids) => Record<string, string>;
  body?: (ids: Ids) => unknown;
  expect: Record<Caller, number>;
};
type Ids = {
  courseId: string;
  joinCourseCode: string;
  assignmentId: string;
  submissionId: string;
  removableId: string;
  planId: string;
  revisionId: string;
};

/** Statuses for a resource of one course: not enrolled → 404, enrolled without the right → 403. */
const courseScoped = (student: number, instructor: number): Record<Caller, number> => ({
  anonymous: 401,
  student,
  studentToken: student,
  otherStudent: 404,
  otherInstructor: 404,
  admin: 404,
  instructor,
});
const anyone = (ok: number, extra: Partial<Record<Caller, number>> = {}): Record<Caller, number> => ({
  anonymous: 401,
  student: ok,
  studentToken: ok,
  otherStudent: ok,
  otherInstructor: ok,
  admin: ok,
  instructor: ok,
  ...extra,
});

const rows: Row[] = [
  {
    name: "GET /courses",
    handler: coursesRoute.GET,
    method: "GET",
    path: () => "/api/v1/courses",
    params: () => ({}),
    expect: anyone(200),
  },
  {
    name: "POST /courses",
    handler: coursesRoute.POST,
    method: "POST",
    path: () => "/api/v1/courses",
    params: () => ({}),
    body: () => ({ title: "Matrix course", term: "Spring" }),
    expect: anyone(201, { student: 403, studentToken: 403, otherStudent: 403 }),
  },
  {
    name: "POST /courses/join",
    handler: joinRoute.POST,
    method: "POST",
    path: () => "/api/v1/courses/join",
    params: () => ({}),
    body: (ids) => ({ code: ids.joinCourseCode }),
    expect: anyone(200),
  },
  {
    name: "GET /courses/:courseId",
    handler: courseRoute.GET,
    method: "GET",
    path: (i) => `/api/v1/courses/${i.courseId}`,
    params: (i) => ({ courseId: i.courseId }),
    expect: courseScoped(200, 200),
  },
  {
    name: "GET /courses/:courseId/roster",
    handler: rosterRoute.GET,
    method: "GET",
    path: (i) => `/api/v1/courses/${i.courseId}/roster`,
    params: (i) => ({ courseId: i.courseId }),
    expect: courseScoped(403, 200),
  },
  {
    name: "DELETE /courses/:courseId/roster/:userId",
    handler: rosterMemberRoute.DELETE,
    method: "DELETE",
    path: (i) => `/api/v1/courses/${i.courseId}/roster/${i.removableId}`,
    params: (i) => ({ courseId: i.courseId, userId: i.removableId }),
    expect: courseScoped(403, 200),
  },
  {
    name: "POST /courses/:courseId/invitations",
    handler: invitationsRoute.POST,
    method: "POST",
    path: (i) => `/api/v1/courses/${i.courseId}/invitations`,
    params: (i) => ({ courseId: i.courseId }),
    body: () => ({ emails: ["matrix-invitee@example.com"] }),
    expect: courseScoped(403, 202),
  },
  {
    name: "GET /courses/:courseId/assignments",
    handler: assignmentsRoute.GET,
    method: "GET",
    path: (i) => `/api/v1/courses/${i.courseId}/assignments`,
    params: (i) => ({ courseId: i.courseId }),
    expect: courseScoped(200, 200),
  },
  {
    name: "POST /courses/:courseId/assignments",
    handler: assignmentsRoute.POST,
    method: "POST",
    path: (i) => `/api/v1/courses/${i.courseId}/assignments`,
    params: (i) => ({ courseId: i.courseId }),
    body: (i) => ({
      title: "Matrix assignment",
      dueAt: new Date(Date.now() + 3_600_000).toISOString(),
      requiredArmRevisionId: i.revisionId,
    }),
    expect: courseScoped(403, 201),
  },
  {
    name: "GET /courses/:courseId/grades",
    handler: gradesRoute.GET,
    method: "GET",
    path: (i) => `/api/v1/courses/${i.courseId}/grades`,
    params: (i) => ({ courseId: i.courseId }),
    expect: courseScoped(403, 200),
  },
  {
    name: "GET /assignments/:assignmentId",
    handler: assignmentRoute.GET,
    method: "GET",
    path: (i) => `/api/v1/assignments/${i.assignmentId}`,
    params: (i) => ({ assignmentId: i.assignmentId }),
    expect: courseScoped(200, 200),
  },
  {
    name: "GET /assignments/:assignmentId/submissions",
    handler: submitRoute.GET,
    method: "GET",
    path: (i) => `/api/v1/assignments/${i.assignmentId}/submissions`,
    params: (i) => ({ assignmentId: i.assignmentId }),
    expect: courseScoped(200, 403),
  },
  {
    name: "POST /assignments/:assignmentId/submissions",
    handler: submitRoute.POST,
    method: "POST",
    path: (i) => `/api/v1/assignments/${i.assignmentId}/submissions`,
    params: (i) => ({ assignmentId: i.assignmentId }),
    body: (i) => ({ planId: i.planId, versionNumber: 1 }),
    // The student's earlier submission still waits for review: allowed, but a conflict.
    expect: courseScoped(409, 403),
  },
  {
    name: "GET /submissions",
    handler: mySubmissionsRoute.GET,
    method: "GET",
    path: () => "/api/v1/submissions",
    params: () => ({}),
    expect: anyone(200),
  },
  {
    name: "GET /submissions/:submissionId",
    handler: submissionRoute.GET,
    method: "GET",
    path: (i) => `/api/v1/submissions/${i.submissionId}`,
    params: (i) => ({ submissionId: i.submissionId }),
    expect: courseScoped(200, 200),
  },
  {
    name: "GET /reviews",
    handler: queueRoute.GET,
    method: "GET",
    path: () => "/api/v1/reviews",
    params: () => ({}),
    expect: anyone(200),
  },
  {
    name: "GET /reviews/:submissionId/comments",
    handler: commentsRoute.GET,
    method: "GET",
    path: (i) => `/api/v1/reviews/${i.submissionId}/comments`,
    params: (i) => ({ submissionId: i.submissionId }),
    expect: courseScoped(200, 200),
  },
  {
    name: "POST /reviews/:submissionId/comments",
    handler: commentsRoute.POST,
    method: "POST",
    path: (i) => `/api/v1/reviews/${i.submissionId}/comments`,
    params: (i) => ({ submissionId: i.submissionId }),
    body: () => ({ body: "Matrix comment", moveIndex: 0 }),
    expect: courseScoped(403, 201),
  },
  {
    name: "POST /reviews/:submissionId/decision",
    handler: decisionRoute.POST,
    method: "POST",
    path: (i) => `/api/v1/reviews/${i.submissionId}/decision`,
    params: (i) => ({ submissionId: i.submissionId }),
    body: () => ({ decision: "approved" }),
    expect: courseScoped(403, 201),
  },
];

let ids: Ids;
const auth: Partial<Record<Caller, Auth>> = {};

beforeAll(async () => {
  const [student, otherStudent, instructor, otherInstructor, admin, removable] = await Promise.all([
    makeUser("student"),
    makeUser("student", "other-student"),
    makeUser("instructor"),
    makeUser("instructor", "other-instructor"),
    makeUser("admin"),
    makeUser("student", "removable"),
  ]);
  const { course, assignment } = await courseWithAssignment(instructor.id, [student.id, removable.id]);
  const { course: joinCourse } = await courseWithAssignment(instructor.id, []);
  const { planId } = await studentPlan(student.id, [baseMovePlan(2)]);
  const revision = await demoArmRevision();
  const created = await createSubmission(
    {
      assignmentId: assignment.id,
      studentId: student.id,
      planId,
      planVersionId: null,
      planVersionNumber: 1,
      document: baseMovePlan(2),
      armRevisionId: revision.id,
      report: { verdict: "pass", moves: [], findings: [] },
      verdict: "pass",
      ruleProblems: [],
      late: false,
    },
    () => [],
  );
  if (!("submission" in created)) throw new Error("submission not created");
  ids = {
    courseId: course.id,
    joinCourseCode: (await getCourseForUser({ courseId: joinCourse.id, userId: instructor.id }))!.joinCode,
    assignmentId: assignment.id,
    submissionId: created.submission.id,
    removableId: removable.id,
    planId,
    revisionId: revision.id,
  };
  auth.anonymous = null;
  auth.student = { cookie: await sessionCookieFor(student.id) };
  auth.studentToken = { bearer: await tokenFor(student.id) };
  auth.otherStudent = { cookie: await sessionCookieFor(otherStudent.id) };
  auth.instructor = { cookie: await sessionCookieFor(instructor.id) };
  auth.otherInstructor = { cookie: await sessionCookieFor(otherInstructor.id) };
  auth.admin = { cookie: await sessionCookieFor(admin.id) };
  // Joining is idempotent for the instructor of the join course (they keep their role).
  await enrolStudent({ courseId: joinCourse.id, userId: student.id });
});

afterAll(async () => {
  const { stopBoss } = await import("@/lib/server/mail/queue");
  await stopBoss();
});

describe("course routes: authorisation matrix", () => {
  const cases = rows.flatMap((row) => callers.map((caller) => ({ row, caller, expected: row.expect[caller] })));
  it.each(cases.map((c) => [c.row.name, c.caller, c.expected, c] as const))(
    "%s as %s → %i",
    async (_name, caller, expected, c) => {
      const res = await call(c.row.handler, {
        method: c.row.method,
        path: c.row.path(ids),
        params: c.row.params(ids),
        auth: auth[caller] ?? null,
        body: c.row.body?.(ids),
      });
      expect(res.status, JSON.stringify(res.body)).toBe(expected);
      if (expected >= 400)
        expect((res.body as { error?: { code?: string } }).error?.code).toMatch(
          /^(unauthorized|forbidden|not_found|conflict)/,
        );
    },
  );
});

describe("course routes: bad input", () => {
  const bad: {
    name: string;
    handler: Handler;
    path: (i: Ids) => string;
    params: (i: Ids) => Record<string, string>;
    body: unknown;
    field: string;
    status?: number;
  }[] = [
    {
      name: "course without a title",
      handler: coursesRoute.POST,
      path: () => "/api/v1/courses",
      params: () => ({}),
      body: { term: "Spring" },
      field: "title",
    },
    {
      name: "course limits that loosen",
      handler: coursesRoute.POST,
      path: () => "/api/v1/courses",
      params: () => ({}),
      body: { title: "x", term: "y", limits: { speedPercent: 150 } },
      field: "limits.speedPercent",
    },
    {
      name: "course on an arm revision that is neither built in nor readable",
      handler: coursesRoute.POST,
      path: () => "/api/v1/courses",
      params: () => ({}),
      body: { title: "x", term: "y", requiredArmRevisionId: "00000000-0000-4000-8000-000000000000" },
      field: "requiredArmRevisionId",
      status: 422,
    },
    {
      name: "join code of the wrong shape",
      handler: joinRoute.POST,
      path: () => "/api/v1/courses/join",
      params: () => ({}),
      body: { code: "abc" },
      field: "code",
    },
    {
      name: "invitation to a non-address",
      handler: invitationsRoute.POST,
      path: (i) => `/api/v1/courses/${i.courseId}/invitations`,
      params: (i) => ({ courseId: i.courseId }),
      body: { emails: ["not-an-address"] },
      field: "emails[0]",
    },
    {
      name: "assignment with a bad due date",
      handler: assignmentsRoute.POST,
      path: (i) => `/api/v1/courses/${i.courseId}/assignments`,
      params: (i) => ({ courseId: i.courseId }),
      body: { title: "t", dueAt: "tomorrow", requiredArmRevisionId: "00000000-0000-4000-8000-000000000000" },
      field: "dueAt",
    },
    {
      name: "submission with a string version",
      handler: submitRoute.POST,
      path: (i) => `/api/v1/assignments/${i.assignmentId}/submissions`,
      params: (i) => ({ assignmentId: i.assignmentId }),
      body: { planId: "00000000-0000-4000-8000-000000000000", versionNumber: "1" },
      field: "versionNumber",
    },
    {
      name: "comment with a negative time",
      handler: commentsRoute.POST,
      path: (i) => `/api/v1/reviews/${i.submissionId}/comments`,
      params: (i) => ({ submissionId: i.submissionId }),
      body: { body: "x", timeS: -1 },
      field: "timeS",
    },
    {
      name: "return without a summary",
      handler: decisionRoute.POST,
      path: (i) => `/api/v1/reviews/${i.submissionId}/decision`,
      params: (i) => ({ submissionId: i.submissionId }),
      body: { decision: "returned" },
      field: "summary",
    },
  ];
  it.each(bad.map((b) => [b.name, b.status ?? 400, b] as const))(
    "%s is a %i naming the field",
    async (_name, status, b) => {
      const res = await call(b.handler, {
        method: "POST",
        path: b.path(ids),
        params: b.params(ids),
        auth: auth.instructor ?? null,
        body: b.body,
      });
      expect(res.status).toBe(status);
      const issues = (res.body as { error: { issues: { path: string }[] } }).error.issues;
      expect(issues.map((i) => i.path)).toContain(b.field);
    },
  );
});
