"use client";
import { submissionStatusWords } from "@/components/review/status-words";
import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { useMutation, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { columnsFor, DataTable } from "@/components/ui/data-table";
import { DateTime } from "@/components/ui/date-time";
import { SelectField, TextAreaField, TextField } from "@/components/ui/field";
import { applyApiIssues, apiIssues, fieldMessage, formFailure, numberOrEmpty } from "@/components/ui/form";
import { EmptyState, ErrorNote, Panel } from "@/components/ui/panel";
import { VerdictChip } from "@/components/ui/verdict-chip";
import { api } from "@/lib/client/api-client";
import type { CourseCapabilities } from "@/lib/server/permissions";
import { queryKeys } from "@/lib/client/query-keys";
import { createAssignmentSchema, inviteSchema, submitSchema } from "@/lib/shared/schemas/courses";

export type ArmChoice = { revisionId: string; label: string };
export type PlanChoice = {
  planId: string;
  projectId: string;
  version: number;
  label: string;
  verdict: "pass" | "caution" | "fault" | null;
};
type Status = "not-started" | "draft" | "submitted" | "returned" | "approved";

const statusWords: Record<Status, string> = {
  "not-started": "Not started",
  draft: "Draft",
  ...submissionStatusWords,
};

export interface CourseViewProps {
  course: {
    id: string;
    title: string;
    term: string;
    role: "instructor" | "student";
    joinCode: string | null;
    inviteUrl: string | null;
  };
  /** What the viewer may do here, from the server's `capabilities()`. */
  can: CourseCapabilities;
  assignments: {
    id: string;
    title: string;
    instructions: string;
    dueAt: string;
    status: Status;
    latestSubmissionId: string | null;
  }[];
  roster: { userId: string; name: string; email: string; role: "instructor" | "student"; joinedAt: string }[];
  arms: ArmChoice[];
  plans: PlanChoice[];
}

/** The bench for a plan, checked against an assignment's rules. */
export function benchHref(plan: Pick<PlanChoice, "projectId" | "planId">, assignmentId: string): string {
  return `/projects/${plan.projectId}/plans/${plan.planId}?assignment=${encodeURIComponent(assignmentId)}`;
}

const choiceKey = (p: Pick<PlanChoice, "planId" | "version">) => `${p.planId}:${p.version}`;

export function CourseView({ course, can, assignments, roster, arms, plans }: CourseViewProps) {
  const teaches = can.canReadAllSubmissions;
  return (
    <div className="mx-auto max-w-6xl px-6 py-8">
      <p className="text-sm">
        <Link href="/courses" className="text-brand-700 hover:underline">
          Courses
        </Link>
      </p>
      <h1 className="text-2xl font-semibold tracking-tight">{course.title}</h1>
      <p className="text-sm text-ink-soft">
        {course.term} · you are {teaches ? "an instructor" : "a student"} here
      </p>
      {can.canManage ? <InstructorTools course={course} can={can} /> : null}
      <h2 className="mt-8 text-lg font-semibold">Assignments</h2>
      <Panel className="mt-2 overflow-x-auto">
        <DataTable
          label="Assignments"
          data={assignments.map((a) => ({ ...a, plans, canSubmit: can.canSubmit }))}
          columns={teaches ? instructorAssignmentColumns : studentAssignmentColumns}
          getRowId={(a) => a.id}
          initialSorting={[{ id: "dueAt", desc: false }]}
          rowTestId="assignment-row"
          empty={
            <div className="p-4">
              <EmptyState title="No assignments yet">
                {teaches ? "Set the first one below." : "Your instructor has not set one yet."}
              </EmptyState>
            </div>
          }
        />
      </Panel>
      {can.canSetAssignments ? <NewAssignment courseId={course.id} arms={arms} plans={plans} /> : null}
      {can.canReadRoster ? <Roster courseId={course.id} roster={roster} canManage={can.canManageRoster} /> : null}
    </div>
  );
}

/** One row of the assignments table: the assignment, with what its cells need to offer a submission. */
type AssignmentRow = CourseViewProps["assignments"][number] & { plans: PlanChoice[]; canSubmit: boolean };
const assignmentCol = columnsFor<AssignmentRow>();

/** A student's statuses in the order of what is left to do: nothing yet, a draft, returned work, then waiting and done. */
const statusRank: Record<Status, number> = { "not-started": 0, draft: 1, returned: 2, submitted: 3, approved: 4 };

const titleColumn = (teaches: boolean) =>
  assignmentCol.accessor("title", {
    header: "Assignment",
    sortFn: "text",
    cell: (c) => {
      const a = c.row.original;
      return (
        <>
          <p className="font-medium">{a.title}</p>
          {a.instructions ? <p className="max-w-md text-xs text-ink-soft">{a.instructions}</p> : null}
          {teaches ? <InstructorBenchLink assignmentId={a.id} plans={a.plans} /> : null}
        </>
      );
    },
  });

const dueColumn = assignmentCol.accessor("dueAt", {
  header: "Due",
  sortFn: "basic",
  enableGlobalFilter: false,
  meta: { cellClassName: "text-xs whitespace-nowrap" },
  cell: (c) => <DateTime value={c.getValue()} className="tabular" />,
});

// Module-level columns: a cell function keeps its identity across refreshes, so a row's submit form
// (and the result it shows) is not remounted when the page's data is reloaded after a submission.
const instructorAssignmentColumns = assignmentCol.columns([
  titleColumn(true),
  dueColumn,
  assignmentCol.display({
    id: "review",
    header: "Review",
    cell: (c) => (
      <Link className="text-brand-700 hover:underline" href={`/reviews?assignmentId=${c.row.original.id}`}>
        Submissions
      </Link>
    ),
  }),
]);

const studentAssignmentColumns = assignmentCol.columns([
  titleColumn(false),
  dueColumn,
  assignmentCol.accessor((a) => statusWords[a.status], {
    id: "status",
    header: "Status",
    sortFn: (a, b) => statusRank[a.original.status] - statusRank[b.original.status],
    meta: { cellClassName: "text-xs whitespace-nowrap" },
    cell: (c) => {
      const a = c.row.original;
      return (
        <>
          {c.getValue()}
          {a.latestSubmissionId ? (
            <>
              {" "}
              ·{" "}
              <Link className="text-brand-700 hover:underline" href={`/reviews/${a.latestSubmissionId}`}>
                open
              </Link>
            </>
          ) : null}
        </>
      );
    },
  }),
  assignmentCol.display({
    id: "submit",
    header: "Preview and submit a saved plan version",
    cell: (c) => {
      const a = c.row.original;
      return (
        <SubmitForm
          assignmentId={a.id}
          plans={a.plans}
          disabled={!a.canSubmit || a.status === "submitted" || a.status === "approved"}
        />
      );
    },
  }),
]);

/** An instructor tries an assignment's rules on one of their own plans. */
function InstructorBenchLink({ assignmentId, plans }: { assignmentId: string; plans: PlanChoice[] }) {
  const first = plans[0];
  if (!first)
    return (
      <p className="mt-1 text-xs text-ink-faint">
        Save a plan of your own to try this assignment&apos;s rules on the bench.
      </p>
    );
  return (
    <p className="mt-1 text-xs">
      <Link className="text-brand-700 hover:underline" href={benchHref(first, assignmentId)}>
        Open the bench for this assignment
      </Link>{" "}
      <span className="text-ink-faint">with {first.label}</span>
    </p>
  );
}

/** The form's text box, read into the API's list of addresses. */
function splitAddresses(value: unknown): string[] {
  if (Array.isArray(value)) return value.map(String);
  return String(value ?? "")
    .split(/[\s,;]+/)
    .filter(Boolean);
}

function InstructorTools({ course, can }: { course: CourseViewProps["course"]; can: CourseCapabilities }) {
  const [failure, setFailure] = useState<string | undefined>();
  const [queued, setQueued] = useState<number | null>(null);
  const form = useForm({ resolver: zodResolver(inviteSchema), defaultValues: { emails: [] as string[] } });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setFailure(undefined);
    setQueued(null);
    try {
      const r = await api.inviteToCourse(course.id, body);
      setQueued(r.invited.length);
      form.reset({ emails: [] });
    } catch (error) {
      setFailure(formFailure(error, applyApiIssues(apiIssues(error), form.setError, ["emails"])));
    }
  });
  const typed = splitAddresses(useWatch({ control: form.control, name: "emails" }));
  const badIndex = Array.isArray(errors.emails) ? errors.emails.findIndex((e) => e?.message) : -1;
  const addressError =
    badIndex >= 0 && Array.isArray(errors.emails)
      ? `Address ${badIndex + 1}${typed[badIndex] ? ` (${typed[badIndex]})` : ""} ${errors.emails[badIndex]?.message}.`
      : fieldMessage("The address list", errors.emails as Parameters<typeof fieldMessage>[1]);
  return (
    <div className="mt-5 grid gap-4 md:grid-cols-2">
      <Panel className="p-4">
        <h2 className="font-semibold">Join code</h2>
        <p className="mt-1 font-mono text-2xl tracking-widest" data-testid="join-code">
          {course.joinCode}
        </p>
        <p className="mt-2 text-xs break-all text-ink-soft">
          Invitation link: <span className="font-mono">{course.inviteUrl}</span>
        </p>
        {can.canExportGrades ? (
          <p className="mt-3 text-sm">
            <a className="text-brand-700 hover:underline" href={`/api/v1/courses/${course.id}/grades`}>
              Download grades and verdicts (CSV)
            </a>
          </p>
        ) : null}
      </Panel>
      <Panel className="p-4">
        <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-label="Invite by e-mail">
          <h2 className="font-semibold">Invite by e-mail</h2>
          <TextAreaField
            label="Addresses"
            rows={3}
            hint="One or more, separated by spaces, commas or new lines."
            error={addressError}
            {...form.register("emails", { setValueAs: splitAddresses })}
          />
          <Button type="submit" variant="primary" disabled={isSubmitting}>
            {isSubmitting ? "Sending…" : "Send invitations"}
          </Button>
          {queued !== null ? (
            <p role="status" className="text-sm text-pass">
              Queued {queued} invitation{queued === 1 ? "" : "s"}.
            </p>
          ) : null}
          {failure ? <ErrorNote title="No invitations were sent">{failure}</ErrorNote> : null}
        </form>
      </Panel>
    </div>
  );
}

