import type { Metadata } from "next";
import { getArmRevisionForUser, listArmsForUser } from "@/db/queries/arms";
import { listCoursesForUser } from "@/db/queries/courses";
import { CoursesHome } from "@/components/courses/courses-home";
import { capabilities, visibleJoinCode } from "@/lib/server/permissions";
import { requirePageActor } from "@/lib/server/page-actor";

export const metadata: Metadata = { title: "Courses" };
export const dynamic = "force-dynamic";

/** The caller's courses; join one with a code, or (instructors) create one. */
export default async function CoursesPage() {
  const actor = await requirePageActor("/courses");
  const canCreate = capabilities(actor, { kind: "site" }).canCreateCourse;
  const courses = await listCoursesForUser({ userId: actor.userId });
  const armList = canCreate ? await listArmsForUser({ userId: actor.userId }) : [];
  const revisions = await Promise.all(armList.map((a) => getArmRevisionForUser({ armId: a.id, userId: actor.userId })));
  const arms = armList.flatMap((a, i) =>
    revisions[i] ? [{ revisionId: revisions[i].id, label: `${a.name} · revision ${revisions[i].revision}` }] : [],
  );
  return (
    <CoursesHome
      arms={arms}
      canCreate={canCreate}
      courses={courses.map((c) => ({
        id: c.id,
        title: c.title,
        term: c.term,
        role: c.role,
        joinCode: visibleJoinCode(c),
      }))}
    />
  );
}
