"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useMutation, useQuery } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { SelectField, TextAreaField, TextField } from "@/components/ui/field";
import { EmptyState, ErrorNote, Panel } from "@/components/ui/panel";
import { Table, Td, Th } from "@/components/ui/table";
import { VerdictChip } from "@/components/ui/verdict-chip";
import { api, ApiError } from "@/lib/client/api-client";
import type { CourseCapabilities } from "@/lib/server/permissions";
import { queryKeys } from "@/lib/client/query-keys";

export type ArmChoice = { revisionId: string; label: string };
export type PlanChoice = {
  planId: string;
  version: number;
  label: string;
  verdict: "pass" | "caution" | "fault" | null;
};
type Status = "not-started" | "draft" | "submitted" | "returned" | "approved";

const statusWords: Record<Status, string> = {
  "not-started": "Not started",
  draft: "Draft",
  submitted: "Submitted, waiting for review",
  returned: "Returned with comments",
  approved: "Approved",
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

function due(iso: string): string {
  return (
    new Date(iso).toLocaleString("en-GB", {
      day: "numeric",
      month: "short",
      year: "numeric",
      hour: "2-digit",
      minute: "2-digit",
      timeZone: "UTC",
    }) + " UTC"
  );
}

function fieldError(error: unknown, path: string): string | undefined {
  return error instanceof ApiError ? error.issues.find((i) => i.path === path)?.message : undefined;
}

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
        {assignments.length === 0 ? (
          <div className="p-4">
            <EmptyState title="No assignments yet">
              {teaches ? "Set the first one below." : "Your instructor has not set one yet."}
            </EmptyState>
          </div>
        ) : (
          <Table aria-label="Assignments">
            <thead>
              <tr>
                <Th>Assignment</Th>
                <Th>Due</Th>
                {teaches ? null : <Th>Status</Th>}
                {teaches ? <Th>Review</Th> : <Th>Submit a saved plan version</Th>}
              </tr>
            </thead>
            <tbody>
              {assignments.map((a) => (
                <tr key={a.id} data-testid="assignment-row">
                  <Td>
                    <p className="font-medium">{a.title}</p>
                    {a.instructions ? <p className="max-w-md text-xs text-ink-soft">{a.instructions}</p> : null}
                  </Td>
                  <Td className="tabular text-xs whitespace-nowrap">{due(a.dueAt)}</Td>
                  {teaches ? (
                    <Td>
                      <Link className="text-brand-700 hover:underline" href={`/reviews?assignmentId=${a.id}`}>
                        Submissions
                      </Link>
                    </Td>
                  ) : (
                    <>
                      <Td className="text-xs">
                        {statusWords[a.status]}
                        {a.latestSubmissionId ? (
                          <>
                            {" "}
                            ·{" "}
                            <Link className="text-brand-700 hover:underline" href={`/reviews/${a.latestSubmissionId}`}>
                              open
                            </Link>
                          </>
                        ) : null}
                      </Td>
                      <Td>
                        <SubmitForm
                          assignmentId={a.id}
                          plans={plans}
                          disabled={!can.canSubmit || a.status === "submitted" || a.status === "approved"}
                        />
                      </Td>
                    </>
                  )}
                </tr>
              ))}
            </tbody>
          </Table>
        )}
      </Panel>
      {can.canSetAssignments ? <NewAssignment courseId={course.id} arms={arms} plans={plans} /> : null}
      {can.canReadRoster ? <Roster courseId={course.id} roster={roster} canManage={can.canManageRoster} /> : null}
    </div>
  );
}

function InstructorTools({ course, can }: { course: CourseViewProps["course"]; can: CourseCapabilities }) {
  const [emails, setEmails] = useState("");
  const invite = useMutation({
    mutationFn: () => api.inviteToCourse(course.id, { emails: emails.split(/[\s,;]+/).filter(Boolean) }),
  });
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
        <form
          onSubmit={(e) => {
            e.preventDefault();
            invite.mutate();
          }}
          className="flex flex-col gap-3"
        >
          <h2 className="font-semibold">Invite by e-mail</h2>
          <TextAreaField
            label="Addresses"
            rows={3}
            value={emails}
            onChange={(e) => setEmails(e.target.value)}
            hint="One or more, separated by spaces, commas or new lines."
          />
          <Button type="submit" variant="primary" disabled={invite.isPending || !emails.trim()}>
            Send invitations
          </Button>
          {invite.isSuccess ? (
            <p role="status" className="text-sm text-pass">
              Queued {invite.data.invited.length} invitation{invite.data.invited.length === 1 ? "" : "s"}.
            </p>
          ) : null}
          {invite.error ? (
            <ErrorNote>
              {invite.error instanceof ApiError && invite.error.issues[0]
                ? `${invite.error.issues[0].path}: ${invite.error.issues[0].message}`
                : invite.error.message}
            </ErrorNote>
          ) : null}
        </form>
      </Panel>
    </div>
  );
}

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
  const [choice, setChoice] = useState(plans[0] ? `${plans[0].planId}:${plans[0].version}` : "");
  const submit = useMutation({
    mutationFn: () => {
      const [planId, version] = choice.split(":");
      return api.submit(assignmentId, { planId, versionNumber: Number(version) });
    },
    onSuccess: () => router.refresh(),
  });
  if (plans.length === 0)
    return (
      <p className="text-xs text-ink-soft">
        Create a plan and save a version of it first; only plans you created can be submitted.
      </p>
    );
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        submit.mutate();
      }}
      className="flex flex-wrap items-end gap-2"
    >
      <SelectField
        label="Plan version"
        hideLabel
        value={choice}
        onChange={(e) => setChoice(e.target.value)}
        fieldClassName="w-72"
        disabled={disabled}
      >
        {plans.map((p) => (
          <option key={`${p.planId}:${p.version}`} value={`${p.planId}:${p.version}`}>
            {p.label}
          </option>
        ))}
      </SelectField>
      <Button type="submit" variant="primary" size="sm" disabled={disabled || submit.isPending}>
        Submit
      </Button>
      {submit.data ? (
        <span role="status" className="flex items-center gap-1 text-xs">
          <VerdictChip size="sm" verdict={submit.data.submission.verdict} /> attempt {submit.data.submission.attempt}
          {submit.data.ruleProblems.length
            ? ` · ${submit.data.ruleProblems.length} rule${submit.data.ruleProblems.length === 1 ? "" : "s"} not met`
            : ""}
        </span>
      ) : null}
      {submit.error ? <ErrorNote>{submit.error.message}</ErrorNote> : null}
    </form>
  );
}

