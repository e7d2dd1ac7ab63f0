/**
 * Who may submit what, and which arm revision a course or an assignment may require: a student
 * submits only a plan they created, in a version they saved; a course or an assignment names only a
 * built-in arm revision or one the instructor can read, and the refusal is the same whether the
 * revision is private or does not exist.
 */
import "../api/_env";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  call,
  demoArm,
  errorOf,
  makeUser,
  sessionCookieFor,
  type Auth,
  type CallResult,
  type TestUser,
} from "../api/_helpers";
import { baseMovePlan, courseWithAssignment, demoArmRevision, studentPlan } from "./_fixtures";
import { createArm } from "@/db/queries/arms";
import { createPlan, createPlanVersion } from "@/db/queries/plans";
import { createProject, upsertMember } from "@/db/queries/projects";
import { check, planSchema } from "@/kinematics";
import * as coursesRoute from "@/app/api/v1/courses/route";
import * as assignmentsRoute from "@/app/api/v1/courses/[courseId]/assignments/route";
import * as submitRoute from "@/app/api/v1/assignments/[assignmentId]/submissions/route";

let student: TestUser;
let classmate: TestUser;
let instructor: TestUser;
let outsider: TestUser;
let asStudent: Auth;
let asInstructor: Auth;

/** The error body without its per-request id: what the caller learns from the answer. */
function answer(res: CallResult): unknown {
  const { requestId: _requestId, ...rest } = errorOf(res) as ReturnType<typeof errorOf> & { requestId?: string };
  return rest;
}

/** Saves `document` as the next version of a plan, authored by `authorId`. */
async function saveVersion(planId: string, baseVersion: number, authorId: string): Promise<void> {
  const parsed = planSchema.parse(baseMovePlan(2));
  const revision = await demoArmRevision();
  const saved = await createPlanVersion({
    planId,
    baseVersion,
    document: parsed,
    armRevisionId: revision.id,
    verdict: check(parsed).verdict,
    summary: { verdict: check(parsed).verdict },
    note: null,
    authorId,
  });
  if ("conflict" in saved) throw new Error("unexpected version conflict");
}

beforeAll(async () => {
  [student, classmate, instructor, outsider] = await Promise.all([
    makeUser("student"),
    makeUser("student", "classmate"),
    makeUser("instructor"),
    makeUser("instructor", "outsider"),
  ]);
  asStudent = { cookie: await sessionCookieFor(student.id) };
  asInstructor = { cookie: await sessionCookieFor(instructor.id) };
});

afterAll(async () => {
  const { stopBoss } = await import("@/lib/server/mail/queue");
  await stopBoss();
});

describe("submitting from a shared course project", () => {
  let assignmentId: string;
  let sharedProjectId: string;

  beforeAll(async () => {
    ({
      assignment: { id: assignmentId },
    } = await courseWithAssignment(instructor.id, [student.id, classmate.id]));
    // The classmate owns a shared project and makes the student an editor of it.
    const shared = await createProject({ name: "Shared course work", kind: "course", userId: classmate.id });
    sharedProjectId = shared.id;
    if (!(await upsertMember({ projectId: shared.id, ownerId: classmate.id, email: student.email, role: "editor" })))
      throw new Error("member not added");
  });

  const submit = (planId: string, versionNumber: number) =>
    call(submitRoute.POST, {
      method: "POST",
      path: `/api/v1/assignments/${assignmentId}/submissions`,
      params: { assignmentId },
      auth: asStudent,
      body: { planId, versionNumber },
    });

  it("refuses a classmate's plan with 403 forbidden:submission saying whose plans can be submitted", async () => {
    const plan = await createPlan({
      projectId: sharedProjectId,
      armId: demoArm.id,
      name: "Classmate's sweep",
      userId: classmate.id,
    });
    await saveVersion(plan.id, 0, classmate.id);
    const res = await submit(plan.id, 1);
    expect(res.status, res.text).toBe(403);
    expect(errorOf(res).code).toBe("forbidden:submission");
    expect(errorOf(res).message).toMatch(/created by someone else.*only plans you created/);
  });

  it("refuses a classmate's plan even in a version the student saved as its editor", async () => {
    const plan = await createPlan({
      projectId: sharedProjectId,
      armId: demoArm.id,
      name: "Edited together",
      userId: classmate.id,
    });
    await saveVersion(plan.id, 0, classmate.id);
    await saveVersion(plan.id, 1, student.id);
    const res = await submit(plan.id, 2);
    expect(res.status, res.text).toBe(403);
    expect(errorOf(res).code).toBe("forbidden:submission");
  });

  it("refuses the student's own plan in a version a classmate saved, naming the version", async () => {
    const plan = await createPlan({
      projectId: sharedProjectId,
      armId: demoArm.id,
      name: "Mine, edited by a classmate",
      userId: student.id,
    });
    await saveVersion(plan.id, 0, student.id);
    await saveVersion(plan.id, 1, classmate.id);
    const res = await submit(plan.id, 2);
    expect(res.status, res.text).toBe(403);
    expect(errorOf(res).message).toMatch(/Version 2 .* was saved by someone else/);
  });

  it("answers 404 for a plan in a project the student is not a member of", async () => {
    const { planId } = await studentPlan(classmate.id, [baseMovePlan(2)]);
    const res = await submit(planId, 1);
    expect(res.status, res.text).toBe(404);
    expect(errorOf(res).code).toBe("not_found:plan-version");
  });

  it("accepts the student's own plan in a version they saved, in the shared project", async () => {
    const plan = await createPlan({
      projectId: sharedProjectId,
      armId: demoArm.id,
      name: "All mine",
      userId: student.id,
    });
    await saveVersion(plan.id, 0, student.id);
    const res = await submit(plan.id, 1);
    expect(res.status, res.text).toBe(201);
  });
});

