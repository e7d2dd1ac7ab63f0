import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { json, readParams, route, uuidParam } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeProject } from "@/lib/server/permissions";
import { datasetMembership, loadDataset, loadDatasetArm } from "@/lib/server/datasets/load";
import { startAudit } from "@/lib/server/datasets/service";

const params = z.object({ datasetId: uuidParam });

/**
 * POST /api/v1/datasets/:datasetId/audit — starts the timed-replay audit of every episode in the
 * background workers (one job per batch); 202 with the dataset. A new audit replaces the last one.
 */
export const POST = route(async (request, context) => {
  const { datasetId } = await readParams(context, params);
  const actor = await requireActor(request);
  const found = await loadDataset(actor, datasetId);
  authorizeProject(datasetMembership(found), "dataset:audit");
  const revision = await loadDatasetArm(actor, found);
  const dataset = await startAudit(found, actor.userId, revision);
  await recordAudit({
    actorId: actor.userId,
    action: "dataset.audit",
    targetType: "dataset",
    targetId: datasetId,
    projectId: found.dataset.projectId,
  });
  return json({ dataset }, 202);
});
