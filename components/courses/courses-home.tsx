"use client";
import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { columnsFor, DataTable } from "@/components/ui/data-table";
import { SelectField, TextField } from "@/components/ui/field";
import { applyApiIssues, apiIssues, fieldMessage, formFailure, numberOrEmpty, textOrEmpty } from "@/components/ui/form";
import { EmptyState, ErrorNote, Panel } from "@/components/ui/panel";
import { api } from "@/lib/client/api-client";
import { createCourseSchema, joinCourseSchema } from "@/lib/shared/schemas/courses";

export type CourseRow = {
  id: string;
  title: string;
  term: string;
  role: "instructor" | "student";
  joinCode: string | null;
};

const col = columnsFor<CourseRow>();
const courseColumns = col.columns([
  col.accessor("title", {
    header: "Course",
    sortFn: "text",
    cell: (c) => (
      <Link href={`/courses/${c.row.original.id}`} className="font-medium text-brand-700 hover:underline">
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor("term", { header: "Term", sortFn: "text" }),
  col.accessor("role", { header: "Your role", sortFn: "text" }),
  col.accessor("joinCode", {
    header: "Join code",
    enableSorting: false,
    meta: { cellClassName: "font-mono text-xs" },
    cell: (c) => c.getValue() ?? "—",
  }),
]);

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
  const [filter, setFilter] = useState("");
  return (
    <div className="mx-auto max-w-6xl px-6 py-8">
      <h1 className="text-2xl font-semibold tracking-tight">Courses</h1>
      <p className="text-sm text-ink-soft">
        Assignments, submissions and reviews. An instructor&apos;s approval means the work is accepted for the
        assignment; whether a plan runs on the lab&apos;s arm is decided by your lab&apos;s safety rules, not by this
        tool.
      </p>
      <div className="mt-6 grid gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <Panel className="self-start overflow-x-auto">
          {courses.length === 0 ? (
            <div className="p-4">
              <EmptyState title="No courses yet">
                Enter the join code your instructor gave you{canCreate ? ", or create a course" : ""}.
              </EmptyState>
            </div>
          ) : (
            <>
              <div className="px-3 pt-3 pb-2">
                <TextField
                  label="Filter courses"
                  type="search"
                  placeholder="Title, term or role"
                  fieldClassName="w-64"
                  value={filter}
                  onChange={(e) => setFilter(e.target.value)}
                />
              </div>
              <DataTable
                label="Your courses"
                data={courses}
                columns={courseColumns}
                getRowId={(c) => c.id}
                filter={filter}
                initialSorting={[{ id: "title", desc: false }]}
              />
            </>
          )}
        </Panel>
        <div className="flex flex-col gap-6">
          <JoinForm />
          {canCreate ? <NewCourseForm arms={arms} /> : null}
        </div>
      </div>
    </div>
  );
}

function JoinForm() {
  const router = useRouter();
  const [failure, setFailure] = useState<string | undefined>();
  const form = useForm({ resolver: zodResolver(joinCourseSchema), defaultValues: { code: "" } });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async ({ code }) => {
    setFailure(undefined);
    try {
      const r = await api.joinCourse(code);
      router.push(`/courses/${r.course.id}`);
    } catch (error) {
      setFailure(formFailure(error, applyApiIssues(apiIssues(error), form.setError, ["code"])));
    }
  });
  return (
    <Panel className="p-4">
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-label="Join a course">
        <h2 className="font-semibold">Join a course</h2>
        <TextField
          label="Join code"
          placeholder="8 letters and digits"
          autoComplete="off"
          className="font-mono uppercase"
          error={fieldMessage("The join code", errors.code)}
          {...form.register("code")}
        />
        <Button type="submit" variant="primary" disabled={isSubmitting}>
          {isSubmitting ? "Joining…" : "Join"}
        </Button>
        {failure ? <ErrorNote title="Not joined">{failure}</ErrorNote> : null}
      </form>
    </Panel>
  );
}

function NewCourseForm({ arms }: { arms: { revisionId: string; label: string }[] }) {
  const router = useRouter();
  const [failure, setFailure] = useState<string | undefined>();
  const form = useForm({
    resolver: zodResolver(createCourseSchema),
    defaultValues: { title: "", term: "", limits: { speedPercent: 70 } },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setFailure(undefined);
    try {
      const course = await api.createCourse(body);
      router.push(`/courses/${course.id}`);
    } catch (error) {
      setFailure(
        formFailure(
          error,
          applyApiIssues(apiIssues(error), form.setError, [
            "title",
            "term",
            "limits.speedPercent",
            "requiredArmRevisionId",
          ]),
        ),
      );
    }
  });
  return (
    <Panel className="p-4">
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-label="New course">
        <h2 className="font-semibold">New course</h2>
        <TextField label="Title" error={fieldMessage("The title", errors.title)} {...form.register("title")} />
        <TextField
          label="Term"
          placeholder="e.g. Autumn"
          error={fieldMessage("The term", errors.term)}
          {...form.register("term")}
        />
        <TextField
          label="Speed limit for submissions (% of each joint's maximum)"
          inputMode="decimal"
          hint="Every submission is checked against this stricter limit. Leave empty for the arm's own limits."
          error={fieldMessage("The speed limit", errors.limits?.speedPercent)}
          {...form.register("limits.speedPercent", { setValueAs: numberOrEmpty })}
        />
        <SelectField
          label="Required arm (optional)"
          hint="Every submission must be saved for this arm revision."
          error={fieldMessage("The required arm", errors.requiredArmRevisionId)}
          {...form.register("requiredArmRevisionId", { setValueAs: textOrEmpty })}
        >
          <option value="">Any arm (each assignment names one)</option>
          {arms.map((a) => (
            <option key={a.revisionId} value={a.revisionId}>
              {a.label}
            </option>
          ))}
        </SelectField>
        <Button type="submit" variant="primary" disabled={isSubmitting}>
          {isSubmitting ? "Creating…" : "Create course"}
        </Button>
        {failure ? <ErrorNote title="The course was not created">{failure}</ErrorNote> : null}
      </form>
    </Panel>
  );
}
