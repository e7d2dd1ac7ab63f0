import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getArmRevisionForUser, listArmsForUser } from "@/db/queries/arms";
import { getProjectForUser } from "@/db/queries/projects";
import { listRecordings } from "@/db/queries/recordings";
import { RecordingsWorkbench, type RecordingArm } from "@/components/recordings/recordings-workbench";
import { armSchema } from "@/kinematics";
import { membershipOf } from "@/lib/server/loaders";
import { requirePageActor } from "@/lib/server/page-actor";
import { capabilities } from "@/lib/server/permissions";

export const metadata: Metadata = { title: "Recordings" };
export const dynamic = "force-dynamic";

/** Check, repair and keep a recorded joint log against one of the project's arms. */
export default async function RecordingsPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await requirePageActor(`/projects/${projectId}/recordings`);
  if (!/^[0-9a-f-]{36}$/i.test(projectId)) notFound();
  const project = await getProjectForUser({ projectId, userId: actor.userId });
  if (!project) notFound();
  const arms = await listArmsForUser({ userId: actor.userId, projectId });
  const withDescriptions: RecordingArm[] = [];
  for (const a of arms) {
    const rev = await getArmRevisionForUser({ armId: a.id, userId: actor.userId });
    const parsed = rev ? armSchema.safeParse(rev.description) : null;
    if (rev && parsed?.success)
      withDescriptions.push({ id: a.id, name: a.name, revision: rev.revision, arm: parsed.data });
  }
  return (
    <RecordingsWorkbench
      projectId={project.id}
      projectName={project.name}
      arms={withDescriptions}
      canEdit={capabilities(actor, { kind: "project", ...membershipOf(project) }).canEdit}
      stored={(await listRecordings({ projectId, userId: actor.userId })).map((r) => ({
        id: r.id,
        name: r.name,
        armId: r.armId,
        sizeBytes: r.sizeBytes,
        sampleCount: r.sampleCount,
        jointCount: r.jointCount,
        durationS: r.durationS,
        createdAt: r.createdAt.toISOString(),
      }))}
    />
  );
}
