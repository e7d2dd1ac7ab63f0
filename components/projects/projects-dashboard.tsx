"use client";
import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useId, useMemo, useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { columnsFor, DataTable } from "@/components/ui/data-table";
import { DateTime } from "@/components/ui/date-time";
import { Dialog } from "@/components/ui/dialog";
import { SelectField, TextField } from "@/components/ui/field";
import { applyApiIssues, apiIssues, fieldMessage, formFailure } from "@/components/ui/form";
import { PlusIcon } from "@/components/ui/icons";
import { EmptyState, ErrorNote, Panel } from "@/components/ui/panel";
import { VerdictChip } from "@/components/ui/verdict-chip";
import { api } from "@/lib/client/api-client";
import { createPlanSchema, createProjectSchema } from "@/lib/shared/schemas/api";

export interface DashboardPlan {
  id: string;
  name: string;
  armName: string;
  latestVersion: number;
  latestVerdict: "pass" | "caution" | "fault" | null;
  updatedAt: string;
}

export interface DashboardProject {
  id: string;
  name: string;
  kind: "course" | "research" | "personal";
  role: "owner" | "editor" | "viewer";
  updatedAt: string;
  plans: DashboardPlan[];
}

export interface DashboardArm {
  id: string;
  name: string;
  projectId: string | null;
  builtIn: boolean;
}

/** Worst first when sorted ascending; a plan never saved sorts last. */
const verdictRank = { fault: 0, caution: 1, pass: 2 } as const;
const rankOf = (v: DashboardPlan["latestVerdict"]) => (v ? verdictRank[v] : 3);

const col = columnsFor<DashboardPlan & { projectId: string }>();

