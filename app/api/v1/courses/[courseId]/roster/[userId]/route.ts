import { inTransaction } from "@/lib/server/transaction";
import { recordAudit } from "@/db/queries/audit";
import { removeStudent } from "@/db/queries/courses";
import { json, readParams, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeCourse } from "@/lib/server/permissions";
import { AppError } from "@/lib/server/errors";
import { courseMemberParams } from "@/lib/shared/schemas/courses";
import { loadCourse } from "../../../course-api";

/** DELETE /api/v1/courses/:courseId/roster/:userId — removes a student; their submissions stay on record. */
export const DELETE = route(async (request, context) => {
  const { courseId, userId } = await readParams(context, courseMemberParams);
  const actor = await requireActor(request);
  const course = await loadCourse(actor, courseId);
  authorizeCourse(course.role, "roster:manage");
  await inTransaction(async () => {
    const removed = await removeStudent({ courseId, instructorId: actor.userId, userId });
    if (!removed) throw new AppError("not_found:student", "No such student in this course.");
    await recordAudit({
      actorId: actor.userId,
      action: "course.remove-student",
      targetType: "course",
      targetId: courseId,
      projectId: course.projectId,
      detail: { userId },
    });
  });
  return json({ removed: userId });
});
