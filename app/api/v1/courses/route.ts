import { inTransaction } from "@/lib/server/transaction";
import { recordAudit } from "@/db/queries/audit";
import { getReadableArmRevision } from "@/db/queries/arms";
import { createCourse, listCoursesForUser } from "@/db/queries/courses";
import { getProjectForUser } from "@/db/queries/projects";
import { json, readJson, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { appLink } from "@/lib/server/mail/templates";
import { authorizeSite, visibleJoinCode } from "@/lib/server/permissions";
import { createCourseSchema } from "@/lib/shared/schemas/courses";
import { joinPath, UNUSABLE_ARM_REVISION } from "./course-api";

/** GET /api/v1/courses — the courses the caller is enrolled in (as instructor or student). */
export const GET = route(async (request) => {
  const actor = await requireActor(request);
  const courses = await listCoursesForUser({ userId: actor.userId });
  return json({ courses: courses.map((c) => ({ ...c, joinCode: visibleJoinCode(c) ?? undefined })) });
});

/** POST /api/v1/courses — an instructor creates a course and becomes its instructor. */
export const POST = route(async (request) => {
  const body = await readJson(request, createCourseSchema);
  const actor = await requireActor(request);
  authorizeSite(actor, "project:create-course");
  if (
    body.requiredArmRevisionId &&
    !(await getReadableArmRevision({ id: body.requiredArmRevisionId, userId: actor.userId }))
  ) {
    throw new AppError("unprocessable:arm-revision", UNUSABLE_ARM_REVISION, {
      issues: [
        {
          path: "requiredArmRevisionId",
          message: "must be a built-in arm revision or one of your projects' arm revisions",
        },
      ],
    });
  }
  if (body.projectId) {
    const project = await getProjectForUser({ projectId: body.projectId, userId: actor.userId });
    if (!project || project.role !== "owner") {
      throw new AppError("unprocessable:project", "Link a project you own.", {
        issues: [{ path: "projectId", message: "must be a project you own" }],
      });
    }
  }
  const course = await inTransaction(async () => {
    const course = await createCourse({ userId: actor.userId, ...body });
    await recordAudit({
      actorId: actor.userId,
      action: "course.create",
      targetType: "course",
      targetId: course.id,
      projectId: course.projectId,
      detail: { title: course.title },
    });
    return course;
  });
  return json({ course: { ...course, inviteUrl: appLink(joinPath(course.joinCode)) } }, 201);
});
