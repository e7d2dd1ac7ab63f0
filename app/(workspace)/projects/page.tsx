import type { Metadata } from "next";
import { listArmsForUser } from "@/db/queries/arms";
import { listPlansForProject } from "@/db/queries/plans";
import { listProjectsForUser } from "@/db/queries/projects";
import { ProjectsDashboard, type DashboardProject } from "@/components/projects/projects-dashboard";
import { membershipOf } from "@/lib/server/loaders";
import { requirePageActor } from "@/lib/server/page-actor";
import { capabilities } from "@/lib/server/permissions";

export const metadata: Metadata = { title: "Projects" };
export const dynamic = "force-dynamic";

/** The user's projects with their plans and each plan's last verdict (first load on the server). */
export default async function ProjectsPage() {
  const actor = await requirePageActor("/projects");
  const [projects, arms] = await Promise.all([
    listProjectsForUser({ userId: actor.userId }),
    listArmsForUser({ userId: actor.userId }),
  ]);
  const withPlans: DashboardProject[] = await Promise.all(
    projects.map(async (p) => ({
      id: p.id,
      name: p.name,
      kind: p.kind,
      role: p.role,
      canEdit: capabilities(actor, { kind: "project", ...membershipOf(p) }).canEdit,
      updatedAt: p.updatedAt.toISOString(),
      plans: (await listPlansForProject({ projectId: p.id, userId: actor.userId })).map((plan) => ({
        id: plan.id,
        name: plan.name,
        armName: plan.armName,
        latestVersion: plan.latestVersion,
        latestVerdict: plan.latestVerdict,
        updatedAt: plan.updatedAt.toISOString(),
      })),
    })),
  );
  return (
    <ProjectsDashboard
      projects={withPlans}
      arms={arms.map((a) => ({ id: a.id, name: a.name, projectId: a.projectId, builtIn: a.builtIn }))}
    />
  );
}
