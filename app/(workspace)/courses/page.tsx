import type { Metadata } from "next";
import { listCoursesForUser } from "@/db/queries/courses";
import { CoursesHome } from "@/components/courses/courses-home";
import { canSite } from "@/lib/permissions";
import { requirePageActor } from "../session";

export const metadata: Metadata = { title: "Courses" };
export const dynamic = "force-dynamic";

/** The caller's courses; join one with a code, or (instructors) create one. */
export default async function CoursesPage() {
  const actor = await requirePageActor("/courses");
  const courses = await listCoursesForUser({ userId: actor.userId });
  return (
    <CoursesHome
      canCreate={canSite(actor, "project:create-course")}
      courses={courses.map((c) => ({ id: c.id, title: c.title, term: c.term, role: c.role, joinCode: c.role === "instructor" ? c.joinCode : null }))}
    />
  );
}
