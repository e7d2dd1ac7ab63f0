import "./_env";
import { describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { demoPeople } from "@/db/demo";
import { apiTokens, users } from "@/db/schema";
import * as me from "@/app/api/v1/me/route";
import * as tokens from "@/app/api/v1/tokens/route";
import * as token from "@/app/api/v1/tokens/[tokenId]/route";
import * as projects from "@/app/api/v1/projects/route";
import * as project from "@/app/api/v1/projects/[projectId]/route";
import * as projectPlans from "@/app/api/v1/projects/[projectId]/plans/route";
import * as userRoute from "@/app/api/v1/users/[userId]/route";
import { BAD_CREDENTIALS_MESSAGE, RATE_LIMITED_MESSAGE, SIGN_IN_BACKOFF, verifyCredentials } from "@/lib/server/auth";
import { hashToken } from "@/lib/server/tokens";
import { lastUsedPrecisionMs } from "@/db/queries/tokens";
import { BASE, call, demoArm, errorOf, makeUser, sessionCookieFor, tokenFor } from "./_helpers";

describe("API tokens", () => {
  it("is shown once, stored only as its SHA-256, and works as a Bearer token with its owner's identity", async () => {
    const owner = await makeUser("researcher");
    const created = await call(tokens.POST, {
      method: "POST",
      path: "/api/v1/tokens",
      auth: { cookie: await sessionCookieFor(owner.id) },
      body: { name: "ci" },
    });
    expect(created.status).toBe(201);
    const secret = (created.body as { token: string; id: string }).token;
    const [row] = await db
      .select()
      .from(apiTokens)
      .where(eq(apiTokens.id, (created.body as { id: string }).id));
    expect(row.tokenHash).toBe(hashToken(secret));
    expect(JSON.stringify(row)).not.toContain(secret);
    const list = await call(tokens.GET, { path: "/api/v1/tokens", auth: { bearer: secret } });
    expect(JSON.stringify(list.body)).not.toContain(secret);
    const who = await call(me.GET, { path: "/api/v1/me", auth: { bearer: secret } });
    expect(who.status).toBe(200);
    expect(who.body).toMatchObject({ user: { id: owner.id }, via: "token" });
  });

  it("records when it was last used, to the minute: a burst of calls writes the row once, a call a minute later again", async () => {
    const owner = await makeUser("researcher");
    const secret = await tokenFor(owner.id);
    const lastUsed = async () => {
      const [row] = await db
        .select({ at: apiTokens.lastUsedAt })
        .from(apiTokens)
        .where(eq(apiTokens.tokenHash, hashToken(secret)));
      return row.at;
    };
    expect(await lastUsed()).toBeNull();
    expect((await call(me.GET, { path: "/api/v1/me", auth: { bearer: secret } })).status).toBe(200);
    const first = await lastUsed();
    expect(first).not.toBeNull();
    for (let i = 0; i < 3; i++)
      expect((await call(me.GET, { path: "/api/v1/me", auth: { bearer: secret } })).status).toBe(200);
    expect((await lastUsed())!.getTime()).toBe(first!.getTime());
    // a use older than a minute is written again
    const old = new Date(Date.now() - lastUsedPrecisionMs - 1000);
    await db
      .update(apiTokens)
      .set({ lastUsedAt: old })
      .where(eq(apiTokens.tokenHash, hashToken(secret)));
    expect((await call(me.GET, { path: "/api/v1/me", auth: { bearer: secret } })).status).toBe(200);
    expect((await lastUsed())!.getTime()).toBeGreaterThan(old.getTime() + lastUsedPrecisionMs);
  });

  it("stops working at once when revoked", async () => {
    const owner = await makeUser("student");
    const secret = await tokenFor(owner.id);
    const before = await call(me.GET, { path: "/api/v1/me", auth: { bearer: secret } });
    expect(before.status).toBe(200);
    const [row] = await db
      .select()
      .from(apiTokens)
      .where(eq(apiTokens.tokenHash, hashToken(secret)));
    // Revoked by its owner, signed in: a token cannot revoke tokens itself.
    const revoked = await call(token.DELETE, {
      method: "DELETE",
      path: `/api/v1/tokens/${row.id}`,
      params: { tokenId: row.id },
      auth: { cookie: await sessionCookieFor(owner.id) },
    });
    expect(revoked.status).toBe(200);
    const after = await call(me.GET, { path: "/api/v1/me", auth: { bearer: secret } });
    expect(after.status).toBe(401);
    expect(after.headers.get("www-authenticate")).toMatch(/^Bearer/);
    expect(errorOf(after).code).toBe("unauthorized");
  });

  it("refuses an expired token and a made-up one", async () => {
    const owner = await makeUser("student");
    const secret = await tokenFor(owner.id);
    await db
      .update(apiTokens)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(apiTokens.tokenHash, hashToken(secret)));
    expect((await call(me.GET, { path: "/api/v1/me", auth: { bearer: secret } })).status).toBe(401);
    expect((await call(me.GET, { path: "/api/v1/me", auth: { bearer: "jpt_not-a-real-token" } })).status).toBe(401);
  });

  it("stops a disabled user's tokens and sessions", async () => {
    const admin = await makeUser("admin");
    const victim = await makeUser("student");
    const secret = await tokenFor(victim.id);
    const cookie = await sessionCookieFor(victim.id);
    const res = await call(userRoute.PATCH, {
      method: "PATCH",
      path: `/api/v1/users/${victim.id}`,
      params: { userId: victim.id },
      auth: { bearer: await tokenFor(admin.id) },
      body: { disabled: true },
    });
    expect(res.status).toBe(200);
    expect((await call(me.GET, { path: "/api/v1/me", auth: { bearer: secret } })).status).toBe(401);
    expect((await call(me.GET, { path: "/api/v1/me", auth: { cookie } })).status).toBe(401);
  });
});