/** The chosen plan version as the select holds it, read into the API's body. */
const submitFormSchema = z
  .object({ choice: z.string().min(1, { error: "is required" }) })
  .transform(({ choice }) => {
    const [planId, version] = choice.split(":");
    return { planId, versionNumber: Number(version) };
  })
  .pipe(submitSchema);

function SubmitForm({
  assignmentId,
  plans,
  disabled,
}: {
  assignmentId: string;
  plans: PlanChoice[];
  disabled: boolean;
}) {
  const router = useRouter();
  const [failure, setFailure] = useState<string | undefined>();
  const submit = useMutation({
    mutationFn: (body: z.output<typeof submitFormSchema>) => api.submit(assignmentId, body),
    onSuccess: () => router.refresh(),
  });
  const form = useForm({
    resolver: zodResolver(submitFormSchema),
    defaultValues: { choice: plans[0] ? choiceKey(plans[0]) : "" },
  });
  const choice = useWatch({ control: form.control, name: "choice" });
  const chosen = useMemo(() => plans.find((p) => choiceKey(p) === choice), [plans, choice]);
  const onSubmit = form.handleSubmit(async (body) => {
    setFailure(undefined);
    try {
      await submit.mutateAsync(body);
    } catch (error) {
      setFailure(formFailure(error, applyApiIssues(apiIssues(error), form.setError, [])));
    }
  });
  if (plans.length === 0)
    return (
      <p className="text-xs text-ink-soft">
        Create a plan and save a version of it first; only plans you created can be submitted.
      </p>
    );
  return (
    <form onSubmit={onSubmit} noValidate className="flex max-w-xl flex-col gap-2">
      <div className="flex flex-wrap items-end gap-2">
        <SelectField
          label="Plan version"
          hideLabel
          fieldClassName="w-96 max-w-full"
          disabled={disabled}
          error={fieldMessage("The plan version", form.formState.errors.choice)}
          {...form.register("choice")}
        >
          {plans.map((p) => (
            <option key={choiceKey(p)} value={choiceKey(p)}>
              {p.label}
            </option>
          ))}
        </SelectField>
        <Button type="submit" variant="primary" size="sm" disabled={disabled || submit.isPending}>
          Submit
        </Button>
      </div>
      {chosen ? (
        <p className="flex flex-wrap items-center gap-1.5 text-xs text-ink-soft" data-testid="submit-preview">
          {chosen.verdict ? (
            <>
              Saved check on the arm&apos;s own limits: <VerdictChip size="sm" verdict={chosen.verdict} />
            </>
          ) : (
            <>This version has no saved check.</>
          )}
          <span>The assignment&apos;s limits may be stricter:</span>
          <Link className="text-brand-700 hover:underline" href={benchHref(chosen, assignmentId)}>
            preview it on the bench with this assignment&apos;s rules
          </Link>
        </p>
      ) : null}
      {submit.data ? (
        <span role="status" className="flex items-center gap-1 text-xs">
          <VerdictChip size="sm" verdict={submit.data.submission.verdict} /> attempt {submit.data.submission.attempt}
          {submit.data.ruleProblems.length
            ? ` · ${submit.data.ruleProblems.length} rule${submit.data.ruleProblems.length === 1 ? "" : "s"} not met`
            : ""}
        </span>
      ) : null}
      {failure ? <ErrorNote title="Not submitted">{failure}</ErrorNote> : null}
    </form>
  );
}

