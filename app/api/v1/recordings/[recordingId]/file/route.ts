import { z } from "zod";
import { getRecordingForUser } from "@/db/queries/recordings";
import { readParams, route, uuidParam } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";
import { getObject } from "@/lib/server/storage";

const params = z.object({ recordingId: uuidParam });

/** GET /api/v1/recordings/:recordingId/file — the stored CSV. */
export const GET = route(async (request, context) => {
  const { recordingId } = await readParams(context, params);
  const actor = await requireActor(request);
  const found = await getRecordingForUser({ recordingId, userId: actor.userId });
  if (!found) throw new AppError("not_found:recording", "No such recording.");
  authorizeProject({ role: found.role, archived: false }, "recording:read");
  const bytes = await getObject(found.recording.objectKey);
  return new Response(bytes as BodyInit, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="${found.recording.name.replace(/[^A-Za-z0-9._-]+/g, "-")}.csv"`,
      "Cache-Control": "no-store",
    },
  });
});