describe("sessions", () => {
  it("accepts the next-auth session cookie and refuses a tampered one", async () => {
    const u = await makeUser("instructor");
    const cookie = await sessionCookieFor(u.id);
    expect((await call(me.GET, { path: "/api/v1/me", auth: { cookie } })).body).toMatchObject({
      user: { id: u.id },
      via: "session",
    });
    const tampered = cookie.slice(0, -4) + (cookie.endsWith("AAAA") ? "BBBB" : "AAAA");
    expect((await call(me.GET, { path: "/api/v1/me", auth: { cookie: tampered } })).status).toBe(401);
  });

  it("refuses a cross-site state-changing request made with a session cookie (403) and writes nothing", async () => {
    const u = await makeUser("researcher");
    const cookie = await sessionCookieFor(u.id);
    const before = await db.$count(users);
    const cross = await call(projects.POST, {
      method: "POST",
      path: "/api/v1/projects",
      auth: { cookie },
      headers: { origin: "https://elsewhere.example.com" },
      body: { name: "CSRF" },
    });
    expect(cross.status).toBe(403);
    expect(errorOf(cross).code).toBe("forbidden:origin");
    const noOrigin = await call(projects.POST, {
      method: "POST",
      path: "/api/v1/projects",
      auth: { cookie },
      headers: { origin: "" },
      body: { name: "CSRF" },
    });
    expect(noOrigin.status).toBe(403);
    const same = await call(projects.POST, {
      method: "POST",
      path: "/api/v1/projects",
      auth: { cookie },
      headers: { origin: BASE },
      body: { name: "Same site" },
    });
    expect(same.status).toBe(201);
    expect(await db.$count(users)).toBe(before);
  });
});

