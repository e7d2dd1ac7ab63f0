/**
 * Documents that once held the whole server for 10–41 s (8,000 moves of 0.01 s; one 40 s move with a
 * huge viscous friction; a 10⁶ Hz control rate with one 3.5 s move) against a real production server
 * started here with a short check time limit: each gets a bounded answer, and /api/health keeps
 * answering while the check pool works. Timings are measured and printed, not asserted (the machine
 * is shared); the assertions are on status codes, messages and health answering.
 */
import "./_env";
import { spawn, type ChildProcess } from "node:child_process";
import { mkdirSync, openSync, readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeUser, tokenFor } from "./_probe";

const port = Number(process.env.JP_TEST_PORT ?? 3100) + 17;
const base = `http://127.0.0.1:${port}`;
const timeLimitMs = 300;
let server: ChildProcess | undefined;
let token = "";

const heavyArm = JSON.parse(readFileSync("kinematics/arm/presets/bench-arm-h.json", "utf8")) as {
  joints: Record<string, unknown>[];
} & Record<string, unknown>;
const home = heavyArm.joints.map(() => 0);
const away = heavyArm.joints.map((_, i) => (i < 6 ? 0.5 : 0.01));
const plan = (extra: Record<string, unknown>) => ({
  format: "jointproof.plan",
  version: 1,
  arm: heavyArm,
  start: home,
  ...extra,
});

const documents = {
  "8,000 moves of 0.01 s": plan({
    moves: Array.from({ length: 8000 }, (_, i) => ({ goal: i % 2 ? home : away, duration: 0.01, shape: "cubic" })),
  }),
  "one 40 s move with a huge viscous friction": plan({
    arm: { ...heavyArm, joints: heavyArm.joints.map((j) => ({ ...j, friction: { coulomb: 0.3, viscous: 1e9 } })) },
    moves: [{ goal: away, duration: 40, shape: "quintic" }],
  }),
  "a control rate of 10⁶ Hz with one 3.5 s move": plan({
    arm: { ...heavyArm, controlRateHz: 1e6 },
    moves: [{ goal: away, duration: 3.5, shape: "quintic" }],
  }),
};

/** Within the work budget but slow: 400 s of motion at 1 kHz, intruding all along, so every sample is scanned. */
const slowWithinBudget = plan({
  surfaceMargin: 2,
  keepOut: [{ name: "tray", min: [-1, -1, -1], max: [1, 1, 2] }],
  moves: [{ goal: heavyArm.joints.map((_, i) => (i < 6 ? 0.3 : 0.01)), duration: 400, shape: "quintic" }],
});

async function waitForHealth(timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    try {
      if ((await fetch(`${base}/api/health`)).ok) return;
    } catch {
      // not listening yet
    }
    if (server?.exitCode != null)
      throw new Error(`next start exited with ${server.exitCode}; see .data/test/freezing-server.log`);
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`no answer from ${base}/api/health within ${timeoutMs} ms`);
}

/** POSTs a document to /api/v1/check while polling /api/health; the answer, its time and the health latencies. */
async function checkWhilePolling(doc: unknown) {
  const started = performance.now();
  let done = false;
  const pending = fetch(`${base}/api/v1/check`, {
    method: "POST",
    headers: { authorization: `Bearer ${token}`, "content-type": "application/json" },
    body: JSON.stringify(doc),
  }).then(async (res) => {
    const body = (await res.json()) as { error?: { code: string; message: string }; report?: { verdict: string } };
    done = true;
    return { status: res.status, retryAfter: res.headers.get("retry-after"), body, ms: performance.now() - started };
  });
  const health: { status: number; ms: number }[] = [];
  // at least three health requests, the first while the check has just been sent
  while (!done || health.length < 3) {
    const t0 = performance.now();
    const res = await fetch(`${base}/api/health`);
    await res.text();
    health.push({ status: res.status, ms: performance.now() - t0 });
    await new Promise((r) => setTimeout(r, 20));
  }
  return { answer: await pending, health };
}

beforeAll(async () => {
  const user = await makeUser("researcher", "freezing");
  token = await tokenFor(user.id);
  mkdirSync(".data/test", { recursive: true });
  const out = openSync(".data/test/freezing-server.log", "w");
  server = spawn("node_modules/.bin/next", ["start", "-H", "127.0.0.1", "-p", String(port)], {
    env: {
      ...process.env,
      NODE_ENV: "production",
      APP_URL: base,
      NEXTAUTH_URL: base,
      JP_CHECK_TIME_LIMIT_MS: String(timeLimitMs),
    },
    stdio: ["ignore", out, out],
  });
  await waitForHealth(60_000);
  // one small check first, so the pool and its worker bundle are ready
  const warm = await checkWhilePolling(plan({ moves: [{ goal: away, duration: 2, shape: "quintic" }] }));
  expect(warm.answer.status).toBe(200);
});

afterAll(async () => {
  if (!server || server.exitCode != null) return;
  const exited = new Promise((r) => server!.once("exit", r));
  server.kill("SIGTERM");
  await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
  if (server.exitCode == null) server.kill("SIGKILL");
});

describe("documents that froze the server get a bounded answer while health keeps answering", () => {
  for (const [name, doc] of Object.entries(documents)) {
    it(`${name}: 422 over the work budget or 503 past the time limit (or the whole report), and health answers meanwhile`, async () => {
      const { answer, health } = await checkWhilePolling(doc);
      const worstHealthMs = Math.max(...health.map((h) => h.ms));
      console.log(
        `[freezing] ${name}: ${answer.status} in ${answer.ms.toFixed(0)} ms; health ×${health.length}, worst ${worstHealthMs.toFixed(1)} ms`,
      );
      expect([200, 422, 503]).toContain(answer.status);
      if (answer.status === 422) {
        expect(answer.body.error?.code).toBe("unprocessable:check-budget");
        expect(answer.body.error?.message).toMatch(/units of check work \(path points × joints/);
      }
      if (answer.status === 503) expect(Number(answer.retryAfter)).toBeGreaterThan(0);
      // a whole report, never a partial one: with the arm model it names every check's verdict
      if (answer.status === 200) expect(answer.body.report?.verdict).toMatch(/^(pass|caution|fault)$/);
      expect(health.every((h) => h.status === 200)).toBe(true);
    });
  }

  it("the first two documents over the budget are refused up front with 422", async () => {
    const many = await checkWhilePolling(documents["8,000 moves of 0.01 s"]);
    const rate = await checkWhilePolling(documents["a control rate of 10⁶ Hz with one 3.5 s move"]);
    expect([many.answer.status, rate.answer.status]).toEqual([422, 422]);
  });

  it("a check within the budget that runs past the time limit is stopped: 503 with Retry-After and a message saying nothing was checked", async () => {
    const { answer, health } = await checkWhilePolling(slowWithinBudget);
    console.log(
      `[freezing] slow plan within budget: ${answer.status} in ${answer.ms.toFixed(0)} ms; health worst ${Math.max(...health.map((h) => h.ms)).toFixed(1)} ms over ${health.length}`,
    );
    expect(answer.status).toBe(503);
    expect(answer.body.error?.code).toBe("unavailable:check-time-limit");
    expect(answer.body.error?.message).toMatch(/stopped; nothing was checked/);
    expect(Number(answer.retryAfter)).toBeGreaterThan(0);
    expect(health.every((h) => h.status === 200)).toBe(true);
    // the pool recovers: the next small check passes through
    const after = await checkWhilePolling(plan({ moves: [{ goal: away, duration: 2, shape: "quintic" }] }));
    expect(after.answer.status).toBe(200);
  });
});
