/**
 * Uploads through the real server (issue: bodies over 10 MB were cut to their first 10.4 MB and
 * checked as if whole; 413 came only after 60 MB had arrived).
 */
import "./_env";
import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { readFileSync, writeFileSync } from "node:fs";
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import { beforeAll, describe, expect, it } from "vitest";
import { recordings } from "@/db/schema";
import { demoArm, http, makeUser, rows, tokenFor, type Auth } from "./_probe";

const MB = 1_048_576;
const names = demoArm.description.joints.map((j) => j.name);
let auth: Auth;
let projectId: string;

/**
 * A recording CSV of at least `bytes` bytes at 100 Hz: a slow base sweep, with one step of
 * 0.05 rad (a jump, as in tests/integration/api/recordings.test.ts) 50 rows before the end.
 */
function recordingCsv(bytes: number): { csv: Buffer; rows: number; jumpRow: number } {
  const lines = [`t,${names.join(",")}`];
  let size = lines[0].length + 1;
  const rowsWanted: number[] = [];
  // about 70 bytes a row; generate until the size is reached
  for (let k = 0; size < bytes; k++) {
    const line = `${(k / 100).toFixed(2)},${(0.00001 * k).toFixed(6)},0.1,0.2,0.3,0.4,0.5,0.01`;
    rowsWanted.push(k);
    lines.push(line);
    size += line.length + 1;
  }
  const n = lines.length - 1;
  const jumpRow = n - 50;
  for (let k = jumpRow; k < n; k++) {
    const cells = lines[k + 1].split(",");
    cells[1] = (Number(cells[1]) + 0.05).toFixed(6);
    lines[k + 1] = cells.join(",");
  }
  return { csv: Buffer.from(lines.join("\n") + "\n"), rows: n, jumpRow };
}

/** A body streamed in 1 MiB chunks without a Content-Length (chunked transfer coding). */
function chunked(data: Buffer): ReadableStream<Uint8Array> {
  let offset = 0;
  return new ReadableStream<Uint8Array>({
    pull(controller) {
      if (offset >= data.length) return controller.close();
      controller.enqueue(new Uint8Array(data.subarray(offset, offset + MB)));
      offset += MB;
    },
  });
}

const upload = (query: string, body: BodyInit, headers: Record<string, string> = {}, duplex?: "half") =>
  http(`/api/v1/projects/${projectId}/recordings?${query}`, {
    method: "POST",
    auth,
    body,
    headers: { "content-type": "text/csv", ...headers },
    duplex,
  });

beforeAll(async () => {
  const u = await makeUser("researcher", "upload-probe");
  auth = { bearer: await tokenFor(u.id) };
  const p = await http("/api/v1/projects", { auth, json: { name: "Upload probe" } });
  projectId = (p.body as { project: { id: string } }).project.id;
});

/** Keys the object store holds for this probe's project (the fake of scripts/fakes/start.ts that npm test starts). */
async function storedKeys(): Promise<string[]> {
  const client = new S3Client({
    region: process.env.S3_REGION ?? "us-east-1",
    endpoint: process.env.S3_ENDPOINT ?? `http://127.0.0.1:${process.env.S3_PORT}`,
    forcePathStyle: true,
    credentials: {
      accessKeyId: process.env.S3_ACCESS_KEY_ID ?? "S3RVER",
      secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? "S3RVER",
    },
  });
  const res = await client.send(
    new ListObjectsV2Command({ Bucket: process.env.S3_BUCKET ?? "jointproof", Prefix: `recordings/${projectId}/` }),
  );
  return (res.Contents ?? []).map((o) => o.Key ?? "");
}

/** The process ID of the server listening on the app's port (tests/e2e/server.ts started it). */
function serverPid(): number {
  const port = new URL(process.env.APP_URL!).port;
  const out = execFileSync("ss", ["-ltnpH", `sport = :${port}`], { encoding: "utf8" });
  const pid = /pid=(\d+)/.exec(out)?.[1];
  if (!pid) throw new Error(`no process listens on port ${port}: ${out}`);
  return Number(pid);
}

/** A field of /proc/<pid>/status in KiB (VmRSS: resident now; VmHWM: the peak since the last reset). */
function statusKiB(pid: number, field: "VmRSS" | "VmHWM"): number {
  const line = readFileSync(`/proc/${pid}/status`, "utf8")
    .split("\n")
    .find((l) => l.startsWith(`${field}:`));
  if (!line) throw new Error(`no ${field} in /proc/${pid}/status`);
  return Number(line.split(/\s+/)[1]);
}

type Uploaded = {
  recording: { id: string; sizeBytes: number; sha256: string; sampleCount: number };
  stream: { verdict: string; findings: { kind: string; sample: number }[] };
};

