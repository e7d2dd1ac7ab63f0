import { inTransaction } from "@/lib/server/transaction";
import { createHash, randomUUID } from "node:crypto";
import { z } from "zod";
import { getArmRevisionForUser } from "@/db/queries/arms";
import { recordAudit } from "@/db/queries/audit";
import { createRecording, listRecordings } from "@/db/queries/recordings";
import { json, readBodyLimited, readParams, readQuery, route, uuidParam } from "@/lib/server/route";
import { armSchema, describeRecordingProblem, scanRecording } from "@/kinematics";
import { loadProject, membershipOf } from "@/lib/server/loaders";
import { uploadRecordingQuery } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";
import { deleteObject, putObject } from "@/lib/server/storage";

const params = z.object({ projectId: uuidParam });

/** GET /api/v1/projects/:projectId/recordings */
export const GET = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "recording:read");
  return json({ recordings: await listRecordings({ projectId, userId: actor.userId }) });
});

/**
 * POST /api/v1/projects/:projectId/recordings?name=…&armId=… with the CSV file as the body
 * (Content-Type: text/csv). The declared size is checked before anything is read and the body is
 * read only up to UPLOAD_LIMIT_BYTES; the file is parsed and validated (times strictly increasing,
 * finite values; aligned to the arm and stream-checked when armId is given) before it is stored; the row is written only after the object, and the object is removed again
 * if the row cannot be written — a failed upload leaves nothing behind.
 */
export const POST = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const query = readQuery(request, uploadRecordingQuery);
  const type = (request.headers.get("content-type") ?? "").split(";")[0].trim().toLowerCase();
  if (type !== "text/csv")
    throw new AppError("unsupported_media_type", "Send the recording as CSV (Content-Type: text/csv).");
  const limit = env().UPLOAD_LIMIT_BYTES;
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > limit)
    throw new AppError("payload_too_large", `The file is larger than ${limit} bytes.`, {
      details: { limitBytes: limit },
    });

  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "recording:create");
  const revision = query.armId ? await getArmRevisionForUser({ armId: query.armId, userId: actor.userId }) : undefined;
  if (query.armId && !revision) {
    throw new AppError("unprocessable:arm", "No such arm.", {
      issues: [{ path: "query.armId", message: "is not an arm you can use" }],
    });
  }

  const bytes = await readBodyLimited(request, limit);
  // the engine's one recording scan (parse → align → validate → stream check), as the CLI and the page run it
  const arm = revision ? armSchema.parse(revision.description) : null;
  const scanned = arm ? scanRecording(arm, bytes, { maxFindings: 50 }) : scanRecording(null, bytes);
  if ("problems" in scanned) {
    throw new AppError(
      "unprocessable:recording",
      `The file is not a valid recording: ${describeRecordingProblem(scanned.problems[0])}.`,
      {
        issues: scanned.problems.map((p) => ({
          path: p.line === null ? "(file)" : `line ${p.line}${p.column ? `.${p.column}` : ""}`,
          message: p.message,
        })),
      },
    );
  }
  const { recording, report: stream } = scanned;

  const key = `recordings/${projectId}/${randomUUID()}.csv`;
  await putObject(key, bytes, "text/csv");
  try {
    const row = await inTransaction(async () => {
      const row = await createRecording({
        projectId,
        armId: query.armId ?? null,
        name: query.name,
        objectKey: key,
        contentType: "text/csv",
        sizeBytes: bytes.byteLength,
        sha256: createHash("sha256").update(bytes).digest("hex"),
        sampleCount: recording.count,
        jointCount: recording.jointCount,
        durationS: recording.count > 0 ? recording.timeS[recording.count - 1] - recording.timeS[0] : 0,
        createdBy: actor.userId,
      });
      await recordAudit({
        actorId: actor.userId,
        action: "recording.create",
        targetType: "recording",
        targetId: row.id,
        projectId,
      });
      return row;
    });
    return json({ recording: row, stream }, 201);
  } catch (err) {
    await deleteObject(key).catch((e) => console.error("[recordings] could not remove orphaned object", key, e));
    throw err;
  }
});
