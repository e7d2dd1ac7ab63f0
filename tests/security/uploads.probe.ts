/**
 * Uploads through the real server (issue: bodies over 10 MB were cut to their first 10.4 MB and
 * checked as if whole; 413 came only after 60 MB had arrived).
 */
import "./_env";
import { createHash } from "node:crypto";
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
  });

  it("refuses a 60 MB chunked upload with 413 once the count passes the limit, and stores nothing", async () => {
    const before = await rows(recordings);
    const res = await upload("name=HugeChunked", chunked(Buffer.alloc(60 * MB, 0x30)), {}, "half").catch(
      (err: Error) => ({ status: -1, text: err.message }) as { status: number; text: string },
    );
    if (res.status !== -1) expect(res.status).toBe(413);
    expect(await rows(recordings)).toBe(before);
  });
});
