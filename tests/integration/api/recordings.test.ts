import "./_env";
import { beforeAll, describe, expect, it } from "vitest";
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { recordings } from "@/db/schema";
import * as upload from "@/app/api/v1/projects/[projectId]/recordings/route";
import * as file from "@/app/api/v1/recordings/[recordingId]/file/route";
import * as projectsRoute from "@/app/api/v1/projects/route";
import { env } from "@/lib/server/env";
import { call, demoArm, errorOf, makeUser, tokenFor, type Auth } from "./_helpers";

let auth: Auth;
let projectId: string;

const names = demoArm.description.joints.map((j) => j.name);

/** A 2-second recording at 100 Hz of a slow base sweep, with a jump of 0.05 rad at rows 50 and 120. */
function recordingCsv(): string {
  const rows = [`t,${names.join(",")}`];
  for (let k = 0; k <= 200; k++) {
    const t = k / 100;
    const base = 0.2 * t + (k >= 50 ? 0.05 : 0) + (k >= 120 ? 0.05 : 0);
    rows.push([t, base, 0, 0, 0, 0, 0, 0.01].join(","));
  }
  return rows.join("\n") + "\n";
}

async function objectKeys(prefix: string): Promise<string[]> {
  const e = env();
  const client = new S3Client({
    region: e.S3_REGION,
    endpoint: e.S3_ENDPOINT ?? `http://127.0.0.1:${e.S3_PORT}`,
    forcePathStyle: true,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID ?? "S3RVER", secretAccessKey: e.S3_SECRET_ACCESS_KEY ?? "S3RVER" },
  });
  const res = await client.send(new ListObjectsV2Command({ Bucket: e.S3_BUCKET, Prefix: prefix }));
  return (res.Contents ?? []).map((o) => o.Key ?? "");
}

function post(
  body: string | Uint8Array,
  query: string,
  headers: Record<string, string> = { "content-type": "text/csv" },
) {
  return call(upload.POST, {
    method: "POST",
    path: `/api/v1/projects/${projectId}/recordings?${query}`,
    params: { projectId },
    auth,
    rawBody: body,
    headers,
  });
}

beforeAll(async () => {
  const u = await makeUser("researcher");
  auth = { bearer: await tokenFor(u.id) };
  const p = await call(projectsRoute.POST, {
    method: "POST",
    path: "/api/v1/projects",
    auth,
    body: { name: "Demonstrations" },
  });
  projectId = (p.body as { project: { id: string } }).project.id;
});

describe("recording uploads (object storage through the S3 API)", () => {
  it("stores the file, records its metadata and stream-checks it against the arm", async () => {
    const csv = recordingCsv();
    const res = await post(csv, `name=Guided%20pick&armId=${demoArm.id}`);
    expect(res.status, res.text).toBe(201);
    const body = res.body as {
      recording: { id: string; sampleCount: number; jointCount: number; sizeBytes: number; objectKey: string };
      stream: { verdict: string; findings: { kind: string; sample: number }[] };
    };
    expect(body.recording).toMatchObject({ sampleCount: 201, jointCount: 7, sizeBytes: Buffer.byteLength(csv) });
    expect(body.stream.verdict).toBe("fault");
    expect(body.stream.findings.filter((f) => f.kind === "jump").map((f) => f.sample)).toEqual([50, 120]);
    expect(await objectKeys(body.recording.objectKey)).toEqual([body.recording.objectKey]);
    const back = await call(file.GET, {
      path: `/api/v1/recordings/${body.recording.id}/file`,
      params: { recordingId: body.recording.id },
      auth,
    });
    expect(back.status).toBe(200);
    expect(back.text).toBe(csv);
  });

  it.each([
    ["a file that is not a recording", "hello,world\n1,2,3\n", "text/csv", 422],
    ["columns that do not match the arm", "t,a,b\n0,0,0\n0.01,0,0\n", "text/csv", 422],
    ["a JSON content type", "{}", "application/json", 415],
  ])("refuses %s and stores neither a row nor an object", async (_what, content, type, status) => {
    const before = await db.$count(recordings, eq(recordings.projectId, projectId));
    const objectsBefore = await objectKeys(`recordings/${projectId}/`);
    const res = await post(content, `name=Bad&armId=${demoArm.id}`, { "content-type": type });
    expect(res.status, res.text).toBe(status);
    expect(errorOf(res).issues.length + (status === 415 ? 1 : 0)).toBeGreaterThan(0);
    expect(await db.$count(recordings, eq(recordings.projectId, projectId))).toBe(before);
    expect(await objectKeys(`recordings/${projectId}/`)).toEqual(objectsBefore);
  });

  it.each([
    ["with the arm", `armId=${demoArm.id}&`],
    ["without an arm", ""],
  ])(
    "refuses a recording whose time does not strictly increase with 422 naming the line (%s), and stores nothing",
    async (_what, armQuery) => {
      const lines = recordingCsv().split("\n");
      // data sample 10 is on line 12 (the header is line 1): give it the time of the line before
      lines[11] = [lines[10].split(",")[0], ...lines[11].split(",").slice(1)].join(",");
      const before = await db.$count(recordings, eq(recordings.projectId, projectId));
      const objectsBefore = await objectKeys(`recordings/${projectId}/`);
      const res = await post(lines.join("\n"), `${armQuery}name=Backwards`);
      expect(res.status, res.text).toBe(422);
      const error = errorOf(res);
      expect(error.code).toBe("unprocessable:recording");
      expect(error.message).toContain("line 12");
      expect(error.issues).toEqual([
        { path: "line 12.t", message: "time 0.09 s is not after the previous line's 0.09 s" },
      ]);
      expect(await db.$count(recordings, eq(recordings.projectId, projectId))).toBe(before);
      expect(await objectKeys(`recordings/${projectId}/`)).toEqual(objectsBefore);
    },
  );

  it("names the line of a value that is not a number (422)", async () => {
    const lines = recordingCsv().split("\n");
    lines[4] = lines[4].replace(/,0,/, ",zero,");
    const res = await post(lines.join("\n"), `armId=${demoArm.id}&name=NotANumber`);
    expect(res.status, res.text).toBe(422);
    expect(errorOf(res).issues[0]).toMatchObject({ path: `line 5.${names[1]}` });
  });

  it("refuses a body over the upload limit from its declared length, before reading it (413)", async () => {
    const res = await post("t,base\n0,0\n", "name=Huge", {
      "content-type": "text/csv",
      "content-length": String(env().UPLOAD_LIMIT_BYTES + 1),
    });
    expect(res.status).toBe(413);
    expect(errorOf(res).code).toBe("payload_too_large");
  });

  it("refuses a body that passes the limit while it streams in (413), whatever length it declared", async () => {
    const limit = env().UPLOAD_LIMIT_BYTES;
    const chunk = new TextEncoder().encode("0,0\n".repeat(16_384));
    let sent = 0;
    const stream = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (sent > limit) return controller.close();
        sent += chunk.byteLength;
        controller.enqueue(chunk);
      },
    });
    const request = new Request(`http://127.0.0.1/api/v1/projects/${projectId}/recordings?name=Stream`, {
      method: "POST",
      headers: { "content-type": "text/csv", authorization: `Bearer ${(auth as { bearer: string }).bearer}` },
      body: stream,
      duplex: "half",
    } as RequestInit);
    const res = await upload.POST(request, { params: Promise.resolve({ projectId }) });
    expect(res.status).toBe(413);
  });
});
