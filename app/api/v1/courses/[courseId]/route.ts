import { json, readParams, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeCourse, visibleJoinCode } from "@/lib/server/permissions";
import { appLink } from "@/lib/server/mail/templates";
import { courseParams } from "@/lib/shared/schemas/courses";
import { joinPath, loadCourse } from "../course-api";

/** GET /api/v1/courses/:courseId — the course; instructors also get its join code and invitation link. */
export const GET = route(async (request, context) => {
  const { courseId } = await readParams(context, courseParams);
  const actor = await requireActor(request);
  const course = await loadCourse(actor, courseId);
  authorizeCourse(course.role, "course:read");
  const joinCode = visibleJoinCode(course);
  if (joinCode) return json({ course: { ...course, inviteUrl: appLink(joinPath(joinCode)) } });
  return json({ course: { ...course, joinCode: undefined } });
});
