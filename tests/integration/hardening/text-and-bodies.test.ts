/** Text that PostgreSQL or Unicode cannot hold, byte-order marks, cut bodies and one transaction per write (issue items 3, 5, 11). */
import "../api/_env";
import { beforeAll, describe, expect, it } from "vitest";
import { and, count, eq } from "drizzle-orm";
import { db } from "@/db";
import { auditLog, projects } from "@/db/schema";
import * as projectsRoute from "@/app/api/v1/projects/route";
import * as projectRoute from "@/app/api/v1/projects/[projectId]/route";
import * as projectPlans from "@/app/api/v1/projects/[projectId]/plans/route";
import * as versionRoute from "@/app/api/v1/plans/[planId]/versions/[version]/route";
import * as versionsRoute from "@/app/api/v1/plans/[planId]/versions/route";
import * as diffRoute from "@/app/api/v1/plans/[planId]/diff/route";
import { isDatabaseUnavailable, readBodyLimited, versionParam } from "@/lib/server/route";
import { call, demoArm, errorOf, gentlePlan, makeUser, tokenFor, type Auth } from "../api/_helpers";

let auth: Auth;
let projectId: string;
beforeAll(async () => {
  const u = await makeUser("researcher");
  auth = { bearer: await tokenFor(u.id) };
  const p = await call(projectsRoute.POST, {
    method: "POST",
    path: "/api/v1/projects",
    auth,
    body: { name: "Text checks" },
  });
  projectId = (p.body as { project: { id: string } }).project.id;
});

const rename = (raw: string) =>
  call(projectRoute.PATCH, {
    method: "PATCH",
    path: `/api/v1/projects/${projectId}`,
    params: { projectId },
    auth,
    rawBody: raw,
    headers: { "content-type": "application/json" },
  });

async function auditCount(): Promise<number> {
  const [row] = await db
    .select({ n: count() })
    .from(auditLog)
    .where(and(eq(auditLog.projectId, projectId), eq(auditLog.action, "project.update")));
  return row.n;
}

describe("text fields", () => {
  it.each([
    ["a NUL character", '{"name":"a\\u0000b"}', "must not contain NUL characters"],
    ["a lone high surrogate", '{"name":"a\\ud800b"}', "unpaired surrogates"],
    ["a lone low surrogate", '{"name":"\\udc00"}', "unpaired surrogates"],
  ])("refuse %s with 400 naming the field, and change nothing", async (_what, raw, message) => {
    const before = await auditCount();
    const res = await rename(raw);
    expect(res.status).toBe(400);
    expect(errorOf(res).issues).toEqual([{ path: "name", message: expect.stringContaining(message) }]);
    const [p] = await db.select().from(projects).where(eq(projects.id, projectId));
    expect(p.name).toBe("Text checks");
    expect(await auditCount()).toBe(before);
  });

  it("accept a correctly paired surrogate (an emoji), with its audit entry", async () => {
    const before = await auditCount();
    const res = await rename('{"name":"Arm \\ud83e\\udd16"}');
    expect(res.status, res.text).toBe(200);
    expect(await auditCount()).toBe(before + 1);
  });

  it("refuse a bad string inside a nested object, naming its full path", async () => {
    const res = await call(projectsRoute.POST, {
      method: "POST",
      path: "/api/v1/projects",
      auth,
      rawBody: '{"name":"ok","extra":{"list":["x","\\u0000"]}}',
      headers: { "content-type": "application/json" },
    });
    expect(res.status).toBe(400);
    expect(errorOf(res).issues[0].path).toBe("extra.list[1]");
  });
});

describe("JSON bodies", () => {
  it("refuse a byte-order mark (RFC 8259 §8.1) with 400 instead of silently dropping it", async () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode('{"name":"BOM"}')]);
    const res = await call(projectRoute.PATCH, {
      method: "PATCH",
      path: `/api/v1/projects/${projectId}`,
      params: { projectId },
      auth,
      rawBody: bytes,
      headers: { "content-type": "application/json" },
    });
    expect(res.status).toBe(400);
    expect(errorOf(res).message).toContain("byte-order mark");
  });

  it("carry a request id in every error body and in the X-Request-Id header", async () => {
    const res = await rename("{not json");
    expect(res.status).toBe(400);
    const id = (res.body as { error: { requestId: string } }).error.requestId;
    expect(id).toMatch(/^[0-9a-f-]{36}$/);
    expect(res.headers.get("x-request-id")).toBe(id);
  });
});

