import { json, readJson, route } from "@/lib/server/route";
import { checkPlan } from "@/lib/server/check";
import { checkPlanSchema } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeSite } from "@/lib/server/permissions";

/** POST /api/v1/check — checks a plan document and returns the report; nothing is stored. */
export const POST = route(async (request) => {
  const document = await readJson(request, checkPlanSchema);
  const actor = await requireActor(request);
  authorizeSite(actor, "check:run");
  const { report, summary } = await checkPlan(document);
  return json({ report, summary });
});
