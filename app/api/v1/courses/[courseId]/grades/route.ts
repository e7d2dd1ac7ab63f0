import { listGrades } from "@/db/queries/reviews";
import { readParams, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeCourse } from "@/lib/server/permissions";
import { courseParams } from "@/lib/shared/schemas/courses";
import { csv, loadCourse } from "../../course-api";

/** GET /api/v1/courses/:courseId/grades — CSV: each student's latest submission per assignment, with verdict and status. */
export const GET = route(async (request, context) => {
  const { courseId } = await readParams(context, courseParams);
  const actor = await requireActor(request);
  const course = await loadCourse(actor, courseId);
  authorizeCourse(course.role, "grades:export");
  const rows = await listGrades({ courseId, userId: actor.userId });
  rows.sort((a, b) => a.studentName.localeCompare(b.studentName) || a.dueAt.getTime() - b.dueAt.getTime());
  const body = csv([
    [
      "student",
      "email",
      "assignment",
      "due_at",
      "attempt",
      "submitted_at",
      "late",
      "verdict",
      "status",
      "review_summary",
    ],
    ...rows.map((r) => [
      r.studentName,
      r.studentEmail,
      r.assignmentTitle,
      r.dueAt.toISOString(),
      r.attempt,
      r.submittedAt.toISOString(),
      r.late,
      r.verdict,
      r.status,
      r.summary,
    ]),
  ]);
  const name = `${
    course.title
      .replace(/[^A-Za-z0-9]+/g, "-")
      .replace(/^-|-$/g, "")
      .toLowerCase() || "course"
  }-grades.csv`;
  return new Response(body, {
    status: 200,
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="${name}"`,
      "Cache-Control": "no-store",
    },
  });
});
