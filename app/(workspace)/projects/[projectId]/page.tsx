import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { listProjectAuditPage } from "@/db/queries/audit";
import { getProjectForUser, listMembersPage } from "@/db/queries/projects";
import { ProjectOverview } from "@/components/projects/project-overview";
import { membershipOf } from "@/lib/server/loaders";
import { requirePageActor } from "@/lib/server/page-actor";
import { PAGE_LIMIT_MAX } from "@/lib/server/paging";
import { capabilities } from "@/lib/server/permissions";

export const metadata: Metadata = { title: "Project" };
export const dynamic = "force-dynamic";

/** One project: its name, its members and (for owners) its audit log; the first pages load here, the rest through the API. */
export default async function ProjectPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await requirePageActor(`/projects/${projectId}`);
  if (!/^[0-9a-f-]{36}$/i.test(projectId)) notFound();
  const project = await getProjectForUser({ projectId, userId: actor.userId });
  if (!project) notFound();
  const can = capabilities(actor, { kind: "project", ...membershipOf(project) });
  const [members, audit] = await Promise.all([
    listMembersPage({ projectId, userId: actor.userId, limit: PAGE_LIMIT_MAX }),
    can.canReadAudit ? listProjectAuditPage({ projectId, userId: actor.userId, limit: PAGE_LIMIT_MAX }) : null,
  ]);
  return (
    <ProjectOverview
      project={{
        id: project.id,
        name: project.name,
        kind: project.kind,
        role: project.role,
        archived: project.archivedAt !== null,
      }}
      can={{ rename: can.canRename, manageMembers: can.canManageMembers, readAudit: can.canReadAudit }}
      members={{
        items: members.items.map((m) => ({ ...m, createdAt: m.createdAt.toISOString() })),
        nextCursor: members.nextCursor,
      }}
      audit={
        audit
          ? {
              items: audit.items.map((e) => ({ ...e, createdAt: e.createdAt.toISOString() })),
              nextCursor: audit.nextCursor,
            }
          : null
      }
    />
  );
}
