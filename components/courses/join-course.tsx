"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMutation } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { ErrorNote, Panel } from "@/components/ui/panel";
import { api } from "@/lib/client/api-client";

/** Confirms joining the course an invitation link opens. */
export function JoinCourse({
  code,
  course,
}: {
  code: string;
  /** The open course the code names, with the viewer's role in it when they are already enrolled. */
  course: { id: string; title: string; term: string; role: "instructor" | "student" | null } | null;
}) {
  const router = useRouter();
  const join = useMutation({
    mutationFn: () => api.joinCourse(code),
    onSuccess: (r) => router.push(`/courses/${r.course.id}`),
  });
  return (
    <div className="mx-auto max-w-lg px-6 py-12">
      <Panel className="p-6">
        {course?.role ? (
          <>
            <h1 className="text-xl font-semibold">{course.title}</h1>
            <p className="mt-1 text-sm text-ink-soft">
              {course.term} · you are already in this course as{" "}
              {course.role === "student" ? "a student" : "an instructor"}; there is nothing to join.
            </p>
            <Link
              href={`/courses/${course.id}`}
              className="mt-5 inline-flex h-9 items-center rounded-md bg-brand-600 px-3.5 text-sm font-medium text-white hover:bg-brand-700"
            >
              Open the course
            </Link>
          </>
        ) : course ? (
          <>
            <h1 className="text-xl font-semibold">Join {course.title}</h1>
            <p className="mt-1 text-sm text-ink-soft">
              {course.term} · join code <span className="font-mono">{code}</span>. You join as a student: you will see
              the course&apos;s assignments and can submit plans for review.
            </p>
            <Button className="mt-5" variant="primary" onClick={() => join.mutate()} disabled={join.isPending}>
              {join.isPending ? "Joining…" : "Join the course"}
            </Button>
            {join.error ? (
              <div className="mt-4">
                <ErrorNote title="Not joined">{join.error.message}</ErrorNote>
              </div>
            ) : null}
          </>
        ) : (
          <ErrorNote title="No course for this link">
            No course that is taking students has the join code{" "}
            {code ? <span className="font-mono">{code}</span> : null}: the code may be mistyped, or the course may be
            closed. Ask your instructor for the current code or link.
          </ErrorNote>
        )}
      </Panel>
    </div>
  );
}
