import { json, readParams, route } from "@/lib/api";
import { requireActor } from "@/lib/auth-request";
import { authorizeCourse } from "@/lib/course-permissions";
import { idParams } from "@/components/courses/schemas";
import { loadAssignment } from "../../courses/course-api";

/** GET /api/v1/assignments/:id — the assignment, for anyone enrolled in its course. */
export const GET = route(async (request, context) => {
  const { id } = await readParams(context, idParams);
  const actor = await requireActor(request);
  const assignment = await loadAssignment(actor, id);
  authorizeCourse(assignment.role, "assignment:read");
  return json({ assignment });
});
