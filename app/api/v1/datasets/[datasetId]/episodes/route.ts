import { z } from "zod";
import { listDatasetEpisodes } from "@/db/queries/datasets";
import { json, readParams, route, uuidParam } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeProject } from "@/lib/server/permissions";
import { datasetMembership, loadDataset } from "@/lib/server/datasets/load";

const params = z.object({ datasetId: uuidParam });

/** GET /api/v1/datasets/:datasetId/episodes — one row per audited episode (verdict, frames, duration, worst finding). */
export const GET = route(async (request, context) => {
  const { datasetId } = await readParams(context, params);
  const actor = await requireActor(request);
  const found = await loadDataset(actor, datasetId);
  authorizeProject(datasetMembership(found), "dataset:read");
  return json({ episodes: await listDatasetEpisodes({ datasetId, userId: actor.userId }) });
});
