import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getArmRevisionForUser, listArmsForUser } from "@/db/queries/arms";
import { getCourseForUser, listAssignmentsForUser, listRoster } from "@/db/queries/courses";
import { listSubmittablePlans } from "@/db/queries/plans";
import { CourseView, type ArmChoice, type PlanChoice } from "@/components/courses/course-view";
import { capabilities, visibleJoinCode } from "@/lib/server/permissions";
import { appLink } from "@/lib/server/mail/templates";
import { requirePageActor } from "@/lib/server/page-actor";

export const metadata: Metadata = { title: "Course" };
export const dynamic = "force-dynamic";

/** One course: its assignments with the caller's status; for instructors also the roster, invitations and grades. */
export default async function CoursePage({ params }: { params: Promise<{ courseId: string }> }) {
  const { courseId } = await params;
  const actor = await requirePageActor(`/courses/${courseId}`);
  if (!/^[0-9a-f-]{36}$/i.test(courseId)) notFound();
  const course = await getCourseForUser({ courseId, userId: actor.userId });
  if (!course) notFound();
  const can = capabilities(actor, { kind: "course", role: course.role });
  const teaches = can.canSetAssignments;
  const joinCode = visibleJoinCode(course);
  const [assignments, roster] = await Promise.all([
    listAssignmentsForUser({ courseId, userId: actor.userId }),
    can.canReadRoster ? listRoster({ courseId, userId: actor.userId }) : Promise.resolve([]),
  ]);

  // Students pick the plan version to submit (only their own work, as the submission route requires);
  // instructors may copy an assignment's poses from one of their own.
  const plans: PlanChoice[] = (await listSubmittablePlans({ userId: actor.userId })).map((p) => ({
    planId: p.planId,
    projectId: p.projectId,
    version: p.version,
    label: `${p.projectName} / ${p.planName} · version ${p.version}`,
    verdict: p.verdict,
  }));
  let arms: ArmChoice[] = [];
  if (teaches) {
    const list = await listArmsForUser({ userId: actor.userId });
    const revisions = await Promise.all(list.map((a) => getArmRevisionForUser({ armId: a.id, userId: actor.userId })));
    arms = list.flatMap((a, i) =>
      revisions[i] ? [{ revisionId: revisions[i].id, label: `${a.name} · revision ${revisions[i].revision}` }] : [],
    );
  }

  return (
    <CourseView
      course={{
        id: course.id,
        title: course.title,
        term: course.term,
        role: course.role,
        joinCode,
        inviteUrl: joinCode ? appLink(`/courses/join?code=${joinCode}`) : null,
      }}
      can={can}
      assignments={assignments.map((a) => ({
        id: a.id,
        title: a.title,
        instructions: a.instructions,
        dueAt: a.dueAt.toISOString(),
        status: a.status,
        latestSubmissionId: a.latestSubmissionId,
      }))}
      roster={roster.map((r) => ({
        userId: r.userId,
        name: r.name,
        email: r.email,
        role: r.role,
        joinedAt: r.joinedAt.toISOString(),
      }))}
      arms={arms}
      plans={plans}
    />
  );
}
