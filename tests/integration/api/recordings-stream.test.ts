/**
 * The recording upload streams its body: through the handler with the real object store and
 * PostgreSQL, a declared length (one streamed put) and a chunked body (a multipart upload), the
 * second scan pass for a file with more gaps than the scan keeps, and what a failed upload leaves.
 */
import "./_env";
import { createHash } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { recordings } from "@/db/schema";
import * as upload from "@/app/api/v1/projects/[projectId]/recordings/route";
import * as projectsRoute from "@/app/api/v1/projects/route";
import { env } from "@/lib/server/env";
import { getObject } from "@/lib/server/storage";
import { armSchema, scanRecording } from "@/kinematics";
import { BASE, call, demoArm, errorOf, makeUser, tokenFor, type Auth } from "./_helpers";

let auth: Auth;
let projectId: string;
const names = demoArm.description.joints.map((j) => j.name);

async function objectKeys(): Promise<string[]> {
  const e = env();
  const client = new S3Client({
    region: e.S3_REGION,
    endpoint: e.S3_ENDPOINT ?? `http://127.0.0.1:${e.S3_PORT}`,
    forcePathStyle: true,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID ?? "S3RVER", secretAccessKey: e.S3_SECRET_ACCESS_KEY ?? "S3RVER" },
  });
  const res = await client.send(new ListObjectsV2Command({ Bucket: e.S3_BUCKET, Prefix: `recordings/${projectId}/` }));
  return (res.Contents ?? []).map((o) => o.Key ?? "");
}

async function rowCount(): Promise<number> {
  return (await db.select().from(recordings).where(eq(recordings.projectId, projectId))).length;
}

/** A 1 kHz recording of `rows` rows holding still; a 1 s gap before every row listed in `gapsAt`. */
function recordingCsv(rows: number, gapsAt: (k: number) => boolean = () => false): string {
  const lines = [`t,${names.join(",")}`];
  let t = 0;
  for (let k = 0; k < rows; k++) {
    if (k > 0) t += gapsAt(k) ? 1 : 0.001;
    lines.push([t.toFixed(3), 0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.01].join(","));
  }
  return lines.join("\n") + "\n";
}

/** A POST with the body as a stream in `pieces`, with or without a declared length. */
async function postStream(bytes: Uint8Array, pieces: number, declaredLength: number | null, query: string) {
  let sent = 0;
  const size = Math.ceil(bytes.length / pieces);
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (sent >= bytes.length) return controller.close();
      controller.enqueue(bytes.slice(sent, sent + size));
      sent += size;
    },
  });
  const headers = new Headers({ "content-type": "text/csv" });
  if (auth && "bearer" in auth) headers.set("authorization", `Bearer ${auth.bearer}`);
  if (declaredLength !== null) headers.set("content-length", String(declaredLength));
  const request = new Request(`${BASE}/api/v1/projects/${projectId}/recordings?${query}`, {
    method: "POST",
    headers,
    body,
    duplex: "half",
  } as RequestInit);
  const response = await upload.POST(request, { params: Promise.resolve({ projectId }) });
  const text = await response.text();
  return { status: response.status, text, body: JSON.parse(text) as unknown, headers: response.headers };
}

beforeAll(async () => {
  const u = await makeUser("researcher");
  auth = { bearer: await tokenFor(u.id) };
  const p = await call(projectsRoute.POST, {
    method: "POST",
    path: "/api/v1/projects",
    auth,
    body: { name: "Streamed uploads" },
  });
  projectId = (p.body as { project: { id: string } }).project.id;
});

describe("streamed recording uploads", () => {
  it("stores a body of declared length whole through one streamed put: size, SHA-256 and sample count of what was sent", async () => {
    const bytes = new TextEncoder().encode(recordingCsv(20000));
    const res = await postStream(bytes, 37, bytes.length, `name=Declared&armId=${demoArm.id}`);
    expect(res.status, res.text.slice(0, 300)).toBe(201);
    const row = (
      res.body as { recording: { objectKey: string; sizeBytes: number; sha256: string; sampleCount: number } }
    ).recording;
    const sha = createHash("sha256").update(bytes).digest("hex");
    expect(row).toMatchObject({ sizeBytes: bytes.length, sha256: sha, sampleCount: 20000 });
    const stored = await getObject(row.objectKey);
    expect(createHash("sha256").update(stored).digest("hex")).toBe(sha);
  });

  it("refuses a body that ends short of its declared length (400) and leaves no object and no row", async () => {
    const keys = await objectKeys();
    const rows = await rowCount();
    const bytes = new TextEncoder().encode(recordingCsv(5000));
    const res = await postStream(bytes, 5, bytes.length + 1000, `name=Short&armId=${demoArm.id}`);
    expect(res.status, res.text.slice(0, 300)).toBe(400);
    expect(errorOf(res).code).toBe("bad_request:incomplete_body");
    expect(await objectKeys()).toEqual(keys);
    expect(await rowCount()).toBe(rows);
  });

  it("lists the problems of a file with more gaps than the scan keeps exactly as the whole-file scan does (second pass over the stored file), and then removes it", async () => {
    const keys = await objectKeys();
    const rows = await rowCount();
    // 4999 gaps of 1 s among 105 000 rows: the mean step is 0.049 s, so each is a gap (> 0.49 s)
    const csv = recordingCsv(105000, (k) => k % 21 === 0);
    const whole = scanRecording(armSchema.parse(demoArm.description), csv, { maxFindings: 50 });
    if (!("problems" in whole)) throw new Error("the whole-file scan accepted the file");
    // more gaps than the 4096 the streamed scan keeps as candidates: 20 listed, the rest counted
    expect(whole.problems.at(-1)?.message).toBe(`and ${Math.floor(104999 / 21) - 20} more problems`);
    const res = await postStream(new TextEncoder().encode(csv), 64, null, `name=Gaps&armId=${demoArm.id}`);
    expect(res.status, res.text.slice(0, 300)).toBe(422);
    expect(errorOf(res).issues).toEqual(
      whole.problems.map((p) => ({
        path: p.line === null ? "(file)" : `line ${p.line}${p.column ? `.${p.column}` : ""}`,
        message: p.message,
      })),
    );
    expect(await objectKeys()).toEqual(keys);
    expect(await rowCount()).toBe(rows);
  });
});
