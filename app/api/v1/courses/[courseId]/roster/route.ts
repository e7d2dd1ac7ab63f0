import { listRoster } from "@/db/queries/courses";
import { json, readParams, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeCourse } from "@/lib/server/permissions";
import { courseParams } from "@/lib/shared/schemas/courses";
import { loadCourse } from "../../course-api";

/** GET /api/v1/courses/:courseId/roster — instructors and students of the course (instructors only). */
export const GET = route(async (request, context) => {
  const { courseId } = await readParams(context, courseParams);
  const actor = await requireActor(request);
  const course = await loadCourse(actor, courseId);
  authorizeCourse(course.role, "roster:read");
  return json({ roster: await listRoster({ courseId, userId: actor.userId }) });
});