describe("uploads through the running server", () => {
  it("stores a 20 MB recording whole (byte count and SHA-256 of the stored file match) and finds the fault 50 rows before its end", async () => {
    const { csv, rows: n, jumpRow } = recordingCsv(20 * MB);
    const res = await upload(`name=Twenty&armId=${demoArm.id}`, new Uint8Array(csv));
    expect(res.status, res.text.slice(0, 300)).toBe(201);
    const body = res.body as Uploaded;
    expect(body.recording.sizeBytes).toBe(csv.length);
    expect(body.recording.sha256).toBe(createHash("sha256").update(csv).digest("hex"));
    expect(body.recording.sampleCount).toBe(n);
    expect(body.stream.verdict).toBe("fault");
    expect(body.stream.findings.filter((f) => f.kind === "jump").map((f) => f.sample)).toContain(jumpRow);
    const stored = await fetch(`${process.env.APP_URL}/api/v1/recordings/${body.recording.id}/file`, {
      headers: { authorization: `Bearer ${(auth as { bearer: string }).bearer}` },
    });
    const storedBytes = Buffer.from(await stored.arrayBuffer());
    expect(storedBytes.length).toBe(csv.length);
    expect(createHash("sha256").update(storedBytes).digest("hex")).toBe(body.recording.sha256);
  });

  it("stores a 20 MB recording sent chunked (no Content-Length) whole as well", async () => {
    const { csv } = recordingCsv(20 * MB);
    const res = await upload("name=Chunked", chunked(csv), {}, "half");
    expect(res.status, res.text.slice(0, 300)).toBe(201);
    expect((res.body as Uploaded).recording.sizeBytes).toBe(csv.length);
    expect((res.body as Uploaded).recording.sha256).toBe(createHash("sha256").update(csv).digest("hex"));
  });

  it("refuses a 60 MB upload with 413 on its Content-Length, before the body is sent, and stores nothing", async () => {
    const before = await rows(recordings);
    const keysBefore = await storedKeys();
    let pulled = 0;
    const data = Buffer.alloc(60 * MB, 0x30);
    let offset = 0;
    // A declared length with a body the server must not wait for: the answer comes while most of it is unsent.
    // The body is offered at 20 MB/s (3 s in all), so a loaded machine's socket buffers cannot swallow
    // all of it before the server's early answer arrives.
    const body = new ReadableStream<Uint8Array>({
      async pull(controller) {
        await new Promise((r) => setTimeout(r, 50));
        if (offset >= data.length) return controller.close();
        pulled += MB;
        controller.enqueue(new Uint8Array(data.subarray(offset, offset + MB)));
        offset += MB;
      },
    });
    const res = await upload("name=Huge", body, { "content-length": String(data.length) }, "half").catch(
      (err: Error) => ({ status: -1, text: err.message }) as { status: number; text: string },
    );
    // fetch either sees the 413 or the server closing the socket mid-body; either way nothing may be stored
    if (res.status !== -1) expect(res.status).toBe(413);
    expect(pulled).toBeLessThan(60 * MB);
    expect(await rows(recordings)).toBe(before);
    expect(await storedKeys()).toEqual(keysBefore);
  });

  it("refuses a 60 MB chunked upload with 413 once the count passes the limit, and leaves no row and no object", async () => {
    const before = await rows(recordings);
    const keysBefore = await storedKeys();
    // a valid recording's bytes: the scan would accept its first 50 MiB, so only the count can refuse it
    const { csv } = recordingCsv(60 * MB);
    const res = await upload(`name=HugeChunked&armId=${demoArm.id}`, chunked(csv), {}, "half").catch(
      (err: Error) => ({ status: -1, text: err.message }) as { status: number; text: string },
    );
    if (res.status !== -1) expect(res.status).toBe(413);
    expect(await rows(recordings)).toBe(before);
    // the multipart upload was aborted: no object, whole or in part
    expect(await storedKeys()).toEqual(keysBefore);
  });

  it("refuses a broken 20 MB recording with 422 naming its line, and leaves no row and no object", async () => {
    const before = await rows(recordings);
    const keysBefore = await storedKeys();
    const { csv, rows: n } = recordingCsv(20 * MB);
    // one value near the end that is not a number: the whole file was read before the verdict
    const text = csv.toString("latin1");
    const at = text.lastIndexOf("\n", text.length - 2000) + 1;
    const broken = Buffer.from(text.slice(0, at) + "0.5,abc" + text.slice(text.indexOf(",", at + 10)), "latin1");
    const res = await upload(`name=Broken&armId=${demoArm.id}`, chunked(broken), {}, "half");
    expect(res.status, res.text.slice(0, 300)).toBe(422);
    const line = text.slice(0, at).split("\n").length;
    expect(line).toBeGreaterThan(n - 100);
    expect((res.body as { error: { issues: { path: string; message: string }[] } }).error.issues[0]).toEqual({
      path: `line ${line}.${names[0]}`,
      message: 'not a number ("abc")',
    });
    expect(await rows(recordings)).toBe(before);
    expect(await storedKeys()).toEqual(keysBefore);
  });

  it.each([
    ["with its Content-Length", false],
    ["chunked", true],
  ] as const)(
    "holds much less than the file while it stores and checks a 45 MB recording sent %s (peak resident memory of the server process)",
    async (how, isChunked) => {
      const pid = serverPid();
      const { csv, rows: n } = recordingCsv(45 * MB);
      // writing 5 to clear_refs resets the process's peak resident size (VmHWM) to its current size (proc(5))
      writeFileSync(`/proc/${pid}/clear_refs`, "5");
      const residentKiB = statusKiB(pid, "VmRSS");
      const res = isChunked
        ? await upload(`name=FortyFiveChunked&armId=${demoArm.id}`, chunked(csv), {}, "half")
        : await upload(`name=FortyFive&armId=${demoArm.id}`, new Uint8Array(csv));
      expect(res.status, res.text.slice(0, 300)).toBe(201);
      expect((res.body as Uploaded).recording.sampleCount).toBe(n);
      const growthMiB = (statusKiB(pid, "VmHWM") - residentKiB) / 1024;
      const figures = { how, fileMiB: csv.length / MB, peakGrowthMiB: Math.round(growthMiB * 10) / 10 };
      console.log("upload memory", figures);
      // held whole, the file alone is 45 MiB and its samples as arrays 60 MiB more; streamed, at most
      // one 5 MiB part of a multipart upload is held
      expect(growthMiB).toBeLessThan(30);
    },
  );
});
