import { z } from "zod";
import { getPlanVersion } from "@/db/queries/plans";
import { json, readParams, readQuery, route, uuidParam } from "@/lib/server/route";
import { diffDocuments } from "@/lib/shared/plan-diff";
import { loadPlan, membershipOf } from "@/lib/server/loaders";
import { diffQuery } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";

const params = z.object({ planId: uuidParam });

/** GET /api/v1/plans/:planId/diff?from=1&to=2 — what changed between two versions, field by field. */
export const GET = route(async (request, context) => {
  const { planId } = await readParams(context, params);
  const query = readQuery(request, diffQuery);
  const actor = await requireActor(request);
  const plan = await loadPlan(actor, planId);
  authorizeProject(membershipOf(plan), "plan:read");
  const [from, to] = await Promise.all([
    getPlanVersion({ planId, number: query.from, userId: actor.userId }),
    getPlanVersion({ planId, number: query.to, userId: actor.userId }),
  ]);
  if (!from || !to)
    throw new AppError("not_found:version", `No version ${!from ? query.from : query.to} of this plan.`);
  return json({
    from: { number: from.number, verdict: from.verdict, armRevision: from.armRevision },
    to: { number: to.number, verdict: to.verdict, armRevision: to.armRevision },
    changes: diffDocuments(from.document, to.document),
  });
});
