import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getProjectForUser } from "@/db/queries/projects";
import { listDatasets } from "@/db/queries/datasets";
import { DatasetsList } from "@/components/datasets/datasets-list";
import { datasetEnv } from "@/lib/server/datasets/config";
import { membershipOf } from "@/lib/server/loaders";
import { requirePageActor } from "@/lib/server/page-actor";
import { capabilities } from "@/lib/server/permissions";

export const metadata: Metadata = { title: "Datasets" };
export const dynamic = "force-dynamic";

/** A project's datasets of recorded episodes: upload one, open one to map and audit it. */
export default async function DatasetsPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await requirePageActor(`/projects/${projectId}/datasets`);
  if (!/^[0-9a-f-]{36}$/i.test(projectId)) notFound();
  const project = await getProjectForUser({ projectId, userId: actor.userId });
  if (!project) notFound();
  const datasets = await listDatasets({ projectId, userId: actor.userId });
  return (
    <DatasetsList
      projectId={project.id}
      projectName={project.name}
      canEdit={capabilities(actor, { kind: "project", ...membershipOf(project) }).canEdit}
      limitBytes={datasetEnv().DATASET_UPLOAD_LIMIT_BYTES}
      datasets={datasets.map((d) => ({
        id: d.id,
        name: d.name,
        fileKind: d.fileKind,
        sizeBytes: d.sizeBytes,
        status: d.status,
        episodeCount: d.episodeCount,
        createdAt: d.createdAt.toISOString(),
      }))}
    />
  );
}
