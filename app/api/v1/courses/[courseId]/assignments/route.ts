import { inTransaction } from "@/lib/server/transaction";
import { recordAudit } from "@/db/queries/audit";
import { getReadableArmRevision } from "@/db/queries/arms";
import { createAssignment, listAssignmentsForUser } from "@/db/queries/courses";
import { json, readJson, readParams, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeCourse } from "@/lib/server/permissions";
import { AppError } from "@/lib/server/errors";
import { armSchema } from "@/kinematics";
import { createAssignmentSchema, courseParams } from "@/lib/shared/schemas/courses";
import { loadCourse, UNUSABLE_ARM_REVISION } from "../../course-api";

/** GET /api/v1/courses/:courseId/assignments — by due date, each with the caller's own status. */
export const GET = route(async (request, context) => {
  const { courseId } = await readParams(context, courseParams);
  const actor = await requireActor(request);
  const course = await loadCourse(actor, courseId);
  authorizeCourse(course.role, "assignment:read");
  return json({ assignments: await listAssignmentsForUser({ courseId, userId: actor.userId }) });
});

/** POST /api/v1/courses/:courseId/assignments — instructors set an assignment on a required arm revision. */
export const POST = route(async (request, context) => {
  const { courseId } = await readParams(context, courseParams);
  const body = await readJson(request, createAssignmentSchema);
  const actor = await requireActor(request);
  const course = await loadCourse(actor, courseId);
  authorizeCourse(course.role, "assignment:create");
  const revision = await getReadableArmRevision({ id: body.requiredArmRevisionId, userId: actor.userId });
  if (!revision)
    throw new AppError("unprocessable:arm-revision", UNUSABLE_ARM_REVISION, {
      issues: [
        {
          path: "requiredArmRevisionId",
          message: "must be a built-in arm revision or one of your projects' arm revisions",
        },
      ],
    });
  const arm = armSchema.parse(revision.description);
  const n = arm.joints.length;
  const poseIssues = [
    ...(body.requiredStart && body.requiredStart.length !== n
      ? [{ path: "requiredStart", message: `must have ${n} values, one per joint` }]
      : []),
    ...(body.requiredGoals ?? []).flatMap((g, i) =>
      g.length !== n ? [{ path: `requiredGoals[${i}]`, message: `must have ${n} values, one per joint` }] : [],
    ),
    ...(body.limits?.joints ?? []).flatMap((j, i) =>
      j.joint >= n ? [{ path: `limits.joints[${i}].joint`, message: `must be below ${n}` }] : [],
    ),
  ];
  if (poseIssues.length > 0) throw new AppError("bad_request:validation", undefined, { issues: poseIssues });
  const assignment = await inTransaction(async () => {
    const assignment = await createAssignment({ courseId, userId: actor.userId, ...body, dueAt: new Date(body.dueAt) });
    if (!assignment) throw new AppError("forbidden:assignment", "Only the course's instructors can set assignments.");
    await recordAudit({
      actorId: actor.userId,
      action: "assignment.create",
      targetType: "assignment",
      targetId: assignment.id,
      projectId: course.projectId,
      detail: { courseId },
    });
    return assignment;
  });
  return json({ assignment }, 201);
});
