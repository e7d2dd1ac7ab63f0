/**
 * Each defect the outside probe found (issue "Hardening"), as its own test against the running
 * server, so none of them comes back.
 */
import "./_env";
import { readFileSync } from "node:fs";
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "@/db";
import { projects, signUpAttempts, users } from "@/db/schema";
import { demoPeople } from "@/db/demo";
import {
  BASE,
  demoArm,
  gentlePlan,
  http,
  makeUser,
  rows,
  sessionCookieFor,
  signInOverHttp,
  signOutOverHttp,
  tokenFor,
  type Auth,
} from "./_probe";

const admin = demoPeople.find((p) => p.role === "admin")!;
let owner: Awaited<ReturnType<typeof makeUser>>;
let ownerToken: Auth;
let projectId: string;

beforeAll(async () => {
  owner = await makeUser("researcher", "defects-probe");
  ownerToken = { bearer: await tokenFor(owner.id) };
  const p = await http("/api/v1/projects", { auth: ownerToken, json: { name: "Defects probe" } });
  projectId = (p.body as { project: { id: string } }).project.id;
});

describe("1. the development mail page", () => {
  it("does not exist for anonymous callers or a signed-in non-admin (404), API and page alike", async () => {
    expect((await http("/api/dev/mail")).status).toBe(404);
    expect((await http("/dev/mail")).status).toBe(404);
    const cookie = await sessionCookieFor(owner.id);
    expect((await http("/api/dev/mail", { auth: { cookie } })).status).toBe(404);
    expect((await http("/dev/mail", { auth: { cookie } })).status).toBe(404);
  });

  it("is shown to the signed-in demo admin on this loopback server, and says what it is", async () => {
    const { cookie } = await signInOverHttp(admin.email, admin.password);
    expect(cookie).not.toBeNull();
    const api = await http("/api/dev/mail", { auth: { cookie: cookie! } });
    expect(api.status).toBe(200);
    const page = await http("/dev/mail", { auth: { cookie: cookie! } });
    expect(page.status).toBe(200);
    expect(page.text).toContain("Development tool, local machine only.");
  });
});

describe("2. sign-in limits and forwarded addresses", () => {
  it("a forged X-Forwarded-For does not reset the per-address back-off, and the message says when to retry", async () => {
    let message = "";
    for (let i = 0; i < 20 && !/Try again in/.test(message); i++) {
      const forged = { "x-forwarded-for": `203.0.113.${1 + (i % 250)}` };
      const res = await signInOverHttp(`nobody-${randomUUID()}@example.com`, "wrong-password", forged);
      expect(res.cookie).toBeNull();
      message = res.location.replace(/\+/g, " ");
    }
    expect(message).toMatch(/Too many failed sign-in attempts\. Try again in \d+ seconds?\./);
    // wait the delay out, so later sign-ins in this run are not held up
    const waitS = Number(/Try again in (\d+)/.exec(message)![1]);
    await new Promise((r) => setTimeout(r, (waitS + 1) * 1000));
  });
});

describe("3. NUL characters and lone surrogates", () => {
  it("are refused with 400 naming the field, and nothing is renamed", async () => {
    for (const raw of ['{"name":"x\\u0000y"}', '{"name":"x\\ud800"}']) {
      const res = await http(`/api/v1/projects/${projectId}`, {
        method: "PATCH",
        auth: ownerToken,
        body: raw,
        headers: { "content-type": "application/json" },
      });
      expect(res.status, raw).toBe(400);
      expect((res.body as { error: { issues: { path: string }[] } }).error.issues[0].path).toBe("name");
    }
    const p = await http(`/api/v1/projects/${projectId}`, { auth: ownerToken });
    expect((p.body as { project: { name: string } }).project.name).toBe("Defects probe");
  });
});

describe("5. body limits", () => {
  it("a JSON route refuses a declared length over its limit with 413 before reading the body", async () => {
    const res = await http("/api/v1/projects", {
      method: "POST",
      auth: ownerToken,
      body: JSON.stringify({ name: "x".repeat(1_200_000) }),
      headers: { "content-type": "application/json" },
    });
    expect(res.status).toBe(413);
  });
});

describe("7. sign-up", () => {
  it("answers an existing and a new address alike (202, same body) and refuses unknown fields", async () => {
    // The browser tests before this probe sign up from the same loopback address; start this
    // client's sliding window afresh so the per-client limit (10 in 15 minutes) does not answer 429.
    await db.delete(signUpAttempts);
    const before = await rows(users);
    const existing = await http("/api/v1/accounts", {
      json: { email: owner.email, name: "Other", password: "a-long-password-1" },
    });
    const fresh = await http("/api/v1/accounts", {
      json: { email: `probe-${randomUUID().slice(0, 8)}@example.com`, name: "New", password: "a-long-password-1" },
    });
    expect([existing.status, fresh.status]).toEqual([202, 202]);
    expect(existing.body).toEqual(fresh.body);
    expect(await rows(users)).toBe(before + 1);
    const unknown = await http("/api/v1/accounts", {
      json: {
        email: `u-${randomUUID().slice(0, 8)}@example.com`,
        name: "U",
        password: "a-long-password-1",
        siteRoleX: "admin",
      },
    });
    expect(unknown.status).toBe(400);
  });

  it("refuses a 10,000-deep nested body with 400", async () => {
    const deep = `{"email":"d@example.com","name":"D","password":"a-long-password-1","x":${"[".repeat(10_000)}${"]".repeat(10_000)}}`;
    const res = await http("/api/v1/accounts", {
      method: "POST",
      body: deep,
      headers: { "content-type": "application/json" },
    });
    expect(res.status).toBe(400);
  });
});

