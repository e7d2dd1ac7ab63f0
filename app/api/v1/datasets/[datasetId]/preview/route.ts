import { z } from "zod";
import { getArmRevisionForUser } from "@/db/queries/arms";
import { json, readJson, readParams, route, uuidParam } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";
import { armOfRevision } from "@/lib/server/datasets/dataset-file";
import { datasetMembership, loadDataset } from "@/lib/server/datasets/load";
import { previewDataset } from "@/lib/server/datasets/service";
import { datasetMappingSchema } from "@/lib/shared/schemas/datasets";

const params = z.object({ datasetId: uuidParam });

/**
 * POST /api/v1/datasets/:datasetId/preview {armId, revision?, mapping} — reads the stored file with
 * this arm and mapping and returns its columns and types, the episodes found, the first rows and the
 * problems; nothing is saved.
 */
export const POST = route(async (request, context) => {
  const { datasetId } = await readParams(context, params);
  const body = await readJson(request, datasetMappingSchema);
  const actor = await requireActor(request);
  const found = await loadDataset(actor, datasetId);
  authorizeProject(datasetMembership(found), "dataset:read");
  const revision = await getArmRevisionForUser({ armId: body.armId, userId: actor.userId, revision: body.revision });
  if (!revision)
    throw new AppError("unprocessable:arm", "No such arm.", {
      issues: [{ path: "armId", message: "is not an arm you can use" }],
    });
  return json({
    preview: await previewDataset(found.dataset, armOfRevision(revision.description), revision.id, body.mapping),
    armRevisionId: revision.id,
  });
});
