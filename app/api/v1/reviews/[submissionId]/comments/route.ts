import { addComment, listComments } from "@/db/queries/reviews";
import { json, readJson, readParams, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeCourse, authorizeSubmissionRead } from "@/lib/server/permissions";
import { AppError } from "@/lib/server/errors";
import { submissionParams } from "@/lib/shared/schemas/courses";
import { commentSchema } from "@/lib/shared/schemas/reviews";
import { loadSubmission } from "../../../courses/course-api";

/** GET /api/v1/reviews/:submissionId/comments — the comments on submission :submissionId. */
export const GET = route(async (request, context) => {
  const { submissionId } = await readParams(context, submissionParams);
  const actor = await requireActor(request);
  const submission = await loadSubmission(actor, submissionId);
  authorizeSubmissionRead(submission.viewerRole);
  return json({ comments: await listComments({ submissionId, userId: actor.userId }) });
});

/** POST /api/v1/reviews/:submissionId/comments — an instructor pins a comment to a move, a joint and a time. */
export const POST = route(async (request, context) => {
  const { submissionId } = await readParams(context, submissionParams);
  const body = await readJson(request, commentSchema);
  const actor = await requireActor(request);
  const submission = await loadSubmission(actor, submissionId);
  authorizeCourse(submission.viewerRole, "review:comment");
  const doc = submission.document as { moves?: unknown[]; arm?: { joints?: unknown[] } };
  const issues = [
    ...(body.moveIndex !== undefined && body.moveIndex >= (doc.moves?.length ?? 0)
      ? [
          {
            path: "moveIndex",
            message: `must be below ${doc.moves?.length ?? 0}, the plan's number of moves (0 is the first move)`,
          },
        ]
      : []),
    ...(body.jointIndex !== undefined && body.jointIndex >= (doc.arm?.joints?.length ?? 0)
      ? [
          {
            path: "jointIndex",
            message: `must be below ${doc.arm?.joints?.length ?? 0}, the arm's number of joints (0 is the first joint)`,
          },
        ]
      : []),
  ];
  if (issues.length > 0)
    throw new AppError(
      "bad_request:validation",
      "The comment is pinned to a move or joint the submitted plan does not have; pin it to one of the plan's own.",
      { issues },
    );
  const comment = await addComment({ submissionId, authorId: actor.userId, ...body });
  if (!comment) throw new AppError("conflict:submission", "This submission is already decided; comments are closed.");
  return json({ comment }, 201);
});
