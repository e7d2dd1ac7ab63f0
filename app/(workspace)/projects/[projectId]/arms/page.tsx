import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getArmRevisionForUser, listArmsForUser } from "@/db/queries/arms";
import { getProjectForUser } from "@/db/queries/projects";
import { ArmsWorkbench, type ArmEntry } from "@/components/arms/arms-workbench";
import { armSchema } from "@/kinematics";
import { membershipOf } from "@/lib/server/loaders";
import { requirePageActor } from "@/lib/server/page-actor";
import { capabilities } from "@/lib/server/permissions";

export const metadata: Metadata = { title: "Arms" };
export const dynamic = "force-dynamic";

/** The demo arms and the project's custom arms: limits, URDF import, the arm in the 3D view. */
export default async function ArmsPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await requirePageActor(`/projects/${projectId}/arms`);
  if (!/^[0-9a-f-]{36}$/i.test(projectId)) notFound();
  const project = await getProjectForUser({ projectId, userId: actor.userId });
  if (!project) notFound();
  const arms = await listArmsForUser({ userId: actor.userId, projectId });
  const entries: ArmEntry[] = [];
  for (const a of arms) {
    const rev = await getArmRevisionForUser({ armId: a.id, userId: actor.userId });
    const parsed = rev ? armSchema.safeParse(rev.description) : null;
    if (rev && parsed?.success)
      entries.push({ id: a.id, name: a.name, builtIn: a.builtIn, revision: rev.revision, arm: parsed.data });
  }
  return (
    <ArmsWorkbench
      projectId={project.id}
      projectName={project.name}
      arms={entries}
      canEdit={capabilities(actor, { kind: "project", ...membershipOf(project) }).canEdit}
    />
  );
}
