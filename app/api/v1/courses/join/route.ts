import { inTransaction } from "@/lib/server/transaction";
import { recordAudit } from "@/db/queries/audit";
import { enrolStudent, getCourseByJoinCode } from "@/db/queries/courses";
import { json, readJson, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { joinCourseSchema } from "@/lib/shared/schemas/courses";

/**
 * POST /api/v1/courses/join — joins the course a code opens, as a student. The code is the
 * credential (like an invitation link), so any signed-in user may use it; joining twice is a no-op.
 */
export const POST = route(async (request) => {
  const body = await readJson(request, joinCourseSchema);
  const actor = await requireActor(request);
  const course = await getCourseByJoinCode({ code: body.code });
  if (!course) throw new AppError("not_found:course", "No course has this join code; check it with your instructor.");
  if (course.archivedAt) throw new AppError("forbidden:course", "This course is archived and takes no new students.");
  const role = await inTransaction(async () => {
    const role = await enrolStudent({ courseId: course.id, userId: actor.userId });
    await recordAudit({
      actorId: actor.userId,
      action: "course.join",
      targetType: "course",
      targetId: course.id,
      detail: { role },
    });
    return role;
  });
  return json({ course: { id: course.id, title: course.title, term: course.term }, role });
});
