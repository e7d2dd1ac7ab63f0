import { inTransaction } from "@/lib/server/transaction";
import { createHash, randomUUID } from "node:crypto";
import { z } from "zod";
import { getArmRevisionForUser } from "@/db/queries/arms";
import { recordAudit } from "@/db/queries/audit";
import { createRecording, listRecordingsPage } from "@/db/queries/recordings";
import { timePageQuery } from "@/lib/server/paging";
import { json, readBodyStream, readParams, readQuery, route, uuidParam } from "@/lib/server/route";
import {
  armSchema,
  createRecordingScanner,
  describeRecordingProblem,
  type Arm,
  type RescanNeeded,
  type StreamReport,
  type StreamScanOptions,
  type StreamScanResult,
} from "@/kinematics";
import { loadProject, membershipOf } from "@/lib/server/loaders";
import { uploadRecordingQuery } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";
import { deleteObject, getObjectChunks, putObjectStream, putObjectStreamUnknownLength } from "@/lib/server/storage";

const params = z.object({ projectId: uuidParam });

/** GET /api/v1/projects/:projectId/recordings — one page of the project's recordings, newest first. */
export const GET = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const query = readQuery(request, timePageQuery);
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "recording:read");
  const page = await listRecordingsPage({ projectId, userId: actor.userId, limit: query.limit, after: query.cursor });
  return json({ recordings: page.items, nextCursor: page.nextCursor });
});

/**
 * POST /api/v1/projects/:projectId/recordings?name=…&armId=… with the CSV file as the body
 * (Content-Type: text/csv), whole or not at all, never held whole in memory. A declared size over
 * UPLOAD_LIMIT_BYTES is refused (413) before anything is read; otherwise the body streams through a
 * byte count (413 as soon as it passes the limit) into both the streamed recording scan (parse →
 * align → validate → stream check, as the CLI and the page run it on the whole file) and the object
 * store (one streamed put of the declared length, or a multipart upload for a chunked body), hashed
 * on the way. The row is written only once the whole file is stored and the scan has accepted it;
 * the object is removed again if the body fails, the scan refuses the file (422 with its problems)
 * or the row cannot be written — a failed upload leaves nothing behind.
 */
export const POST = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const query = readQuery(request, uploadRecordingQuery);
  const type = (request.headers.get("content-type") ?? "").split(";")[0].trim().toLowerCase();
  if (type !== "text/csv")
    throw new AppError("unsupported_media_type", "Send the recording as CSV (Content-Type: text/csv).");
  const limit = env().UPLOAD_LIMIT_BYTES;
  const header = request.headers.get("content-length");
  const declared = header === null ? null : Number(header);
  if (declared !== null && declared > limit)
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

  // the engine's one recording scan, fed as the bytes arrive
  const arm = revision ? armSchema.parse(revision.description) : null;
  const options: StreamScanOptions = arm ? { maxFindings: 50 } : {};
  const scanner = arm ? createRecordingScanner(arm, options) : createRecordingScanner(null, options);
  const hash = createHash("sha256");
  let sizeBytes = 0;
  const body = readBodyStream(request, limit, (chunk) => {
    scanner.push(chunk);
    hash.update(chunk);
    sizeBytes += chunk.byteLength;
  });
  let bodyError: unknown = null;
  const abort = new AbortController();
  body.on("error", (err) => {
    bodyError ??= err;
    // a put of a declared length would otherwise wait for the bytes that will never come
    abort.abort();
  });

  const key = `recordings/${projectId}/${randomUUID()}.csv`;
  let kept = false;
  try {
    try {
      if (declared !== null) await putObjectStream(key, body, declared, "text/csv", abort.signal);
      else await putObjectStreamUnknownLength(key, body, "text/csv");
    } catch (err) {
      throw bodyError ?? err;
    }
    if (bodyError) throw bodyError;
    const first = scanner.end();
    const scanned =
      "rescan" in first ? await scanStored(arm, key, { ...options, maxGapS: first.rescan.maxGapS }) : first;
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
    const { summary, report: stream } = scanned;
    const sha256 = hash.digest("hex");
    const row = await inTransaction(async () => {
      const row = await createRecording({
        projectId,
        armId: query.armId ?? null,
        name: query.name,
        objectKey: key,
        contentType: "text/csv",
        sizeBytes,
        sha256,
        sampleCount: summary.count,
        jointCount: summary.jointCount,
        durationS: summary.durationS,
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
    kept = true;
    return json({ recording: row, stream }, 201);
  } finally {
    if (!kept) {
      body.destroy();
      await deleteObject(key).catch((e) => console.error("[recordings] could not remove orphaned object", key, e));
    }
  }
});

/**
 * The second pass of a streamed scan that asked for one (more gaps than it could keep): the stored
 * file read back once, scanned with the gap limit the first pass found.
 */
async function scanStored(
  arm: Arm | null,
  key: string,
  options: StreamScanOptions,
): Promise<Exclude<StreamScanResult<StreamReport | null>, RescanNeeded>> {
  const scanner = arm ? createRecordingScanner(arm, options) : createRecordingScanner(null, options);
  for await (const chunk of getObjectChunks(key)) scanner.push(chunk);
  const result = scanner.end();
  if ("rescan" in result) throw new Error("a recording scan with a given gap limit asked for another pass");
  return result;
}