describe("body reading", () => {
  it("refuses a body shorter than its declared Content-Length (a cut upload) instead of using the part", async () => {
    const req = new Request("http://127.0.0.1/x", { method: "POST", body: "abc", headers: { "content-length": "10" } });
    await expect(readBodyLimited(req, 100)).rejects.toMatchObject({ code: "bad_request:incomplete_body" });
  });

  it("refuses on the declared length before reading a byte", async () => {
    let pulled = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(c) {
        pulled++;
        c.enqueue(new Uint8Array(10));
      },
    });
    const req = new Request("http://127.0.0.1/x", {
      method: "POST",
      body,
      headers: { "content-length": "1000" },
      duplex: "half",
    } as RequestInit);
    await expect(readBodyLimited(req, 100)).rejects.toMatchObject({ code: "payload_too_large" });
    expect(pulled).toBeLessThanOrEqual(1);
  });

  it("stops a chunked body as soon as the count passes the limit", async () => {
    let sent = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(c) {
        sent += 64;
        c.enqueue(new Uint8Array(64));
      },
    });
    const req = new Request("http://127.0.0.1/x", { method: "POST", body, duplex: "half" } as RequestInit);
    await expect(readBodyLimited(req, 1000)).rejects.toMatchObject({ code: "payload_too_large" });
    expect(sent).toBeLessThan(1000 + 64 * 4);
  });
});

describe("version numbers", () => {
  it("in a path: version 0x1 is no version (404) where version 1 is found", async () => {
    const created = await call(projectPlans.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/plans`,
      params: { projectId },
      auth,
      body: { name: "Versions", armId: demoArm.id },
    });
    expect(created.status, created.text).toBe(201);
    const planId = (created.body as { plan: { id: string } }).plan.id;
    const saved = await call(versionsRoute.POST, {
      method: "POST",
      path: `/api/v1/plans/${planId}/versions`,
      params: { planId },
      auth,
      body: { baseVersion: 0, document: gentlePlan() },
    });
    expect(saved.status, saved.text).toBe(201);
    const get = (version: string) =>
      call(versionRoute.GET, {
        path: `/api/v1/plans/${planId}/versions/${version}`,
        params: { planId, version },
        auth,
      });
    expect((await get("1")).status).toBe(200);
    expect((await get("0x1")).status).toBe(404);
    const diff = await call(diffRoute.GET, {
      path: `/api/v1/plans/${planId}/diff?from=0x1&to=1`,
      auth,
      params: { planId },
    });
    expect(diff.status).toBe(400);
    expect(errorOf(diff).issues.map((i) => i.path)).toContain("query.from");
  });

  it("take plain decimal digits only: 0x1, 1e0, +1, 01 and ' 1' are refused", () => {
    expect(versionParam.safeParse("1").data).toBe(1);
    expect(versionParam.safeParse("1000000").data).toBe(1_000_000);
    for (const bad of ["0x1", "1e0", "+1", "01", " 1", "1.0", "0", "1000001"])
      expect(versionParam.safeParse(bad).success, bad).toBe(false);
  });
});

describe("database errors", () => {
  it("tell an unreachable database (refused connection, shutdown, wrapped by Drizzle) from other errors", () => {
    expect(
      isDatabaseUnavailable(Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:1"), { code: "ECONNREFUSED" })),
    ).toBe(true);
    expect(
      isDatabaseUnavailable(
        new Error("Failed query", {
          cause: Object.assign(new Error("terminating connection due to administrator command"), { code: "57P01" }),
        }),
      ),
    ).toBe(true);
    expect(isDatabaseUnavailable(new Error("Connection terminated unexpectedly"))).toBe(true);
    expect(isDatabaseUnavailable(Object.assign(new Error("duplicate key"), { code: "23505" }))).toBe(false);
    expect(isDatabaseUnavailable(new TypeError("x is undefined"))).toBe(false);
  });
});
