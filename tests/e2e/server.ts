// Vitest global set-up for the browser tests: starts `next start` on JP_TEST_PORT against the
// test database, waits for /api/health, and stops the server (by its own process ID) afterwards.
import { spawn, type ChildProcess } from "node:child_process";
import { mkdirSync, openSync } from "node:fs";

const port = Number(process.env.JP_TEST_PORT ?? 3100);
const baseUrl = `http://127.0.0.1:${port}`;
let server: ChildProcess | undefined;

async function waitForHealth(timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    if (server?.exitCode != null)
      throw new Error(`next start exited with code ${server.exitCode}; see .data/test/server.log`);
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`the server did not answer ${baseUrl}/api/health within ${timeoutMs} ms`);
}

export async function setup(): Promise<void> {
  mkdirSync(".data/test", { recursive: true });
  const out = openSync(".data/test/server.log", "w");
  server = spawn("node_modules/.bin/next", ["start", "-H", "127.0.0.1", "-p", String(port)], {
    env: { ...process.env, NODE_ENV: "production", APP_URL: baseUrl, NEXTAUTH_URL: baseUrl },
    stdio: ["ignore", out, out],
  });
  process.env.JP_TEST_BASE_URL = baseUrl;
  await waitForHealth(60_000);
}

export async function teardown(): Promise<void> {
  if (!server || server.exitCode != null) return;
  const exited = new Promise((r) => server!.once("exit", r));
  server.kill("SIGTERM");
  await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
  if (server.exitCode == null) server.kill("SIGKILL");
}
