import { listRoster } from "@/db/queries/courses";
import { json, readParams, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeCourse } from "@/lib/server/course-permissions";
import { idParams } from "@/lib/shared/schemas/courses";
import { loadCourse } from "../../course-api";

/** GET /api/v1/courses/:id/roster — instructors and students of the course (instructors only). */
export const GET = route(async (request, context) => {
  const { id } = await readParams(context, idParams);
  const actor = await requireActor(request);
  const course = await loadCourse(actor, id);
  authorizeCourse(course.role, "roster:read");
  return json({ roster: await listRoster({ courseId: id, userId: actor.userId }) });
});
