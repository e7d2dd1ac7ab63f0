import { json, readParams, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeCourse } from "@/lib/server/permissions";
import { assignmentParams } from "@/lib/shared/schemas/courses";
import { loadAssignment } from "../../courses/course-api";

/** GET /api/v1/assignments/:assignmentId — the assignment, for anyone enrolled in its course. */
export const GET = route(async (request, context) => {
  const { assignmentId } = await readParams(context, assignmentParams);
  const actor = await requireActor(request);
  const assignment = await loadAssignment(actor, assignmentId);
  authorizeCourse(assignment.role, "assignment:read");
  return json({ assignment });
});
