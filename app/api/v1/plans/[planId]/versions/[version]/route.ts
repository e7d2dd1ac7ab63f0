import { z } from "zod";
import { getPlanVersion } from "@/db/queries/plans";
import { json, readParams, route, uuidParam, versionParam } from "@/lib/server/route";
import { loadPlan, membershipOf } from "@/lib/server/loaders";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";

const versionParams = z.object({ planId: uuidParam, version: versionParam });

/** GET /api/v1/plans/:planId/versions/:version — the document and the stored verdict. */
export const GET = route(async (request, context) => {
  const { planId, version: number } = await readParams(context, versionParams);
  const actor = await requireActor(request);
  const plan = await loadPlan(actor, planId);
  authorizeProject(membershipOf(plan), "plan:read");
  const version = await getPlanVersion({ planId, number, userId: actor.userId });
  if (!version) throw new AppError("not_found:version", "No such version.");
  return json({ version });
});
