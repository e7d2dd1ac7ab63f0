"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { columnsFor, DataTable } from "@/components/ui/data-table";
import { DateTime } from "@/components/ui/date-time";
import { SelectField, TextField } from "@/components/ui/field";
import { applyApiIssues, apiIssues, fieldMessage, formFailure } from "@/components/ui/form";
import { ErrorNote, Panel, RailHeading } from "@/components/ui/panel";
import { request } from "@/lib/client/api-client";
import { addMemberSchema, updateProjectSchema } from "@/lib/shared/schemas/api";

type Role = "owner" | "editor" | "viewer";
export type OverviewMember = { userId: string; email: string; name: string; role: Role; createdAt: string };
export type OverviewAuditEntry = {
  id: number;
  actorId: string | null;
  actorName: string | null;
  action: string;
  targetType: string;
  targetId: string;
  createdAt: string;
};
type Paged<T> = { items: T[]; nextCursor: string | null };

export interface ProjectOverviewProps {
  project: { id: string; name: string; kind: "course" | "research" | "personal"; role: Role; archived: boolean };
  can: { rename: boolean; manageMembers: boolean; readAudit: boolean };
  members: Paged<OverviewMember>;
  audit: Paged<OverviewAuditEntry> | null;
}

const memberCol = columnsFor<OverviewMember>();
const memberColumns = memberCol.columns([
  memberCol.accessor("name", { header: "Name", sortFn: "text" }),
  memberCol.accessor("email", { header: "E-mail", sortFn: "text", meta: { cellClassName: "text-ink-soft" } }),
  memberCol.accessor("role", { header: "Role", sortFn: "text" }),
  memberCol.accessor("createdAt", {
    header: "Member since",
    sortFn: "basic",
    enableGlobalFilter: false,
    meta: { cellClassName: "tabular text-xs text-ink-soft" },
    cell: (c) => <DateTime value={c.getValue()} />,
  }),
]);

const auditCol = columnsFor<OverviewAuditEntry>();
const auditColumns = auditCol.columns([
  auditCol.accessor("createdAt", {
    header: "When",
    sortFn: "basic",
    enableGlobalFilter: false,
    meta: { cellClassName: "tabular text-xs text-ink-soft whitespace-nowrap" },
    cell: (c) => <DateTime value={c.getValue()} />,
  }),
  auditCol.accessor((e) => e.actorName ?? "a removed account", { id: "actor", header: "Who", sortFn: "text" }),
  auditCol.accessor("action", { header: "What", sortFn: "text", meta: { cellClassName: "font-mono text-xs" } }),
  auditCol.accessor((e) => `${e.targetType} ${e.targetId}`, {
    id: "target",
    header: "On",
    enableSorting: false,
    meta: { cellClassName: "font-mono text-xs text-ink-soft" },
  }),
]);

/** Appends the next page of a cursor-paged list to what is shown. */
function usePagedList<T>(initial: Paged<T>, url: (cursor: string) => string, key: string) {
  const [list, setList] = useState(initial);
  const [loading, setLoading] = useState(false);
  const [error, setError] = useState<string | null>(null);
  async function more() {
    if (!list.nextCursor) return;
    setLoading(true);
    try {
      const page = await request<Record<string, unknown> & { nextCursor: string | null }>(url(list.nextCursor));
      setList((l) => ({ items: [...l.items, ...(page[key] as T[])], nextCursor: page.nextCursor }));
      setError(null);
    } catch (e) {
      setError(e instanceof Error ? e.message : "The next rows could not be loaded.");
    } finally {
      setLoading(false);
    }
  }
  return { list, setList, more, loading, error };
}

