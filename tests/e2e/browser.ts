// Launches Debian's Chromium through playwright-core with the flags that work on these
// machines (software WebGL through SwiftShader; no background networking), and a throw-away
// profile and HOME so nothing is written to the real home folder.
import { mkdtempSync, mkdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";

export const baseUrl = process.env.JP_TEST_BASE_URL ?? `http://127.0.0.1:${process.env.JP_TEST_PORT ?? 3100}`;
export const screenshotDir = join(process.cwd(), ".data", "test", "screenshots");

export interface BrowserSession {
  browser: Browser;
  context: BrowserContext;
  page: Page;
  /** Console errors and page errors seen so far. */
  errors: string[];
  close(): Promise<void>;
}

export async function openBrowser(): Promise<BrowserSession> {
  const home = mkdtempSync(join(tmpdir(), "jp-chromium-"));
  for (const d of ["config", "cache", "data"]) mkdirSync(join(home, d));
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    headless: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
    env: {
      ...process.env,
      HOME: home,
      XDG_CONFIG_HOME: join(home, "config"),
      XDG_CACHE_HOME: join(home, "cache"),
      XDG_DATA_HOME: join(home, "data"),
    },
  });
  const context = await browser.newContext({
    baseURL: baseUrl,
    viewport: { width: 1280, height: 800 },
    acceptDownloads: true,
  });
  const page = await context.newPage();
  const errors: string[] = [];
  page.on("console", (msg) => {
    if (msg.type() === "error") errors.push(msg.text());
  });
  page.on("pageerror", (err) => errors.push(err.message));
  mkdirSync(screenshotDir, { recursive: true });
  return {
    browser,
    context,
    page,
    errors,
    async close() {
      await browser.close();
      rmSync(home, { recursive: true, force: true });
    },
  };
}
