import { json, route } from "@/lib/server/route";
import { authenticate } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { devMailEnabled, loadDevMail } from "@/lib/server/mail/dev-mail";

export const dynamic = "force-dynamic";

/**
 * GET /api/dev/mail — local development only (see lib/server/mail/dev-mail.ts): the messages the
 * local SMTP fake received, and the outbox, for a signed-in admin. To anyone else, and on any
 * server where it is not enabled, it does not exist (404), so its presence is not revealed.
 */
export const GET = route(async (request) => {
  if (!devMailEnabled()) throw new AppError("not_found");
  const actor = await authenticate(request);
  if (!actor || actor.via !== "session" || actor.siteRole !== "admin") throw new AppError("not_found");
  return json(await loadDevMail());
});
