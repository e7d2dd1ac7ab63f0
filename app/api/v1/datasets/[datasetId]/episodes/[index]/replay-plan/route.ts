import { z } from "zod";
import { json, readParams, route, uuidParam } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeProject } from "@/lib/server/permissions";
import { datasetMembership, loadDataset, loadDatasetArm } from "@/lib/server/datasets/load";
import { episodeReplayPlan } from "@/lib/server/datasets/service";
import { episodeIndexParam } from "@/lib/shared/schemas/datasets";

const params = z.object({ datasetId: uuidParam, index: episodeIndexParam });

/**
 * GET /api/v1/datasets/:datasetId/episodes/:index/replay-plan — the episode's replay (repaired when it
 * was): ease in from the arm's rest pose (shortest passing duration), every frame passed through
 * without stopping, ease out to rest; each part checked, what was not checked listed (the replay is
 * then never a pass), a replay document to download, and the safety caution.
 */
export const GET = route(async (request, context) => {
  const { datasetId, index } = await readParams(context, params);
  const actor = await requireActor(request);
  const found = await loadDataset(actor, datasetId);
  authorizeProject(datasetMembership(found), "dataset:read");
  const revision = await loadDatasetArm(actor, found);
  return json(await episodeReplayPlan(found, actor.userId, revision, index));
});
