import { inTransaction } from "@/lib/server/transaction";
import { randomUUID } from "node:crypto";
import { z } from "zod";
import { createArm } from "@/db/queries/arms";
import { recordAudit } from "@/db/queries/audit";
import { json, readBodyLimited, readParams, readQuery, route, toIssues, uuidParam } from "@/lib/server/route";
import { armDocumentSchema, armFromDescription, parseUrdf } from "@/kinematics";
import { loadProject, membershipOf } from "@/lib/server/loaders";
import { importUrdfQuery } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { authorizeProject } from "@/lib/server/permissions";
import { deleteObject, putObject } from "@/lib/server/storage";

const params = z.object({ projectId: uuidParam });
const XML_TYPES = new Set(["application/xml", "text/xml", "application/octet-stream"]);

/**
 * POST /api/v1/projects/:projectId/arms/import?name=…&controlRateHz=… with a URDF file as the body.
 * The file is parsed and turned into an arm (joints, limits, chain) before anything is stored; the
 * file goes to object storage and the arm's first revision records its key.
 */
export const POST = route(async (request, context) => {
  const { projectId } = await readParams(context, params);
  const query = readQuery(request, importUrdfQuery);
  const type = (request.headers.get("content-type") ?? "").split(";")[0].trim().toLowerCase();
  if (!XML_TYPES.has(type))
    throw new AppError("unsupported_media_type", "Send the URDF file as XML (Content-Type: application/xml).");
  const limit = env().UPLOAD_LIMIT_BYTES;
  if (Number(request.headers.get("content-length") ?? "0") > limit) {
    throw new AppError("payload_too_large", `The file is larger than ${limit} bytes.`, {
      details: { limitBytes: limit },
    });
  }
  const actor = await requireActor(request);
  const project = await loadProject(actor, projectId);
  authorizeProject(membershipOf(project), "arm:write");

  const bytes = await readBodyLimited(request, limit);
  let xml: string;
  try {
    xml = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new AppError("unprocessable:urdf", "The file is not UTF-8 text.", {
      issues: [{ path: "(file)", message: "must be UTF-8 text" }],
    });
  }
  const parsed = parseUrdf(xml);
  if (!parsed.ok) {
    throw new AppError("unprocessable:urdf", "The URDF file cannot be imported.", {
      issues: parsed.problems.map((p) => ({ path: p.element, message: p.message })),
    });
  }
  const arm = armDocumentSchema.safeParse({
    ...armFromDescription(parsed.value, query.controlRateHz),
    ...(query.name ? { name: query.name } : {}),
  });
  if (!arm.success) {
    throw new AppError("unprocessable:urdf", "The URDF file does not give a usable arm.", {
      issues: toIssues(arm.error, ["arm"]),
    });
  }

  const key = `urdf/${projectId}/${randomUUID()}.urdf`;
  await putObject(key, bytes, "application/xml");
  try {
    const created = await inTransaction(async () => {
      const created = await createArm({
        projectId,
        name: arm.data.name,
        description: arm.data,
        urdfKey: key,
        note: "Imported from URDF",
        userId: actor.userId,
      });
      if (!created)
        throw new AppError(
          "conflict:arm-name",
          "This project already has an arm with that name; pass ?name=… to choose another.",
          { issues: [{ path: "query.name", message: "is taken" }] },
        );
      await recordAudit({
        actorId: actor.userId,
        action: "arm.import",
        targetType: "arm",
        targetId: created.armId,
        projectId,
      });
      return created;
    });
    return json({ arm: { id: created.armId, name: arm.data.name, projectId }, revision: created.revision }, 201);
  } catch (err) {
    await deleteObject(key).catch((e) => console.error("[urdf] could not remove orphaned object", key, e));
    throw err;
  }
});
