import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { createDataset, listDatasets } from "@/db/queries/datasets";
import { json, readParams, readQuery, route, uuidParam } from "@/lib/server/route";
import { loadProject, membershipOf } from "@/lib/server/loaders";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";
import { deleteObject } from "@/lib/server/storage";
import { datasetEnv } from "@/lib/server/datasets/config";
import { storeUpload } from "@/lib/server/datasets/service";
import { uploadDatasetQuery } from "@/lib/shared/schemas/datasets";

const params = z.object({ projectId: uuidParam });

/** GET /api/v1/projects/:projectId/datasets */
export const GET = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "dataset:read");
  return json({
    datasets: await listDatasets({ projectId, userId: actor.userId }),
    limitBytes: datasetEnv().DATASET_UPLOAD_LIMIT_BYTES,
  });
});

/**
 * POST /api/v1/projects/:projectId/datasets?name=… with the file (Parquet, zip of Parquet or CSV
 * files, or one CSV) as the body and its Content-Length. Streamed to object storage whole or not at
 * all, up to DATASET_UPLOAD_LIMIT_BYTES; read and mapped later (preview, mapping, audit).
 */
export const POST = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const query = readQuery(request, uploadDatasetQuery);
  const limit = datasetEnv().DATASET_UPLOAD_LIMIT_BYTES;
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > limit)
    throw new AppError("payload_too_large", `The dataset is larger than the limit of ${limit} bytes.`, {
      details: { limitBytes: limit },
    });
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "dataset:create");
  const stored = await storeUpload(request, projectId);
  try {
    const row = await createDataset({
      projectId,
      name: query.name,
      objectKey: stored.key,
      fileKind: stored.fileKind,
      sizeBytes: stored.sizeBytes,
      sha256: stored.sha256,
      createdBy: actor.userId,
    });
    await recordAudit({
      actorId: actor.userId,
      action: "dataset.create",
      targetType: "dataset",
      targetId: row.id,
      projectId,
    });
    return json({ dataset: row }, 201);
  } catch (err) {
    await deleteObject(stored.key).catch((e) =>
      console.error("[datasets] could not remove orphaned object", stored.key, e),
    );
    throw err;
  }
});