function LoadMore({
  nextCursor,
  loading,
  onMore,
  shown,
  error,
}: {
  nextCursor: string | null;
  loading: boolean;
  onMore: () => void;
  shown: number;
  error: string | null;
}) {
  if (!nextCursor && !error) return null;
  return (
    <div className="flex items-center gap-3 px-3 py-2 text-xs text-ink-soft">
      <span className="tabular">{shown} shown</span>
      {nextCursor ? (
        <Button size="sm" onClick={onMore} disabled={loading}>
          {loading ? "Loading…" : "Load more"}
        </Button>
      ) : null}
      {error ? (
        <span role="alert" className="text-fault">
          {error}
        </span>
      ) : null}
    </div>
  );
}

/** A project's page: rename (owners), members with an add form (owners), and the audit log (owners). */
export function ProjectOverview({ project, can, members, audit }: ProjectOverviewProps) {
  const router = useRouter();
  const [memberFilter, setMemberFilter] = useState("");
  const [auditFilter, setAuditFilter] = useState("");
  const memberList = usePagedList(
    members,
    (c) => `/api/v1/projects/${project.id}/members?cursor=${encodeURIComponent(c)}`,
    "members",
  );
  const auditList = usePagedList(
    audit ?? { items: [], nextCursor: null },
    (c) => `/api/v1/projects/${project.id}/audit?cursor=${encodeURIComponent(c)}`,
    "entries",
  );

  return (
    <div className="mx-auto max-w-6xl px-6 py-8">
      <p className="text-sm">
        <Link href="/projects" className="text-brand-600 hover:underline">
          Projects
        </Link>{" "}
        <span className="text-ink-faint">/</span>
      </p>
      <div className="mt-1 flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold tracking-tight">{project.name}</h1>
        <span className="rounded bg-brand-50 px-1.5 py-0.5 text-[11px] text-brand-700">{project.kind}</span>
        <span className="text-xs text-ink-faint">your role: {project.role}</span>
        {project.archived ? (
          <span className="rounded bg-caution-tint px-1.5 py-0.5 text-[11px] text-caution">archived: read only</span>
        ) : null}
        <span className="ml-auto flex gap-3 text-sm">
          <Link href={`/projects/${project.id}/recordings`} className="text-brand-600 hover:underline">
            Recordings
          </Link>
          <Link href={`/projects/${project.id}/datasets`} className="text-brand-600 hover:underline">
            Datasets
          </Link>
          <Link href={`/projects/${project.id}/arms`} className="text-brand-600 hover:underline">
            Arms
          </Link>
        </span>
      </div>

      {can.rename ? <RenameForm projectId={project.id} name={project.name} onRenamed={() => router.refresh()} /> : null}

      <Panel className="mt-6 overflow-hidden">
        <RailHeading id="members-heading">Members</RailHeading>
        <div className="flex flex-wrap items-start gap-4 px-3 pb-3">
          <TextField
            label="Filter members"
            type="search"
            placeholder="Name, e-mail or role"
            fieldClassName="w-64"
            value={memberFilter}
            onChange={(e) => setMemberFilter(e.target.value)}
          />
          {can.manageMembers ? (
            <AddMemberForm
              projectId={project.id}
              onAdded={(m) =>
                memberList.setList((l) => ({ ...l, items: [...l.items.filter((x) => x.userId !== m.userId), m] }))
              }
            />
          ) : (
            <p className="mt-5 text-xs text-ink-soft">
              Only the project&apos;s owners add members or change roles; ask an owner.
            </p>
          )}
        </div>
        <DataTable
          label="Members"
          data={memberList.list.items}
          columns={memberColumns}
          getRowId={(m) => m.userId}
          filter={memberFilter}
          initialSorting={[{ id: "email", desc: false }]}
          testId="members-table"
        />
        <LoadMore
          nextCursor={memberList.list.nextCursor}
          loading={memberList.loading}
          onMore={memberList.more}
          shown={memberList.list.items.length}
          error={memberList.error}
        />
      </Panel>

      {can.readAudit ? (
        <Panel className="mt-6 overflow-hidden">
          <RailHeading id="audit-heading">Activity</RailHeading>
          <p className="px-3 pb-2 text-xs text-ink-soft">
            Who did what in this project, newest first. Only owners see this.
          </p>
          <div className="px-3 pb-3">
            <TextField
              label="Filter activity"
              type="search"
              placeholder="Person or action"
              fieldClassName="w-64"
              value={auditFilter}
              onChange={(e) => setAuditFilter(e.target.value)}
            />
          </div>
          <DataTable
            label="Activity"
            data={auditList.list.items}
            columns={auditColumns}
            getRowId={(e) => String(e.id)}
            filter={auditFilter}
            initialSorting={[{ id: "createdAt", desc: true }]}
            empty={<p className="px-3 pb-3 text-sm text-ink-soft">Nothing recorded yet.</p>}
            testId="audit-table"
          />
          <LoadMore
            nextCursor={auditList.list.nextCursor}
            loading={auditList.loading}
            onMore={auditList.more}
            shown={auditList.list.items.length}
            error={auditList.error}
          />
        </Panel>
      ) : null}
    </div>
  );
}