describe("8. sessions and tokens", () => {
  it("sign-out ends the session on the server: the copied cookie is refused afterwards", async () => {
    const u = await makeUser("student", "signout-probe");
    const { cookie } = await signInOverHttp(u.email, u.password);
    expect((await http("/api/v1/me", { auth: { cookie: cookie! } })).status).toBe(200);
    await signOutOverHttp(cookie!);
    expect((await http("/api/v1/me", { auth: { cookie: cookie! } })).status).toBe(401);
  });

  it("an API token can neither mint a token nor revoke one", async () => {
    const minted = await http("/api/v1/tokens", { auth: ownerToken, json: { name: "child" } });
    expect(minted.status).toBe(403);
    expect((await http("/api/v1/me", { auth: ownerToken })).status).toBe(200);
  });
});

describe("9. same-origin check", () => {
  it("accepts exactly the configured origin: localhost is not 127.0.0.1", async () => {
    const cookie = await sessionCookieFor(owner.id);
    const other = BASE.replace("127.0.0.1", "localhost");
    const cross = await http("/api/v1/projects", {
      auth: { cookie },
      json: { name: "From localhost" },
      headers: { origin: other },
    });
    expect(cross.status).toBe(403);
    const same = await http("/api/v1/projects", {
      auth: { cookie },
      json: { name: "Same origin" },
      headers: { origin: BASE },
    });
    expect(same.status).toBe(201);
  });
});

describe("11. minor ones", () => {
  it("0x1 is not a version number, and a byte-order mark before JSON is refused", async () => {
    const res = await http(`/api/v1/plans/${randomUUID()}/versions/0x1`, { auth: ownerToken });
    expect(res.status).toBe(404);
    const bom = await http(`/api/v1/projects/${projectId}`, {
      method: "PATCH",
      auth: ownerToken,
      body: '\ufeff{"name":"B"}',
      headers: { "content-type": "application/json" },
    });
    expect(bom.status).toBe(400);
  });

  it("the export route refuses 0x1, 1e0 and +1 as version numbers (404, as the version route) and exports version 1", async () => {
    const plan = await http(`/api/v1/projects/${projectId}/plans`, {
      auth: ownerToken,
      json: { name: "Export numbering", armId: demoArm.id },
    });
    const planId = (plan.body as { plan: { id: string } }).plan.id;
    const saved = await http(`/api/v1/plans/${planId}/versions`, {
      auth: ownerToken,
      json: { baseVersion: 0, document: gentlePlan() },
    });
    expect(saved.status).toBe(201);
    for (const bad of ["0x1", "1e0", "%2B1", "01"]) {
      const res = await http(`/api/v1/plans/${planId}/versions/${bad}/export?format=json`, { auth: ownerToken });
      expect(res.status, bad).toBe(404);
    }
    const ok = await http(`/api/v1/plans/${planId}/versions/1/export?format=json`, { auth: ownerToken });
    expect(ok.status).toBe(200);
  });

  it("static files, pages, API answers and 404s all carry the security headers", async () => {
    const landing = await http("/");
    const script = /\/_next\/static\/[^"']+\.js/.exec(landing.text)?.[0];
    expect(script).toBeDefined();
    for (const path of ["/", script!, "/icon.svg", "/api/v1/me", "/no-such-page"]) {
      const res = await http(path);
      expect(res.headers.get("content-security-policy"), path).toContain("frame-ancestors 'none'");
      expect(res.headers.get("x-content-type-options"), path).toBe("nosniff");
      expect(res.headers.get("x-frame-options"), path).toBe("DENY");
    }
  });
});

describe("observability", () => {
  it("every answer has a request id, every error body the same id, and the server logs one line for it without the token", async () => {
    const res = await http(`/api/v1/projects/${randomUUID()}`, { auth: ownerToken });
    expect(res.status).toBe(404);
    const id = res.headers.get("x-request-id");
    expect(id).toMatch(/^[0-9a-f-]{36}$/);
    expect((res.body as { error: { requestId: string } }).error.requestId).toBe(id);
    await new Promise((r) => setTimeout(r, 300));
    const lines = readFileSync(".data/test/server.log", "utf8")
      .split("\n")
      .filter((l) => l.includes(id!));
    expect(lines).toHaveLength(1);
    const line = JSON.parse(lines[0]) as Record<string, unknown>;
    expect(line).toMatchObject({
      requestId: id,
      method: "GET",
      route: "/api/v1/projects/:id",
      status: 404,
      actorId: owner.id,
    });
    expect(typeof line.durationMs).toBe("number");
    expect(lines[0]).not.toContain((ownerToken as { bearer: string }).bearer);
  });

  it("row counts do not move for refused writes", async () => {
    const before = await rows(projects);
    await http("/api/v1/projects", {
      auth: ownerToken,
      body: '{"name":"\\u0000"}',
      headers: { "content-type": "application/json" },
    });
    await http("/api/v1/projects", { auth: ownerToken, body: "{", headers: { "content-type": "application/json" } });
    expect(await rows(projects)).toBe(before);
  });
});
