"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { useMutation } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { SelectField, TextField } from "@/components/ui/field";
import { PlusIcon } from "@/components/ui/icons";
import { EmptyState, ErrorNote, Panel } from "@/components/ui/panel";
import { Table, Td, Th } from "@/components/ui/table";
import { VerdictChip } from "@/components/ui/verdict-chip";
import { api, ApiError } from "@/lib/client/api-client";

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
  /** From the server's capabilities(): may create plans here. */
  canEdit: boolean;
  updatedAt: string;
  plans: DashboardPlan[];
}

export interface DashboardArm {
  id: string;
  name: string;
  projectId: string | null;
  builtIn: boolean;
}

type Sort = "recent" | "name" | "verdict";
const verdictRank = { fault: 0, caution: 1, pass: 2 } as const;

function formatDate(iso: string): string {
  return new Date(iso).toLocaleString("en-GB", { day: "numeric", month: "short", hour: "2-digit", minute: "2-digit", timeZone: "UTC" }) + " UTC";
}

/** Projects with their plans: search, sort, create a project, create a plan from a demo or custom arm. */
export function ProjectsDashboard({ projects, arms }: { projects: DashboardProject[]; arms: DashboardArm[] }) {
  const router = useRouter();
  const [query, setQuery] = useState("");
  const [sort, setSort] = useState<Sort>("recent");
  const [newProject, setNewProject] = useState(false);
  const [newPlanFor, setNewPlanFor] = useState<DashboardProject | null>(null);

  const shown = useMemo(() => {
    const q = query.trim().toLowerCase();
    return projects
      .map((p) => ({
        ...p,
        plans: p.plans
          .filter((pl) => !q || p.name.toLowerCase().includes(q) || pl.name.toLowerCase().includes(q) || pl.armName.toLowerCase().includes(q))
          .sort((a, b) =>
            sort === "name"
              ? a.name.localeCompare(b.name)
              : sort === "verdict"
                ? (a.latestVerdict ? verdictRank[a.latestVerdict] : 3) - (b.latestVerdict ? verdictRank[b.latestVerdict] : 3)
                : b.updatedAt.localeCompare(a.updatedAt),
          ),
      }))
      .filter((p) => !q || p.name.toLowerCase().includes(q) || p.plans.length > 0);
  }, [projects, query, sort]);

  return (
    <div className="mx-auto max-w-6xl px-6 py-8">
      <div className="flex flex-wrap items-end gap-3">
        <div className="mr-auto">
          <h1 className="text-2xl font-semibold tracking-tight">Projects</h1>
          <p className="text-sm text-ink-soft">Your projects and their plans, with the verdict of each plan&apos;s latest saved version.</p>
        </div>
        <TextField label="Search plans" placeholder="Plan, project or arm" value={query} onChange={(e) => setQuery(e.target.value)} fieldClassName="w-64" type="search" />
        <SelectField label="Sort plans by" value={sort} onChange={(e) => setSort(e.target.value as Sort)} fieldClassName="w-52">
          <option value="recent">Most recently changed</option>
          <option value="name">Name</option>
          <option value="verdict">Worst verdict first</option>
        </SelectField>
        <Button variant="primary" onClick={() => setNewProject(true)}>
          <PlusIcon size={14} /> New project
        </Button>
      </div>

      <div className="mt-6 flex flex-col gap-5">
        {projects.length === 0 ? (
          <EmptyState title="No projects yet" action={<Button variant="primary" onClick={() => setNewProject(true)}>Create your first project</Button>}>
            A project holds plans for one or more arms; create one to start planning moves.
          </EmptyState>
        ) : shown.length === 0 ? (
          <EmptyState title="Nothing matches your search">Try a shorter word, or clear the search box.</EmptyState>
        ) : (
          shown.map((p) => (
            <Panel key={p.id} className="overflow-hidden" aria-labelledby={`project-${p.id}`}>
              <div className="flex flex-wrap items-center gap-3 border-b border-line px-4 py-3">
                <h2 id={`project-${p.id}`} className="font-semibold">{p.name}</h2>
                <span className="rounded bg-brand-50 px-1.5 py-0.5 text-[11px] text-brand-700">{p.kind}</span>
                <span className="text-xs text-ink-faint">your role: {p.role}</span>
                <span className="ml-auto flex gap-2">
                  <Link href={`/projects/${p.id}/recordings`} className="text-sm text-brand-600 hover:underline">Recordings</Link>
                  <Link href={`/projects/${p.id}/arms`} className="text-sm text-brand-600 hover:underline">Arms</Link>
                  {p.canEdit ? (
                    <Button size="sm" onClick={() => setNewPlanFor(p)} aria-label={`New plan in ${p.name}`}>
                      <PlusIcon size={13} /> New plan
                    </Button>
                  ) : null}
                </span>
              </div>
              {p.plans.length === 0 ? (
                <p className="px-4 py-4 text-sm text-ink-soft">No plans in this project yet.</p>
              ) : (
                <Table aria-label={`Plans in ${p.name}`}>
                  <thead>
                    <tr>
                      <Th className="pl-4">Plan</Th>
                      <Th>Arm</Th>
                      <Th numeric>Version</Th>
                      <Th>Last verdict</Th>
                      <Th>Changed</Th>
                    </tr>
                  </thead>
                  <tbody>
                    {p.plans.map((pl) => (
                      <tr key={pl.id} className="hover:bg-paper">
                        <Td className="pl-4">
                          <Link href={`/projects/${p.id}/plans/${pl.id}`} className="font-medium text-brand-700 hover:underline">{pl.name}</Link>
                        </Td>
                        <Td className="text-ink-soft">{pl.armName}</Td>
                        <Td numeric>{pl.latestVersion || "—"}</Td>
                        <Td>{pl.latestVerdict ? <VerdictChip verdict={pl.latestVerdict} size="sm" /> : <span className="text-xs text-ink-faint">not saved yet</span>}</Td>
                        <Td className="tabular text-xs text-ink-soft">{formatDate(pl.updatedAt)}</Td>
                      </tr>
                    ))}
                  </tbody>
                </Table>
              )}
            </Panel>
          ))
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

function issueFor(error: unknown, path: string): string | undefined {
  return error instanceof ApiError ? error.issues.find((i) => i.path === path)?.message : undefined;
}

function NewProjectDialog({ open, onClose, onCreated }: { open: boolean; onClose: () => void; onCreated: () => void }) {
  const [name, setName] = useState("");
  const [kind, setKind] = useState<"research" | "personal">("research");
  const create = useMutation({
    mutationFn: () => api.createProject({ name: name.trim(), kind }),
    onSuccess: () => {
      onClose();
      setName("");
      onCreated();
    },
  });
  return (
    <Dialog
      open={open}
      title="New project"
      onClose={onClose}
      actions={
        <>
          <Button onClick={onClose}>Cancel</Button>
          <Button variant="primary" disabled={!name.trim() || create.isPending} onClick={() => create.mutate()}>
            {create.isPending ? "Creating…" : "Create project"}
          </Button>
        </>
      }
    >
      <form className="flex flex-col gap-3" onSubmit={(e) => { e.preventDefault(); if (name.trim()) create.mutate(); }}>
        <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} maxLength={120} autoFocus error={issueFor(create.error, "name")} />
        <SelectField label="Kind" value={kind} onChange={(e) => setKind(e.target.value as "research" | "personal")}>
          <option value="research">Research (a team&apos;s shared space)</option>
          <option value="personal">Personal</option>
        </SelectField>
        {create.error && !issueFor(create.error, "name") ? <ErrorNote title="The project was not created">{create.error.message}</ErrorNote> : null}
      </form>
    </Dialog>
  );
}

function NewPlanDialog({ project, arms, onClose, onCreated }: { project: DashboardProject; arms: DashboardArm[]; onClose: () => void; onCreated: (planId: string) => void }) {
  const [name, setName] = useState("");
  const [armId, setArmId] = useState(arms[0]?.id ?? "");
  const create = useMutation({
    mutationFn: () => api.createPlan(project.id, { name: name.trim(), armId }),
    onSuccess: (plan) => onCreated(plan.id),
  });
  return (
    <Dialog
      open
      title={`New plan in ${project.name}`}
      onClose={onClose}
      actions={
        <>
          <Button onClick={onClose}>Cancel</Button>
          <Button variant="primary" disabled={!name.trim() || !armId || create.isPending} onClick={() => create.mutate()}>
            {create.isPending ? "Creating…" : "Create and open"}
          </Button>
        </>
      }
    >
      <form className="flex flex-col gap-3" onSubmit={(e) => { e.preventDefault(); if (name.trim() && armId) create.mutate(); }}>
        <TextField label="Plan name" value={name} onChange={(e) => setName(e.target.value)} maxLength={120} autoFocus error={issueFor(create.error, "name")} />
        <SelectField label="Arm" value={armId} onChange={(e) => setArmId(e.target.value)} error={issueFor(create.error, "armId")}
          hint="Demo arms are built in; custom arms belong to this project (add them on the project's Arms page).">
          {arms.map((a) => (
            <option key={a.id} value={a.id}>{a.name}{a.builtIn ? " (demo arm)" : " (custom)"}</option>
          ))}
        </SelectField>
        {create.error && !issueFor(create.error, "name") && !issueFor(create.error, "armId") ? (
          <ErrorNote title="The plan was not created">{create.error.message}</ErrorNote>
        ) : null}
      </form>
    </Dialog>
  );
}