function RenameForm({ projectId, name, onRenamed }: { projectId: string; name: string; onRenamed: () => void }) {
  const [failure, setFailure] = useState<string | undefined>();
  const [saved, setSaved] = useState(false);
  const defaultValues = useMemo((): { name?: string; archived?: boolean } => ({ name }), [name]);
  const form = useForm({ resolver: zodResolver(updateProjectSchema), defaultValues });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setFailure(undefined);
    setSaved(false);
    try {
      await request(`/api/v1/projects/${projectId}`, { method: "PATCH", body: JSON.stringify({ name: body.name }) });
      setSaved(true);
      onRenamed();
    } catch (error) {
      setFailure(formFailure(error, applyApiIssues(apiIssues(error), form.setError, ["name"])));
    }
  });
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      className="mt-4 flex flex-wrap items-start gap-3"
      aria-label="Rename the project"
    >
      <TextField
        label="Project name"
        fieldClassName="w-80"
        maxLength={120}
        error={fieldMessage("The name", errors.name)}
        {...form.register("name")}
      />
      <Button type="submit" disabled={isSubmitting} className="mt-5">
        {isSubmitting ? "Renaming…" : "Rename"}
      </Button>
      {saved ? (
        <p role="status" className="mt-7 text-xs text-pass">
          Renamed.
        </p>
      ) : null}
      {failure ? <ErrorNote title="The project was not renamed">{failure}</ErrorNote> : null}
    </form>
  );
}

function AddMemberForm({ projectId, onAdded }: { projectId: string; onAdded: (member: OverviewMember) => void }) {
  const [failure, setFailure] = useState<string | undefined>();
  const form = useForm({
    resolver: zodResolver(addMemberSchema),
    defaultValues: { email: "", role: "viewer" as Role },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setFailure(undefined);
    try {
      const { member } = await request<{ member: OverviewMember }>(`/api/v1/projects/${projectId}/members`, {
        method: "POST",
        body: JSON.stringify(body),
      });
      onAdded(member);
      form.reset();
    } catch (error) {
      setFailure(formFailure(error, applyApiIssues(apiIssues(error), form.setError, ["email", "role"])));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-wrap items-start gap-3" aria-label="Add a member">
      <TextField
        label="E-mail"
        type="email"
        fieldClassName="w-64"
        error={fieldMessage("The e-mail", errors.email)}
        {...form.register("email")}
      />
      <SelectField
        label="Role"
        fieldClassName="w-32"
        error={fieldMessage("The role", errors.role)}
        {...form.register("role")}
      >
        <option value="viewer">viewer</option>
        <option value="editor">editor</option>
        <option value="owner">owner</option>
      </SelectField>
      <Button type="submit" variant="primary" disabled={isSubmitting} className="mt-5">
        {isSubmitting ? "Adding…" : "Add or change role"}
      </Button>
      {failure ? (
        <div className="basis-full">
          <ErrorNote title="The member was not added">{failure}</ErrorNote>
        </div>
      ) : null}
    </form>
  );
}
