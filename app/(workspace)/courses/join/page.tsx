import type { Metadata } from "next";
import { getCourseByJoinCode } from "@/db/queries/courses";
import { JoinCourse } from "@/components/courses/join-course";
import { joinCourseSchema } from "@/lib/shared/schemas/courses";
import { requirePageActor } from "@/lib/server/page-actor";

export const metadata: Metadata = { title: "Join a course" };
export const dynamic = "force-dynamic";

/** The invitation link's target: shows the course the code opens and a button to join it. */
export default async function JoinCoursePage({ searchParams }: { searchParams: Promise<{ code?: string }> }) {
  const { code } = await searchParams;
  await requirePageActor(`/courses/join${code ? `?code=${encodeURIComponent(code)}` : ""}`);
  const parsed = joinCourseSchema.safeParse({ code: code ?? "" });
  const course = parsed.success ? await getCourseByJoinCode({ code: parsed.data.code }) : undefined;
  return (
    <JoinCourse
      code={parsed.success ? parsed.data.code : (code ?? "")}
      course={course && !course.archivedAt ? { title: course.title, term: course.term } : null}
    />
  );
}