/** `datetime-local` text, read as UTC (the field says so), into the API's ISO 8601 form. */
function utcIso(value: unknown): string {
  const text = String(value ?? "").trim();
  if (!text) return "";
  const date = new Date(`${text}Z`);
  return Number.isNaN(date.getTime()) ? text : date.toISOString();
}

const assignmentFields = [
  "title",
  "dueAt",
  "requiredArmRevisionId",
  "limits.speedPercent",
  "instructions",
  "requiredStart",
  "requiredGoals",
] as const;

function NewAssignment({ courseId, arms, plans }: { courseId: string; arms: ArmChoice[]; plans: PlanChoice[] }) {
  const router = useRouter();
  const [failure, setFailure] = useState<string | undefined>();
  const [posesFrom, setPosesFrom] = useState("");
  // The required start and goal poses, copied from one of the instructor's saved plan versions.
  const [posesPlanId, posesVersion] = posesFrom.split(":");
  const poses = useQuery({
    queryKey: queryKeys.version(posesPlanId, Number(posesVersion)),
    enabled: posesFrom !== "",
    queryFn: () => api.getVersion(posesPlanId, Number(posesVersion)),
    select: (v) => {
      const doc = v.document as { start: number[]; moves: { goal: number[] }[] };
      return { start: doc.start, goals: doc.moves.map((m) => m.goal), armRevisionId: v.armRevisionId };
    },
  });
  const form = useForm({
    resolver: zodResolver(createAssignmentSchema),
    defaultValues: { title: "", instructions: "", dueAt: "", requiredArmRevisionId: arms[0]?.revisionId ?? "" },
  });
  const { errors, isSubmitting } = form.formState;
  const arm = useWatch({ control: form.control, name: "requiredArmRevisionId" });
  const onSubmit = form.handleSubmit(async (body) => {
    setFailure(undefined);
    try {
      await api.createAssignment(courseId, {
        ...body,
        ...(posesFrom && poses.data ? { requiredStart: poses.data.start, requiredGoals: poses.data.goals } : {}),
      });
      form.reset();
      setPosesFrom("");
      router.refresh();
    } catch (error) {
      setFailure(formFailure(error, applyApiIssues(apiIssues(error), form.setError, assignmentFields)));
    }
  });
  const poseError = errors.requiredStart ?? errors.requiredGoals;
  return (
    <Panel className="mt-4 p-4">
      <form onSubmit={onSubmit} noValidate className="grid gap-3 md:grid-cols-2" aria-label="New assignment">
        <h2 className="font-semibold md:col-span-2">New assignment</h2>
        <TextField label="Title" error={fieldMessage("The title", errors.title)} {...form.register("title")} />
        <TextField
          label="Due (UTC)"
          type="datetime-local"
          error={fieldMessage("The due date", errors.dueAt)}
          {...form.register("dueAt", { setValueAs: utcIso })}
        />
        <SelectField
          label="Required arm"
          error={fieldMessage("The required arm", errors.requiredArmRevisionId)}
          {...form.register("requiredArmRevisionId")}
        >
          {arms.map((a) => (
            <option key={a.revisionId} value={a.revisionId}>
              {a.label}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Speed limit (% of maximum, optional)"
          inputMode="decimal"
          hint="Applies on top of the course's limit; the stricter wins."
          error={fieldMessage("The speed limit", errors.limits?.speedPercent)}
          {...form.register("limits.speedPercent", { setValueAs: numberOrEmpty })}
        />
        <SelectField
          label="Required start and goal poses (optional)"
          value={posesFrom}
          onChange={(e) => setPosesFrom(e.target.value)}
          fieldClassName="md:col-span-2"
          hint={
            poses.data
              ? `Students must start at this plan's start pose and reach its ${poses.data.goals.length} goal pose${poses.data.goals.length === 1 ? "" : "s"} in order.${arms.some((a) => a.revisionId === poses.data.armRevisionId) && poses.data.armRevisionId !== arm ? " That plan was saved for another arm revision than the one selected." : ""}`
              : "Copy them from one of your saved plan versions; leave empty to accept any poses."
          }
          error={
            poses.error
              ? `The poses could not be read: ${poses.error.message}`
              : fieldMessage("The required poses", poseError as Parameters<typeof fieldMessage>[1])
          }
        >
          <option value="">Any poses</option>
          {plans.map((p) => (
            <option key={choiceKey(p)} value={choiceKey(p)}>
              {p.label}
            </option>
          ))}
        </SelectField>
        <TextAreaField
          label="Instructions"
          rows={3}
          fieldClassName="md:col-span-2"
          error={fieldMessage("The instructions", errors.instructions)}
          {...form.register("instructions")}
        />
        <div className="md:col-span-2">
          <Button type="submit" variant="primary" disabled={isSubmitting || (posesFrom !== "" && !poses.data)}>
            {isSubmitting ? "Setting…" : "Set assignment"}
          </Button>
          {failure ? (
            <div className="mt-2">
              <ErrorNote title="The assignment was not set">{failure}</ErrorNote>
            </div>
          ) : null}
        </div>
      </form>
    </Panel>
  );
}

type RosterRow = CourseViewProps["roster"][number];
const rosterCol = columnsFor<RosterRow>();

function Roster({ courseId, roster, canManage }: { courseId: string; roster: RosterRow[]; canManage: boolean }) {
  const router = useRouter();
  const [filter, setFilter] = useState("");
  const remove = useMutation({
    mutationFn: (userId: string) => api.removeStudent(courseId, userId),
    onSuccess: () => router.refresh(),
  });
  const columns = useMemo(
    () =>
      rosterCol.columns([
        rosterCol.accessor("name", { header: "Name", sortFn: "text" }),
        rosterCol.accessor("email", { header: "E-mail", sortFn: "text", meta: { cellClassName: "text-xs" } }),
        rosterCol.accessor("role", { header: "Role", sortFn: "text" }),
        rosterCol.accessor("joinedAt", {
          header: "Joined",
          sortFn: "basic",
          enableGlobalFilter: false,
          meta: { cellClassName: "tabular text-xs text-ink-soft whitespace-nowrap" },
          cell: (c) => <DateTime value={c.getValue()} />,
        }),
        rosterCol.display({
          id: "actions",
          header: () => <span className="sr-only">Actions</span>,
          cell: (c) => {
            const r = c.row.original;
            return canManage && r.role === "student" ? (
              <Button
                size="sm"
                variant="danger"
                disabled={remove.isPending}
                onClick={() => {
                  if (window.confirm(`Remove ${r.name} from the course? Their submissions stay on record.`))
                    remove.mutate(r.userId);
                }}
              >
                Remove
              </Button>
            ) : null;
          },
        }),
      ]),
    [canManage, remove],
  );
  return (
    <>
      <h2 className="mt-8 text-lg font-semibold">Roster</h2>
      <Panel className="mt-2 overflow-x-auto">
        <div className="px-3 pt-3 pb-2">
          <TextField
            label="Filter the roster"
            type="search"
            placeholder="Name, e-mail or role"
            fieldClassName="w-64"
            value={filter}
            onChange={(e) => setFilter(e.target.value)}
          />
        </div>
        <DataTable
          label="Roster"
          data={roster}
          columns={columns}
          getRowId={(r) => r.userId}
          filter={filter}
          initialSorting={[{ id: "name", desc: false }]}
          testId="roster-table"
        />
      </Panel>
      {remove.error ? (
        <div className="mt-2">
          <ErrorNote title="Not removed">{remove.error.message}</ErrorNote>
        </div>
      ) : null}
    </>
  );
}
