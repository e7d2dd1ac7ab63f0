/** The development mail view (issue: it showed every user's reset links to anyone). */
import "../api/_env";
import { createServer, type Server } from "node:net";
import { afterAll, describe, expect, it } from "vitest";
import { call, makeUser, sessionCookieFor, tokenFor } from "../api/_helpers";
import * as devMailRoute from "@/app/api/dev/mail/route";
import { devMailEnabled, servesLoopbackOnly } from "@/lib/server/mail/dev-mail";

const saved = { NODE_ENV: process.env.NODE_ENV, JP_DEV_MAIL: process.env.JP_DEV_MAIL };
afterAll(() => {
  Object.assign(process.env, { NODE_ENV: saved.NODE_ENV });
  if (saved.JP_DEV_MAIL === undefined) delete process.env.JP_DEV_MAIL;
  else process.env.JP_DEV_MAIL = saved.JP_DEV_MAIL;
});

function enable() {
  Object.assign(process.env, { NODE_ENV: "production", JP_DEV_MAIL: "1" });
}

describe("development mail API", () => {
  it("is a 404 to anonymous callers even when enabled", async () => {
    enable();
    expect((await call(devMailRoute.GET, { path: "/api/dev/mail" })).status).toBe(404);
  });

  it("is a 404 to a signed-in user who is not an admin", async () => {
    enable();
    const instructor = await makeUser("instructor");
    const res = await call(devMailRoute.GET, {
      path: "/api/dev/mail",
      auth: { cookie: await sessionCookieFor(instructor.id) },
    });
    expect(res.status).toBe(404);
  });

  it("is a 404 to an admin's API token (only a signed-in admin session reads it)", async () => {
    enable();
    const admin = await makeUser("admin");
    const res = await call(devMailRoute.GET, { path: "/api/dev/mail", auth: { bearer: await tokenFor(admin.id) } });
    expect(res.status).toBe(404);
  });

  it("answers a signed-in admin on a loopback-only server with JP_DEV_MAIL=1", async () => {
    enable();
    const admin = await makeUser("admin");
    const res = await call(devMailRoute.GET, {
      path: "/api/dev/mail",
      auth: { cookie: await sessionCookieFor(admin.id) },
    });
    expect(res.status, res.text).toBe(200);
    expect(res.body).toHaveProperty("messages");
  });

  it("does not exist in production without JP_DEV_MAIL=1, even for an admin", async () => {
    Object.assign(process.env, { NODE_ENV: "production" });
    delete process.env.JP_DEV_MAIL;
    const admin = await makeUser("admin");
    const res = await call(devMailRoute.GET, {
      path: "/api/dev/mail",
      auth: { cookie: await sessionCookieFor(admin.id) },
    });
    expect(res.status).toBe(404);
  });

  it("does not exist while this process listens on a non-loopback address", async () => {
    enable();
    const server: Server = createServer();
    await new Promise<void>((resolve) => server.listen(0, "0.0.0.0", resolve));
    try {
      expect(devMailEnabled()).toBe(false);
      const admin = await makeUser("admin");
      const res = await call(devMailRoute.GET, {
        path: "/api/dev/mail",
        auth: { cookie: await sessionCookieFor(admin.id) },
      });
      expect(res.status).toBe(404);
    } finally {
      await new Promise((r) => server.close(r));
    }
    expect(devMailEnabled()).toBe(true);
  });

  it("treats an APP_URL on a network address as not local", () => {
    expect(servesLoopbackOnly("http://127.0.0.1:3000", ["127.0.0.1"])).toBe(true);
    expect(servesLoopbackOnly("https://lab.example.com", ["127.0.0.1"])).toBe(false);
    expect(servesLoopbackOnly("http://127.0.0.1:3000", ["127.0.0.1", "::"])).toBe(false);
    expect(servesLoopbackOnly("http://127.0.0.1:3000", ["(unknown)"])).toBe(false);
  });
});
