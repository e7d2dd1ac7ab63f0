import { listComments } from "@/db/queries/reviews";
import { json, readParams, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeSubmissionRead } from "@/lib/server/permissions";
import { submissionParams } from "@/lib/shared/schemas/courses";
import { loadSubmission } from "../../courses/course-api";

/** GET /api/v1/submissions/:submissionId — the frozen plan, its report, the review and the comments (its student or the course's instructors). */
export const GET = route(async (request, context) => {
  const { submissionId } = await readParams(context, submissionParams);
  const actor = await requireActor(request);
  const submission = await loadSubmission(actor, submissionId);
  authorizeSubmissionRead(submission.viewerRole);
  return json({ submission, comments: await listComments({ submissionId, userId: actor.userId }) });
});
