import { z } from "zod";
import { countDatasetFindingsByKind, getDatasetProgress, listDatasetEpisodes } from "@/db/queries/datasets";
import { json, readParams, route, uuidParam } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeProject } from "@/lib/server/permissions";
import { datasetMembership, loadDataset } from "@/lib/server/datasets/load";

const params = z.object({ datasetId: uuidParam });

/** GET /api/v1/datasets/:datasetId — the dataset, audit progress and its summary (counts by verdict and kind). */
export const GET = route(async (request, context) => {
  const { datasetId } = await readParams(context, params);
  const actor = await requireActor(request);
  const found = await loadDataset(actor, datasetId);
  authorizeProject(datasetMembership(found), "dataset:read");
  const [progress, episodes, byKind] = await Promise.all([
    getDatasetProgress({ datasetId, userId: actor.userId }),
    listDatasetEpisodes({ datasetId, userId: actor.userId }),
    countDatasetFindingsByKind({ datasetId, userId: actor.userId }),
  ]);
  const byVerdict = { pass: 0, caution: 0, fault: 0, invalid: 0 } as Record<string, number>;
  for (const e of episodes) byVerdict[e.verdict] = (byVerdict[e.verdict] ?? 0) + 1;
  return json({
    dataset: found.dataset,
    progress: {
      batchesDone: progress.done,
      batches: progress.total,
      episodesAudited: episodes.length,
      episodes: found.dataset.episodeCount,
    },
    summary: {
      episodes: episodes.length,
      ...byVerdict,
      byKind,
      repaired: episodes.filter((e) => e.repairedVerdict !== null).length,
    },
    check: "timed replay",
  });
});