describe("sign-in", () => {
  it("signs every demo person in with the printed password", async () => {
    for (const p of demoPeople) {
      await expect(
        verifyCredentials({ email: p.email.toUpperCase(), password: p.password }, null),
      ).resolves.toMatchObject({ id: p.id });
    }
  });

  it("refuses a wrong password with one message that does not say whether the account exists", async () => {
    const u = await makeUser("student");
    await expect(verifyCredentials({ email: u.email, password: "wrong-password" }, null)).rejects.toThrow(
      BAD_CREDENTIALS_MESSAGE,
    );
    await expect(
      verifyCredentials({ email: `nobody-${u.id}@example.com`, password: "wrong-password" }, null),
    ).rejects.toThrow(BAD_CREDENTIALS_MESSAGE);
  });

  it(`makes even the right password wait, and says how many seconds, after ${SIGN_IN_BACKOFF.freePerEmail + 1} failed attempts`, async () => {
    const u = await makeUser("student");
    // Addresses from the documentation ranges (RFC 5737), fresh per run so earlier runs do not count.
    const octet = () => 1 + Math.floor(Math.random() * 254);
    for (let i = 0; i < SIGN_IN_BACKOFF.freePerEmail + 1; i++) {
      await expect(
        verifyCredentials({ email: u.email, password: `wrong-${i}` }, `203.0.113.${octet()}`),
      ).rejects.toThrow(BAD_CREDENTIALS_MESSAGE);
    }
    const refused = verifyCredentials({ email: u.email, password: u.password }, `198.51.100.${octet()}`);
    await expect(refused).rejects.toThrow(RATE_LIMITED_MESSAGE);
    await expect(refused).rejects.toThrow(/Try again in [12] seconds?\./);
  });

  it("lets the right password in once the back-off delay (2 s after one failure over the free ones) has passed", async () => {
    const u = await makeUser("student");
    for (let i = 0; i < SIGN_IN_BACKOFF.freePerEmail + 1; i++) {
      await expect(verifyCredentials({ email: u.email, password: `wrong-${i}` }, null)).rejects.toThrow(
        BAD_CREDENTIALS_MESSAGE,
      );
    }
    await expect(verifyCredentials({ email: u.email, password: u.password }, null)).rejects.toThrow(
      RATE_LIMITED_MESSAGE,
    );
    await new Promise((r) => setTimeout(r, 2_100));
    await expect(verifyCredentials({ email: u.email, password: u.password }, null)).resolves.toMatchObject({
      id: u.id,
    });
  });

  it("allows a correct password after no more failures than the free ones", async () => {
    const u = await makeUser("student");
    for (let i = 0; i < SIGN_IN_BACKOFF.freePerEmail; i++) {
      await expect(verifyCredentials({ email: u.email, password: `wrong-${i}` }, null)).rejects.toThrow();
    }
    await expect(verifyCredentials({ email: u.email, password: u.password }, null)).resolves.toMatchObject({
      id: u.id,
    });
  });
});

describe("archived projects", () => {
  it("stay readable but refuse changes until un-archived", async () => {
    const owner = await makeUser("researcher");
    const auth = { bearer: await tokenFor(owner.id) };
    const created = await call(projects.POST, {
      method: "POST",
      path: "/api/v1/projects",
      auth,
      body: { name: "Old work" },
    });
    const projectId = (created.body as { project: { id: string } }).project.id;
    const archive = await call(project.PATCH, {
      method: "PATCH",
      path: `/api/v1/projects/${projectId}`,
      params: { projectId },
      auth,
      body: { archived: true },
    });
    expect(archive.status).toBe(200);
    const list = await call(projects.GET, { path: "/api/v1/projects", auth });
    expect((list.body as { projects: { id: string }[] }).projects.map((p) => p.id)).not.toContain(projectId);
    const withArchived = await call(projects.GET, { path: "/api/v1/projects?archived=include", auth });
    expect((withArchived.body as { projects: { id: string }[] }).projects.map((p) => p.id)).toContain(projectId);
    const write = await call(projectPlans.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/plans`,
      params: { projectId },
      auth,
      body: { name: "P", armId: demoArm.id },
    });
    expect(write.status).toBe(403);
    expect(errorOf(write).code).toBe("forbidden:archived");
    expect(
      (await call(project.GET, { path: `/api/v1/projects/${projectId}`, params: { projectId }, auth })).status,
    ).toBe(200);
    await call(project.PATCH, {
      method: "PATCH",
      path: `/api/v1/projects/${projectId}`,
      params: { projectId },
      auth,
      body: { archived: false },
    });
    const again = await call(projectPlans.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/plans`,
      params: { projectId },
      auth,
      body: { name: "P", armId: demoArm.id },
    });
    expect(again.status).toBe(201);
  });
});

describe("audit log", () => {
  it("records who created a project and saved a plan, newest first, for the project's owners", async () => {
    const { GET } = await import("@/app/api/v1/projects/[projectId]/audit/route");
    const owner = await makeUser("researcher");
    const auth = { bearer: await tokenFor(owner.id) };
    const created = await call(projects.POST, {
      method: "POST",
      path: "/api/v1/projects",
      auth,
      body: { name: "Audited" },
    });
    const projectId = (created.body as { project: { id: string } }).project.id;
    await call(projectPlans.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/plans`,
      params: { projectId },
      auth,
      body: { name: "P", armId: demoArm.id },
    });
    const log = await call(GET, { path: `/api/v1/projects/${projectId}/audit`, params: { projectId }, auth });
    expect(log.status).toBe(200);
    const entries = (log.body as { entries: { action: string; actorId: string }[] }).entries;
    expect(entries.map((e) => e.action)).toEqual(["plan.create", "project.create"]);
    expect(entries.every((e) => e.actorId === owner.id)).toBe(true);
  });
});
