import { z } from "zod";
import { getArmRevisionForUser } from "@/db/queries/arms";
import { recordAudit } from "@/db/queries/audit";
import { setDatasetMapping } from "@/db/queries/datasets";
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
 * POST /api/v1/datasets/:datasetId/mapping {armId, revision?, mapping} — chooses the arm revision and
 * the column mapping. Refused (422, with the file's columns and the option to set) when the file
 * cannot be read with them; refused (409) while an audit runs.
 */
export const POST = route(async (request, context) => {
  const { datasetId } = await readParams(context, params);
  const body = await readJson(request, datasetMappingSchema);
  const actor = await requireActor(request);
  const found = await loadDataset(actor, datasetId);
  authorizeProject(datasetMembership(found), "dataset:audit");
  const revision = await getArmRevisionForUser({ armId: body.armId, userId: actor.userId, revision: body.revision });
  if (!revision)
    throw new AppError("unprocessable:arm", "No such arm.", {
      issues: [{ path: "armId", message: "is not an arm you can use" }],
    });
  const preview = await previewDataset(found.dataset, armOfRevision(revision.description), revision.id, body.mapping);
  if (preview.problems.length > 0) {
    throw new AppError(
      "unprocessable:mapping",
      `The dataset cannot be read with this mapping: ${preview.problems[0]}`,
      {
        issues: preview.problems.map((message) => ({ path: "mapping", message })),
      },
    );
  }
  const row = await setDatasetMapping({
    datasetId,
    userId: actor.userId,
    armRevisionId: revision.id,
    mapping: body.mapping,
  });
  if (!row) throw new AppError("conflict:dataset", "An audit of this dataset is running; wait for it to finish.");
  await recordAudit({
    actorId: actor.userId,
    action: "dataset.map",
    targetType: "dataset",
    targetId: datasetId,
    projectId: found.dataset.projectId,
  });
  return json({ dataset: row, preview });
});
