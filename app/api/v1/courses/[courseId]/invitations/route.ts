import { randomUUID } from "node:crypto";
import { queueMail } from "@/db/queries/mail";
import { getActiveUserById } from "@/db/queries/users";
import { json, readJson, readParams, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeCourse } from "@/lib/server/permissions";
import { enqueueMail } from "@/lib/server/mail/queue";
import { appLink, courseInvitation } from "@/lib/server/mail/templates";
import { courseParams, inviteSchema } from "@/lib/shared/schemas/courses";
import { joinPath, loadCourse, outbox } from "../../course-api";

/** POST /api/v1/courses/:courseId/invitations — e-mails the join link to each address (instructors only). */
export const POST = route(async (request, context) => {
  const { courseId } = await readParams(context, courseParams);
  const body = await readJson(request, inviteSchema);
  const actor = await requireActor(request);
  const course = await loadCourse(actor, courseId);
  authorizeCourse(course.role, "course:manage");
  const instructor = await getActiveUserById({ id: actor.userId });
  const batch = randomUUID();
  const emails = [...new Set(body.emails)];
  const ids = await queueMail(
    emails.map((email) =>
      outbox(
        "course-invitation",
        `course-invitation:${course.id}:${email}:${batch}`,
        email,
        courseInvitation({
          courseTitle: course.title,
          term: course.term,
          instructorName: instructor?.name ?? "Your instructor",
          joinCode: course.joinCode,
        }),
      ),
    ),
  );
  await enqueueMail(ids);
  return json({ invited: emails, inviteUrl: appLink(joinPath(course.joinCode)) }, 202);
});
