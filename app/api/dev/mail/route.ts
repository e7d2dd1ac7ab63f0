import { json, route } from "@/lib/api";
import { AppError } from "@/lib/errors";
import { devMailEnabled, loadDevMail } from "@/lib/mail/dev-mail";

export const dynamic = "force-dynamic";

/** GET /api/dev/mail — development only: the messages the local SMTP fake received, and the outbox. */
export const GET = route(async () => {
  if (!devMailEnabled()) throw new AppError("not_found");
  return json(await loadDevMail());
});
