import { json, route } from "@/lib/server/route";
import { AppError } from "@/lib/server/errors";
import { devMailEnabled, loadDevMail } from "@/lib/server/mail/dev-mail";

export const dynamic = "force-dynamic";

/** GET /api/dev/mail — development only: the messages the local SMTP fake received, and the outbox. */
export const GET = route(async () => {
  if (!devMailEnabled()) throw new AppError("not_found");
  return json(await loadDevMail());
});
