import { inTransaction } from "@/lib/server/transaction";
import { recordAudit } from "@/db/queries/audit";
import { getArmRevisionById } from "@/db/queries/arms";
import { createSubmission, listCourseInstructors, listOwnSubmissionsPage } from "@/db/queries/courses";
import { timePageQuery } from "@/lib/server/paging";
import { getVersionForSubmission } from "@/db/queries/plans";
import { getActiveUserById } from "@/db/queries/users";
import { json, readJson, readParams, readQuery, route } from "@/lib/server/route";
import { armSchema, formatProblem, parsePlan } from "@/kinematics";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeCourse } from "@/lib/server/permissions";
import { AppError } from "@/lib/server/errors";
import { enqueueMail } from "@/lib/server/mail/queue";
import { submissionReceived } from "@/lib/server/mail/templates";
import { runCheck } from "@/lib/server/check-pool";
import { assignmentCheckInput } from "@/lib/shared/courses/rules";
import { assignmentParams, limitsSchema, submitSchema } from "@/lib/shared/schemas/courses";
import { loadAssignment, outbox } from "../../../courses/course-api";

/** GET /api/v1/assignments/:assignmentId/submissions — one page of the caller's own submissions to it, newest first. */
export const GET = route(async (request, context) => {
  const { assignmentId } = await readParams(context, assignmentParams);
  const query = readQuery(request, timePageQuery);
  const actor = await requireActor(request);
  const assignment = await loadAssignment(actor, assignmentId);
  authorizeCourse(assignment.role, "submission:read-own");
  const page = await listOwnSubmissionsPage({
    userId: actor.userId,
    assignmentId,
    limit: query.limit,
    after: query.cursor,
  });
  return json({ submissions: page.items, nextCursor: page.nextCursor });
});

/**
 * POST /api/v1/assignments/:assignmentId/submissions — submits one saved plan version. The server re-checks
 * it against the assignment's rules (required arm revision and poses, limits tightened by the
 * course and the assignment) and stores the frozen document with the report. The instructors'
 * e-mails are queued in the same transaction, so a mail server that is down loses nothing.
 */
export const POST = route(async (request, context) => {
  const { assignmentId } = await readParams(context, assignmentParams);
  const body = await readJson(request, submitSchema);
  const actor = await requireActor(request);
  const assignment = await loadAssignment(actor, assignmentId);
  authorizeCourse(assignment.role, "submission:create");
  const version = await getVersionForSubmission({
    planId: body.planId,
    number: body.versionNumber,
    userId: actor.userId,
  });
  if (!version) throw new AppError("not_found:plan-version", "No such plan version in your projects.");
  // A submission is the student's own work: a plan they created, in a version they saved (DEVELOPERS.md, Decisions).
  if (!version.planCreatedByUser || !version.versionSavedByUser) {
    throw new AppError(
      "forbidden:submission",
      version.planCreatedByUser
        ? `Version ${version.number} of "${version.planName}" was saved by someone else; save your own version of the plan and submit that.`
        : `"${version.planName}" was created by someone else in the shared project; you can submit only plans you created. Start your own plan (you may copy the poses) and submit that.`,
    );
  }

  // Read exactly as the version route and the command line read it (the engine's parsePlan).
  const plan = parsePlan(version.document);
  const revision = await getArmRevisionById({ id: assignment.requiredArmRevisionId });
  if (!plan.ok)
    throw new AppError(
      "unprocessable:plan",
      `Version ${version.number} of "${version.planName}" is not a plan document the checker can read (${formatProblem(plan.problems[0] ?? { path: [], message: "no details" })}); open it in the bench, fix what this names, save a new version and submit that.`,
    );
  if (!revision)
    throw new AppError(
      "unprocessable:plan",
      "The arm this assignment requires is no longer stored, so the plan cannot be checked against it; ask the course's instructor to choose the assignment's arm again.",
    );
  const prepared = assignmentCheckInput(plan.value, armSchema.parse(revision.description), version.armRevisionId, {
    requiredArmRevisionId: assignment.requiredArmRevisionId,
    courseArmRevisionId: assignment.courseArmRevisionId,
    requiredStart: assignment.requiredStart as number[] | null,
    requiredGoals: assignment.requiredGoals as number[][] | null,
    poseTolerance: assignment.poseTolerance,
    courseLimits: limitsSchema.nullable().catch(null).parse(assignment.courseLimits),
    limits: limitsSchema.nullable().catch(null).parse(assignment.limits),
  });
  const { problems } = prepared;
  const { report } = await runCheck(prepared.plan);

  const student = await getActiveUserById({ id: actor.userId });
  const instructors = await listCourseInstructors({ courseId: assignment.courseId });
  const result = await inTransaction(async () => {
    const result = await createSubmission(
      {
        assignmentId,
        studentId: actor.userId,
        planId: version.planId,
        planVersionId: version.id,
        planVersionNumber: version.number,
        document: version.document,
        armRevisionId: version.armRevisionId,
        report,
        verdict: report.verdict,
        ruleProblems: problems,
        late: Date.now() > assignment.dueAt.getTime(),
      },
      (submission) =>
        instructors.map((instructor) =>
          outbox(
            "submission-received",
            `submission-received:${submission.id}:${instructor.id}`,
            instructor.email,
            submissionReceived({
              instructorName: instructor.name,
              studentName: student?.name ?? "A student",
              assignmentTitle: assignment.title,
              courseTitle: assignment.courseTitle,
              attempt: submission.attempt,
              verdict: report.verdict,
              late: submission.late,
              ruleProblemCount: problems.length,
              submissionId: submission.id,
            }),
          ),
        ),
    );
    if ("notEnrolled" in result)
      throw new AppError("forbidden:submission", "You are no longer a student of this course.");
    if ("conflict" in result) {
      throw new AppError(
        "conflict:submission",
        result.conflict === "open"
          ? "Your earlier submission is still waiting for review; you can submit again once it is returned."
          : "This assignment is already approved.",
      );
    }
    await recordAudit({
      actorId: actor.userId,
      action: "submission.create",
      targetType: "submission",
      targetId: result.submission.id,
      detail: { assignmentId, attempt: result.submission.attempt, verdict: report.verdict },
    });
    return result;
  });
  await enqueueMail(result.mailIds);
  return json({ submission: { ...result.submission, document: undefined }, report, ruleProblems: problems }, 201);
});
