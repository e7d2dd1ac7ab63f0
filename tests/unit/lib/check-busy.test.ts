/**
 * A full check pool answers "busy" (503) at once, both from the pool and from the HTTP server's
 * early answer (lib/server/busy-early.ts, which instrumentation.ts calls before the framework), and a
 * refused check leaves nothing armed behind it: tinypool 2.2 throws from a refused task's abort
 * listener when its time limit passes, which in the server is an uncaught exception.
 *
 * One checker thread and a 300 ms time limit, set before the pool module is loaded.
 */
import { once } from "node:events";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

process.env.JP_CHECK_THREADS = "1";
process.env.JP_CHECK_TIME_LIMIT_MS = "300";
const { closeCheckPool, runDocumentCheck } = await import("@/lib/server/check-pool");
const { checkersFull } = await import("@/lib/server/check-capacity");
const { answerBusyEarly } = await import("@/lib/server/busy-early");
const { AppError } = await import("@/lib/server/errors");

const heavyArm = JSON.parse(readFileSync("kinematics/arm/presets/bench-arm-h.json", "utf8")) as {
  joints: unknown[];
};
/** Within the work budget but far slower than 300 ms: 400 s at 1 kHz through a keep-out box. */
const slow = new TextEncoder().encode(
  JSON.stringify({
    format: "jointproof.plan",
    version: 1,
    arm: heavyArm,
    start: heavyArm.joints.map(() => 0),
    surfaceMargin: 2,
    keepOut: [{ name: "tray", min: [-1, -1, -1], max: [1, 1, 2] }],
    moves: [{ goal: heavyArm.joints.map((_, i) => (i < 6 ? 0.3 : 0.01)), duration: 400, shape: "quintic" }],
  }),
);

/** A stand-in for the framework behind the early answer, as instrumentation.ts wires it. */
let server: Server;
let base = "";
beforeAll(async () => {
  server = createServer((req, res) => {
    if (!answerBusyEarly(req, res)) res.end("framework");
  });
  server.listen(0, "127.0.0.1");
  await once(server, "listening");
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  server.close();
  await closeCheckPool();
});

const codeOf = (r: PromiseSettledResult<unknown>) =>
  r.status === "rejected" && r.reason instanceof AppError ? r.reason.code : r.status;

describe("a full check pool", () => {
  it("answers busy at once, early and from the pool alike, and leaves no timer behind", async () => {
    const uncaught: unknown[] = [];
    const onUncaught = (err: unknown) => uncaught.push(err);
    process.on("uncaughtException", onUncaught);
    try {
      expect(checkersFull()).toBe(false);
      // before the pool is full, the early answer lets every request through to the framework
      expect(await (await fetch(`${base}/api/v1/check`, { method: "POST", body: "{}" })).text()).toBe("framework");

      // one thread: one check runs, eight wait, the tenth is refused
      const checks = Array.from({ length: 10 }, () => runDocumentCheck(slow));
      const settled = Promise.allSettled(checks);
      const tenth = await Promise.allSettled([checks[9]]);
      expect(codeOf(tenth[0])).toBe("unavailable:check-busy");
      expect(checkersFull()).toBe(true);

      const early = await fetch(`${base}/api/v1/check?x=1`, { method: "POST", body: "x".repeat(100_000) });
      expect(early.status).toBe(503);
      expect(early.headers.get("retry-after")).toBe("5");
      expect(early.headers.get("x-request-id")).toMatch(/^[0-9a-f-]{36}$/);
      expect(early.headers.get("x-content-type-options")).toBe("nosniff");
      const body = (await early.json()) as { error: { code: string; message: string; requestId: string } };
      expect(body.error.code).toBe("unavailable:check-busy");
      expect(body.error.message).toMatch(/nothing was checked or saved/);
      expect(body.error.requestId).toBe(early.headers.get("x-request-id"));
      // other methods and other paths still reach the framework
      expect(await (await fetch(`${base}/api/v1/check`)).text()).toBe("framework");
      expect(await (await fetch(`${base}/api/v1/checks`, { method: "POST", body: "{}" })).text()).toBe("framework");

      const results = await settled;
      expect(results.slice(0, 9).map(codeOf)).toEqual(Array(9).fill("unavailable:check-time-limit"));
      expect(checkersFull()).toBe(false);
      // the refused check's time limit has passed too; wait past it once more
      await new Promise((resolve) => setTimeout(resolve, 400));
      expect(uncaught).toEqual([]);
      expect(await (await fetch(`${base}/api/v1/check`, { method: "POST", body: "{}" })).text()).toBe("framework");
    } finally {
      process.off("uncaughtException", onUncaught);
    }
  });
});
