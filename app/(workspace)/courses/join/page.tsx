import type { Metadata } from "next";
import { getCourseByJoinCode, getCourseForUser } from "@/db/queries/courses";
import { JoinCourse } from "@/components/courses/join-course";
import { joinCourseSchema } from "@/lib/shared/schemas/courses";
import { requirePageActor } from "@/lib/server/page-actor";

export const metadata: Metadata = { title: "Join a course" };
export const dynamic = "force-dynamic";

/** The invitation link's target: shows the course the code opens and a button to join it. */
export default async function JoinCoursePage({ searchParams }: { searchParams: Promise<{ code?: string }> }) {
  const { code } = await searchParams;
  const actor = await requirePageActor(`/courses/join${code ? `?code=${encodeURIComponent(code)}` : ""}`);
  const parsed = joinCourseSchema.safeParse({ code: code ?? "" });
  const course = parsed.success ? await getCourseByJoinCode({ code: parsed.data.code }) : undefined;
  const open = course && !course.archivedAt ? course : undefined;
  // Someone already in the course is sent to it rather than asked to join again.
  const mine = open ? await getCourseForUser({ courseId: open.id, userId: actor.userId }) : undefined;
  return (
    <JoinCourse
      code={parsed.success ? parsed.data.code : (code ?? "")}
      course={open ? { id: open.id, title: open.title, term: open.term, role: mine?.role ?? null } : null}
    />
  );
}
