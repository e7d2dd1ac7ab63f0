import { z } from "zod";
import { readParams, route, uuidParam } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";
import { datasetMembership, loadDataset, loadDatasetArm } from "@/lib/server/datasets/load";
import { exportDataset } from "@/lib/server/datasets/service";
import { SAFETY_SHORT } from "@/lib/shared/safety";

const params = z.object({ datasetId: uuidParam });

/**
 * GET /api/v1/datasets/:datasetId/export — a zip with dataset.parquet (checked episodes, repaired
 * ones in place), report.json (per-episode audit, excluded episodes listed) and manifest.json
 * (SHA-256 of both; `jointproof verify manifest.json` checks the manifest itself).
 */
export const GET = route(async (request, context) => {
  const { datasetId } = await readParams(context, params);
  const actor = await requireActor(request);
  const found = await loadDataset(actor, datasetId);
  authorizeProject(datasetMembership(found), "dataset:read");
  if (found.dataset.status !== "audited")
    throw new AppError("conflict:dataset", "Audit the dataset first (and wait for the audit to finish).");
  const revision = await loadDatasetArm(actor, found);
  const zip = await exportDataset(found, actor.userId, revision);
  return new Response(zip as BodyInit, {
    headers: {
      "Content-Type": "application/zip",
      "Content-Disposition": `attachment; filename="${found.dataset.name.replace(/[^A-Za-z0-9._-]+/g, "-")}-checked.zip"`,
      "Cache-Control": "no-store",
      "X-Safety-Caution": SAFETY_SHORT.replace(/[^\x20-\x7e]/g, "-"),
    },
  });
});
