import { z } from "zod";
import { getDatasetEpisodeForUser } from "@/db/queries/datasets";
import { json, readParams, route, uuidParam } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";
import { datasetMembership, loadDataset, loadDatasetArm } from "@/lib/server/datasets/load";
import { episodeData } from "@/lib/server/datasets/service";
import { episodeIndexParam } from "@/lib/shared/schemas/datasets";

const params = z.object({ datasetId: uuidParam, index: episodeIndexParam });

/**
 * GET /api/v1/datasets/:datasetId/episodes/:index — one episode (0-based index): its audit findings
 * and problems, its frames, the arm, and the repaired frames with their audit when it was repaired.
 */
export const GET = route(async (request, context) => {
  const { datasetId, index } = await readParams(context, params);
  const actor = await requireActor(request);
  const found = await loadDataset(actor, datasetId);
  authorizeProject(datasetMembership(found), "dataset:read");
  const row = await getDatasetEpisodeForUser({ datasetId, index, userId: actor.userId });
  if (!row) throw new AppError("not_found:episode", `No audited episode ${index + 1} in this dataset.`);
  const revision = await loadDatasetArm(actor, found);
  const data = await episodeData(found, actor.userId, revision, index);
  const { repaired: _bytes, ...audit } = row;
  return json({
    episode: audit,
    arm: data.arm,
    recorded: data.recorded,
    repaired: data.repaired,
    check: "timed replay",
  });
});
