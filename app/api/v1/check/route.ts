import { readJsonBytes, route } from "@/lib/server/route";
import { assertCheckerFree, runDocumentCheck } from "@/lib/server/check-pool";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeSite } from "@/lib/server/permissions";
import { noteWork } from "@/lib/server/log";

/**
 * POST /api/v1/check — checks a plan document and returns `{ report, summary }`; nothing is stored.
 * The body is parsed, budgeted and checked in the check pool (lib/server/check-document.ts), with
 * the same messages as every route's own parsing, so a large document never holds the server.
 */
export const POST = route(async (request) => {
  await assertCheckerFree(); // busy: 503 before the body is read
  const bytes = await readJsonBytes(request);
  const actor = await requireActor(request);
  authorizeSite(actor, "check:run");
  const { body, work } = await runDocumentCheck(bytes);
  noteWork({ checkWork: work });
  return new Response(body, {
    status: 200,
    headers: { "Content-Type": "application/json", "Cache-Control": "no-store" },
  });
});
