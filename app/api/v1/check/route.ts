import { json, readJson, route } from "@/lib/api";
import { checkPlan } from "@/lib/api-check";
import { checkPlanSchema } from "@/lib/api-schemas";
import { requireActor } from "@/lib/auth-request";
import { authorizeSite } from "@/lib/permissions";

/** POST /api/v1/check — checks a plan document and returns the report; nothing is stored. */
export const POST = route(async (request) => {
  const document = await readJson(request, checkPlanSchema);
  const actor = await requireActor(request);
  authorizeSite(actor, "check:run");
  const { report, summary } = checkPlan(document);
  return json({ report, summary });
});