describe("the arm revision a course or an assignment requires", () => {
  let privateRevisionId: string;
  let ownRevisionId: string;
  const missingRevisionId = "00000000-0000-4000-8000-000000000000";

  beforeAll(async () => {
    // An arm in a project the instructor is not a member of, and one in a project of their own.
    const other = await createProject({ name: "Private lab", kind: "research", userId: outsider.id });
    const privateArm = await createArm({
      projectId: other.id,
      name: "Secret arm",
      description: demoArm.description,
      userId: outsider.id,
    });
    const own = await createProject({ name: "My lab", kind: "research", userId: instructor.id });
    const ownArm = await createArm({
      projectId: own.id,
      name: "My arm",
      description: demoArm.description,
      userId: instructor.id,
    });
    if (!privateArm || !ownArm) throw new Error("arms not created");
    privateRevisionId = privateArm.revision.id;
    ownRevisionId = ownArm.revision.id;
  });

  const createCourse = (requiredArmRevisionId: string) =>
    call(coursesRoute.POST, {
      method: "POST",
      path: "/api/v1/courses",
      auth: asInstructor,
      body: { title: "Arm check", term: "Spring", requiredArmRevisionId },
    });

  it("refuses a course naming another project's private revision with 422, exactly as for one that does not exist", async () => {
    const secret = await createCourse(privateRevisionId);
    const missing = await createCourse(missingRevisionId);
    expect(secret.status, secret.text).toBe(422);
    expect(missing.status, missing.text).toBe(422);
    expect(errorOf(secret).code).toBe("unprocessable:arm-revision");
    // Same code, message and field issue: the answer does not reveal that the private revision exists.
    expect(answer(secret)).toEqual(answer(missing));
    expect(errorOf(secret).issues.map((i) => i.path)).toEqual(["requiredArmRevisionId"]);
  });

  it("accepts a course on a built-in revision or one of the instructor's own projects", async () => {
    expect((await createCourse((await demoArmRevision()).id)).status).toBe(201);
    expect((await createCourse(ownRevisionId)).status).toBe(201);
  });

  it("refuses an assignment naming another project's private revision with the same 422 as a missing one", async () => {
    const created = await createCourse((await demoArmRevision()).id);
    const courseId = (created.body as { course: { id: string } }).course.id;
    const setAssignment = (requiredArmRevisionId: string) =>
      call(assignmentsRoute.POST, {
        method: "POST",
        path: `/api/v1/courses/${courseId}/assignments`,
        params: { courseId },
        auth: asInstructor,
        body: { title: "Sweep", dueAt: new Date(Date.now() + 86_400_000).toISOString(), requiredArmRevisionId },
      });
    const secret = await setAssignment(privateRevisionId);
    const missing = await setAssignment(missingRevisionId);
    expect(secret.status, secret.text).toBe(422);
    expect(answer(secret)).toEqual(answer(missing));
    expect(errorOf(secret).message).not.toMatch(/Secret arm|exist/i);
    expect((await setAssignment(ownRevisionId)).status).toBe(201);
  });
});
