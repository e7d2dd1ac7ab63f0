"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useMutation } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { EmptyState, ErrorNote, Panel } from "@/components/ui/panel";
import { Table, Td, Th } from "@/components/ui/table";
import { ApiError } from "@/lib/client/api-client";
import { api } from "@/lib/client/api-client";

export type CourseRow = {
  id: string;
  title: string;
  term: string;
  role: "instructor" | "student";
  joinCode: string | null;
};

function issue(error: unknown, path: string): string | undefined {
  return error instanceof ApiError ? error.issues.find((i) => i.path === path)?.message : undefined;
}

/** The courses list, the join-by-code form and (for instructors) the new-course form. */
export function CoursesHome({
  courses,
  canCreate,
  arms,
}: {
  courses: CourseRow[];
  canCreate: boolean;
  arms: { revisionId: string; label: string }[];
}) {
  const router = useRouter();
  const [code, setCode] = useState("");
  const [title, setTitle] = useState("");
  const [term, setTerm] = useState("");
  const [speedPercent, setSpeedPercent] = useState("70");
  const [arm, setArm] = useState("");
  const join = useMutation({
    mutationFn: () => api.joinCourse(code),
    onSuccess: (r) => router.push(`/courses/${r.course.id}`),
  });
  const create = useMutation({
    mutationFn: () => {
      const pct = Number(speedPercent);
      return api.createCourse({
        title,
        term,
        ...(arm ? { requiredArmRevisionId: arm } : {}),
        // sent as typed: the API refuses a value outside 0–100 under this field rather than dropping it
        ...(speedPercent.trim() ? { limits: { speedPercent: pct } } : {}),
      });
    },
    onSuccess: (c) => router.push(`/courses/${c.id}`),
  });

  return (
    <div className="mx-auto max-w-6xl px-6 py-8">
      <h1 className="text-2xl font-semibold tracking-tight">Courses</h1>
      <p className="text-sm text-ink-soft">
        Assignments, submissions and reviews. An instructor&apos;s approval means the work is accepted for the
        assignment; whether a plan runs on the lab&apos;s arm is decided by your lab&apos;s safety rules, not by this
        tool.
      </p>
      <div className="mt-6 grid gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <Panel className="overflow-x-auto">
          {courses.length === 0 ? (
            <div className="p-4">
              <EmptyState title="No courses yet">
                Enter the join code your instructor gave you{canCreate ? ", or create a course" : ""}.
              </EmptyState>
            </div>
          ) : (
            <Table aria-label="Your courses">
              <thead>
                <tr>
                  <Th>Course</Th>
                  <Th>Term</Th>
                  <Th>Your role</Th>
                  <Th>Join code</Th>
                </tr>
              </thead>
              <tbody>
                {courses.map((c) => (
                  <tr key={c.id}>
                    <Td>
                      <Link href={`/courses/${c.id}`} className="font-medium text-brand-700 hover:underline">
                        {c.title}
                      </Link>
                    </Td>
                    <Td>{c.term}</Td>
                    <Td>{c.role}</Td>
                    <Td className="font-mono text-xs">{c.joinCode ?? "—"}</Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          )}
        </Panel>
        <div className="flex flex-col gap-6">
          <Panel className="p-4">
            <form
              onSubmit={(e) => {
                e.preventDefault();
                join.mutate();
              }}
              className="flex flex-col gap-3"
            >
              <h2 className="font-semibold">Join a course</h2>
              <TextField
                label="Join code"
                value={code}
                onChange={(e) => setCode(e.target.value.toUpperCase())}
                placeholder="8 letters and digits"
                error={issue(join.error, "code")}
                className="font-mono"
              />
              <Button type="submit" variant="primary" disabled={join.isPending || code.trim().length === 0}>
                Join
              </Button>
              {join.error && !issue(join.error, "code") ? <ErrorNote>{join.error.message}</ErrorNote> : null}
            </form>
          </Panel>
          {canCreate ? (
            <Panel className="p-4">
              <form
                onSubmit={(e) => {
                  e.preventDefault();
                  create.mutate();
                }}
                className="flex flex-col gap-3"
              >
                <h2 className="font-semibold">New course</h2>
                <TextField
                  label="Title"
                  value={title}
                  onChange={(e) => setTitle(e.target.value)}
                  error={issue(create.error, "title")}
                />
                <TextField
                  label="Term"
                  value={term}
                  onChange={(e) => setTerm(e.target.value)}
                  placeholder="e.g. Autumn"
                  error={issue(create.error, "term")}
                />
                <TextField
                  label="Speed limit for submissions (% of each joint's maximum)"
                  inputMode="numeric"
                  value={speedPercent}
                  onChange={(e) => setSpeedPercent(e.target.value)}
                  hint="Every submission is checked against this stricter limit. Leave empty for the arm's own limits."
                  error={issue(create.error, "limits.speedPercent")}
                />
                <SelectField
                  label="Required arm (optional)"
                  value={arm}
                  onChange={(e) => setArm(e.target.value)}
                  hint="Every submission must be saved for this arm revision."
                >
                  <option value="">Any arm (each assignment names one)</option>
                  {arms.map((a) => (
                    <option key={a.revisionId} value={a.revisionId}>
                      {a.label}
                    </option>
                  ))}
                </SelectField>
                <Button type="submit" variant="primary" disabled={create.isPending}>
                  Create course
                </Button>
                {create.error && !issue(create.error, "title") && !issue(create.error, "term") ? (
                  <ErrorNote>{create.error.message}</ErrorNote>
                ) : null}
              </form>
            </Panel>
          ) : null}
        </div>
      </div>
    </div>
  );
}
