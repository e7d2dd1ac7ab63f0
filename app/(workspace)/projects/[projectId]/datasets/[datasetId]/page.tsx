import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getArmRevisionForUser, listArmsForUser } from "@/db/queries/arms";
import { getDatasetForUser } from "@/db/queries/datasets";
import { DatasetWorkbench, type DatasetArm } from "@/components/datasets/dataset-workbench";
import { armSchema } from "@/kinematics";
import { membershipOf } from "@/lib/server/loaders";
import { requirePageActor } from "@/lib/server/page-actor";
import { capabilities } from "@/lib/server/permissions";
import { SAFETY_TEXT } from "@/lib/shared/safety";

export const metadata: Metadata = { title: "Dataset" };
export const dynamic = "force-dynamic";

/** One dataset: mapping, audit progress, summary, the episode table and the episode view. */
export default async function DatasetPage({ params }: { params: Promise<{ projectId: string; datasetId: string }> }) {
  const { projectId, datasetId } = await params;
  const actor = await requirePageActor(`/projects/${projectId}/datasets/${datasetId}`);
  if (!/^[0-9a-f-]{36}$/i.test(projectId) || !/^[0-9a-f-]{36}$/i.test(datasetId)) notFound();
  const found = await getDatasetForUser({ datasetId, userId: actor.userId });
  if (!found || found.dataset.projectId !== projectId) notFound();
  const arms = await listArmsForUser({ userId: actor.userId, projectId });
  const withDescriptions: DatasetArm[] = [];
  for (const a of arms) {
    const rev = await getArmRevisionForUser({ armId: a.id, userId: actor.userId });
    const parsed = rev ? armSchema.safeParse(rev.description) : null;
    if (rev && parsed?.success)
      withDescriptions.push({ id: a.id, name: a.name, revision: rev.revision, revisionId: rev.id, arm: parsed.data });
  }
  const d = found.dataset;
  return (
    <DatasetWorkbench
      projectId={projectId}
      dataset={{
        id: d.id,
        name: d.name,
        fileKind: d.fileKind,
        sizeBytes: d.sizeBytes,
        status: d.status,
        armRevisionId: d.armRevisionId,
        mapping: d.mapping as Record<string, unknown>,
      }}
      arms={withDescriptions}
      canEdit={
        capabilities(actor, { kind: "project", ...membershipOf({ role: found.role, archivedAt: found.archivedAt }) })
          .canEdit
      }
      caution={SAFETY_TEXT}
    />
  );
}