function NewAssignment({ courseId, arms, plans }: { courseId: string; arms: ArmChoice[]; plans: PlanChoice[] }) {
  const router = useRouter();
  const [title, setTitle] = useState("");
  const [instructions, setInstructions] = useState("");
  const [dueAt, setDueAt] = useState("");
  const [arm, setArm] = useState(arms[0]?.revisionId ?? "");
  const [speed, setSpeed] = useState("");
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
  const create = useMutation({
    mutationFn: () => {
      const pct = Number(speed);
      return api.createAssignment(courseId, {
        title,
        instructions,
        dueAt: dueAt ? new Date(`${dueAt}Z`).toISOString() : "",
        requiredArmRevisionId: arm,
        // sent as typed: the API refuses a value outside 0–100 under this field rather than dropping it
        ...(speed.trim() ? { limits: { speedPercent: pct } } : {}),
        ...(posesFrom && poses.data ? { requiredStart: poses.data.start, requiredGoals: poses.data.goals } : {}),
      });
    },
    onSuccess: () => {
      setTitle("");
      setInstructions("");
      setPosesFrom("");
      router.refresh();
    },
  });
  return (
    <Panel className="mt-4 p-4">
      <form
        onSubmit={(e) => {
          e.preventDefault();
          create.mutate();
        }}
        className="grid gap-3 md:grid-cols-2"
      >
        <h2 className="font-semibold md:col-span-2">New assignment</h2>
        <TextField
          label="Title"
          value={title}
          onChange={(e) => setTitle(e.target.value)}
          error={fieldError(create.error, "title")}
        />
        <TextField
          label="Due (UTC)"
          type="datetime-local"
          value={dueAt}
          onChange={(e) => setDueAt(e.target.value)}
          error={fieldError(create.error, "dueAt")}
        />
        <SelectField label="Required arm" value={arm} onChange={(e) => setArm(e.target.value)}>
          {arms.map((a) => (
            <option key={a.revisionId} value={a.revisionId}>
              {a.label}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Speed limit (% of maximum, optional)"
          inputMode="numeric"
          value={speed}
          onChange={(e) => setSpeed(e.target.value)}
          hint="Applies on top of the course's limit; the stricter wins."
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
          error={poses.error ? poses.error.message : undefined}
        >
          <option value="">Any poses</option>
          {plans.map((p) => (
            <option key={`${p.planId}:${p.version}`} value={`${p.planId}:${p.version}`}>
              {p.label}
            </option>
          ))}
        </SelectField>
        <TextAreaField
          label="Instructions"
          rows={3}
          value={instructions}
          onChange={(e) => setInstructions(e.target.value)}
          fieldClassName="md:col-span-2"
        />
        <div className="md:col-span-2">
          <Button type="submit" variant="primary" disabled={create.isPending || (posesFrom !== "" && !poses.data)}>
            Set assignment
          </Button>
          {create.error && !fieldError(create.error, "title") && !fieldError(create.error, "dueAt") ? (
            <div className="mt-2">
              <ErrorNote>{create.error.message}</ErrorNote>
            </div>
          ) : null}
        </div>
      </form>
    </Panel>
  );
}

function Roster({
  courseId,
  roster,
  canManage,
}: {
  courseId: string;
  roster: CourseViewProps["roster"];
  canManage: boolean;
}) {
  const router = useRouter();
  const remove = useMutation({
    mutationFn: (userId: string) => api.removeStudent(courseId, userId),
    onSuccess: () => router.refresh(),
  });
  return (
    <>
      <h2 className="mt-8 text-lg font-semibold">Roster</h2>
      <Panel className="mt-2 overflow-x-auto">
        <Table aria-label="Roster">
          <thead>
            <tr>
              <Th>Name</Th>
              <Th>E-mail</Th>
              <Th>Role</Th>
              <Th>Joined</Th>
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            </tr>
          </thead>
          <tbody>
            {roster.map((r) => (
              <tr key={r.userId}>
                <Td>{r.name}</Td>
                <Td className="text-xs">{r.email}</Td>
                <Td>{r.role}</Td>
                <Td className="tabular text-xs">{due(r.joinedAt)}</Td>
                <Td>
                  {canManage && r.role === "student" ? (
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
                  ) : null}
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      </Panel>
      {remove.error ? (
        <div className="mt-2">
          <ErrorNote>{remove.error.message}</ErrorNote>
        </div>
      ) : null}
    </>
  );
}