const planColumns = col.columns([
  col.accessor("name", {
    header: "Plan",
    sortFn: "text",
    meta: { headerClassName: "pl-4", cellClassName: "pl-4" },
    cell: (c) => (
      <Link
        href={`/projects/${c.row.original.projectId}/plans/${c.row.original.id}`}
        className="font-medium text-brand-700 hover:underline"
      >
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor("armName", { header: "Arm", sortFn: "text", meta: { cellClassName: "text-ink-soft" } }),
  col.accessor("latestVersion", {
    header: "Version",
    sortFn: "basic",
    enableGlobalFilter: false,
    meta: { numeric: true },
    cell: (c) => c.getValue() || "—",
  }),
  col.accessor("latestVerdict", {
    header: "Last verdict",
    enableGlobalFilter: false,
    sortFn: (a, b) => rankOf(a.original.latestVerdict) - rankOf(b.original.latestVerdict),
    cell: (c) => {
      const v = c.getValue();
      return v ? <VerdictChip verdict={v} size="sm" /> : <span className="text-xs text-ink-faint">not saved yet</span>;
    },
  }),
  col.accessor("updatedAt", {
    header: "Changed",
    sortFn: "basic",
    enableGlobalFilter: false,
    meta: { cellClassName: "tabular text-xs text-ink-soft" },
    cell: (c) => <DateTime value={c.getValue()} />,
  }),
]);

/** Projects with their plans: filter, sort, create a project, create a plan from a demo or custom arm. */
export function ProjectsDashboard({ projects, arms }: { projects: DashboardProject[]; arms: DashboardArm[] }) {
  const router = useRouter();
  const [query, setQuery] = useState("");
  const [newProject, setNewProject] = useState(false);
  const [newPlanFor, setNewPlanFor] = useState<DashboardProject | null>(null);

  const withRows = useMemo(
    () => projects.map((p) => ({ ...p, rows: p.plans.map((pl) => ({ ...pl, projectId: p.id })) })),
    [projects],
  );
  const q = query.trim().toLowerCase();
  // A project shows when its name matches (all its plans), or when one of its plans does (the table filters them).
  const shown = withRows.filter(
    (p) =>
      !q ||
      p.name.toLowerCase().includes(q) ||
      p.plans.some((pl) => pl.name.toLowerCase().includes(q) || pl.armName.toLowerCase().includes(q)),
  );

  return (
    <div className="mx-auto max-w-6xl px-6 py-8">
      <div className="flex flex-wrap items-end gap-3">
        <div className="mr-auto">
          <h1 className="text-2xl font-semibold tracking-tight">Projects</h1>
          <p className="text-sm text-ink-soft">
            Your projects and their plans, with the verdict of each plan&apos;s latest saved version. Click a column
            heading to sort.
          </p>
        </div>
        <TextField
          label="Filter plans"
          placeholder="Plan, project or arm"
          value={query}
          onChange={(e) => setQuery(e.target.value)}
          fieldClassName="w-64"
          type="search"
        />
        <Button variant="primary" onClick={() => setNewProject(true)}>
          <PlusIcon size={14} /> New project
        </Button>
      </div>

      <div className="mt-6 flex flex-col gap-5">
        {projects.length === 0 ? (
          <EmptyState
            title="No projects yet"
            action={
              <Button variant="primary" onClick={() => setNewProject(true)}>
                Create your first project
              </Button>
            }
          >
            A project holds plans for one or more arms; create one to start planning moves.
          </EmptyState>
        ) : shown.length === 0 ? (
          <EmptyState title="Nothing matches the filter">Try a shorter word, or clear the filter box.</EmptyState>
        ) : (
          shown.map((p) => {
            const nameMatches = !q || p.name.toLowerCase().includes(q);
            return (
              <Panel key={p.id} className="overflow-hidden" aria-labelledby={`project-${p.id}`}>
                <div className="flex flex-wrap items-center gap-3 border-b border-line px-4 py-3">
                  <h2 id={`project-${p.id}`} className="font-semibold">
                    <Link href={`/projects/${p.id}`} className="hover:underline">
                      {p.name}
                    </Link>
                  </h2>
                  <span className="rounded bg-brand-50 px-1.5 py-0.5 text-[11px] text-brand-700">{p.kind}</span>
                  <span className="text-xs text-ink-faint">your role: {p.role}</span>
                  <span className="ml-auto flex items-center gap-3">
                    <Link href={`/projects/${p.id}`} className="text-sm text-brand-600 hover:underline">
                      Members and activity
                    </Link>
                    <Link href={`/projects/${p.id}/recordings`} className="text-sm text-brand-600 hover:underline">
                      Recordings
                    </Link>
                    <Link href={`/projects/${p.id}/arms`} className="text-sm text-brand-600 hover:underline">
                      Arms
                    </Link>
                    {p.role !== "viewer" ? (
                      <Button size="sm" onClick={() => setNewPlanFor(p)} aria-label={`New plan in ${p.name}`}>
                        <PlusIcon size={13} /> New plan
                      </Button>
                    ) : null}
                  </span>
                </div>
                <DataTable
                  label={`Plans in ${p.name}`}
                  data={p.rows}
                  columns={planColumns}
                  getRowId={(pl) => pl.id}
                  filter={nameMatches ? "" : query.trim()}
                  initialSorting={[{ id: "updatedAt", desc: true }]}
                  empty={<p className="px-4 py-4 text-sm text-ink-soft">No plans in this project yet.</p>}
                />
              </Panel>
            );
          })
        )}
      </div>

      <NewProjectDialog open={newProject} onClose={() => setNewProject(false)} onCreated={() => router.refresh()} />
      {newPlanFor ? (
        <NewPlanDialog
          project={newPlanFor}
          arms={arms.filter((a) => a.builtIn || a.projectId === newPlanFor.id)}
          onClose={() => setNewPlanFor(null)}
          onCreated={(planId) => router.push(`/projects/${newPlanFor.id}/plans/${planId}`)}
        />
      ) : null}
    </div>
  );
}

function NewProjectDialog({ open, onClose, onCreated }: { open: boolean; onClose: () => void; onCreated: () => void }) {
  const formId = useId();
  const [failure, setFailure] = useState<string | undefined>();
  const form = useForm({ resolver: zodResolver(createProjectSchema), defaultValues: { name: "", kind: "research" } });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setFailure(undefined);
    try {
      await api.createProject(body);
      form.reset();
      onClose();
      onCreated();
    } catch (error) {
      setFailure(formFailure(error, applyApiIssues(apiIssues(error), form.setError, ["name", "kind"])));
    }
  });
  return (
    <Dialog
      open={open}
      title="New project"
      onClose={onClose}
      actions={
        <>
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" form={formId} variant="primary" disabled={isSubmitting}>
            {isSubmitting ? "Creating…" : "Create project"}
          </Button>
        </>
      }
    >
      <form id={formId} className="flex flex-col gap-3" onSubmit={onSubmit} noValidate>
        <TextField
          label="Name"
          maxLength={120}
          autoFocus
          error={fieldMessage("The name", errors.name)}
          {...form.register("name")}
        />
        <SelectField label="Kind" error={fieldMessage("The kind", errors.kind)} {...form.register("kind")}>
          <option value="research">Research (a team&apos;s shared space)</option>
          <option value="personal">Personal</option>
        </SelectField>
        {failure ? <ErrorNote title="The project was not created">{failure}</ErrorNote> : null}
      </form>
    </Dialog>
  );
}

function NewPlanDialog({
  project,
  arms,
  onClose,
  onCreated,
}: {
  project: DashboardProject;
  arms: DashboardArm[];
  onClose: () => void;
  onCreated: (planId: string) => void;
}) {
  const formId = useId();
  const [failure, setFailure] = useState<string | undefined>();
  const form = useForm({
    resolver: zodResolver(createPlanSchema),
    defaultValues: { name: "", armId: arms[0]?.id ?? "" },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setFailure(undefined);
    try {
      const plan = await api.createPlan(project.id, body);
      onCreated(plan.id);
    } catch (error) {
      setFailure(formFailure(error, applyApiIssues(apiIssues(error), form.setError, ["name", "armId"])));
    }
  });
  return (
    <Dialog
      open
      title={`New plan in ${project.name}`}
      onClose={onClose}
      actions={
        <>
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" form={formId} variant="primary" disabled={isSubmitting || arms.length === 0}>
            {isSubmitting ? "Creating…" : "Create and open"}
          </Button>
        </>
      }
    >
      <form id={formId} className="flex flex-col gap-3" onSubmit={onSubmit} noValidate>
        <TextField
          label="Plan name"
          maxLength={120}
          autoFocus
          error={fieldMessage("The plan name", errors.name)}
          {...form.register("name")}
        />
        <SelectField
          label="Arm"
          error={fieldMessage("The arm", errors.armId)}
          hint="Demo arms are built in; custom arms belong to this project (add them on the project's Arms page)."
          {...form.register("armId")}
        >
          {arms.map((a) => (
            <option key={a.id} value={a.id}>
              {a.name}
              {a.builtIn ? " (demo arm)" : " (custom)"}
            </option>
          ))}
        </SelectField>
        {failure ? <ErrorNote title="The plan was not created">{failure}</ErrorNote> : null}
      </form>
    </Dialog>
  );
}
