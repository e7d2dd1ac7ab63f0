import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { json, readJson, readParams, route, uuidParam } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";
import { datasetMembership, loadDataset, loadDatasetArm } from "@/lib/server/datasets/load";
import { repairDatasetEpisodes } from "@/lib/server/datasets/service";
import { repairDatasetSchema } from "@/lib/shared/schemas/datasets";

const params = z.object({ datasetId: uuidParam });

/**
 * POST /api/v1/datasets/:datasetId/repair {episodes?} — repairs the listed episodes (0-based) or
 * every one with findings: glitches replaced by the mean of their neighbours, gaps filled by
 * interpolation (marked), travel and speed rate-limited; each result audited again and stored.
 */
export const POST = route(async (request, context) => {
  const { datasetId } = await readParams(context, params);
  const body = await readJson(request, repairDatasetSchema);
  const actor = await requireActor(request);
  const found = await loadDataset(actor, datasetId);
  authorizeProject(datasetMembership(found), "dataset:repair");
  if (found.dataset.status !== "audited")
    throw new AppError("conflict:dataset", "Audit the dataset first (and wait for the audit to finish).");
  const revision = await loadDatasetArm(actor, found);
  const repaired = await repairDatasetEpisodes(found, actor.userId, revision, body.episodes);
  await recordAudit({
    actorId: actor.userId,
    action: "dataset.repair",
    targetType: "dataset",
    targetId: datasetId,
    projectId: found.dataset.projectId,
  });
  return json({ repaired });
});
