/**
 * Engine figures in Chromium: bundles bench/browser/engine-bench.ts with esbuild into bench/tmp/
 * (a static script the app never serves), loads it into a blank page of Debian's Chromium (launched
 * as the browser tests launch it, tests/e2e/browser.ts) and returns the figures it measured.
 */
import { join } from "node:path";
import { build } from "esbuild";
import { openBrowser } from "../tests/e2e/browser";
import type { EngineFigures } from "./plans";

export async function chromiumEngineFigures(here: string): Promise<EngineFigures & { browser: string }> {
  const outfile = join(here, "tmp", "engine-bench.js");
  await build({
    entryPoints: [join(here, "browser", "engine-bench.ts")],
    outfile,
    bundle: true,
    platform: "browser",
    format: "iife",
    target: "es2022",
    tsconfig: join(here, "..", "tsconfig.json"),
    logLevel: "silent",
  });
  const session = await openBrowser();
  try {
    const { page, browser } = session;
    await page.setContent("<!doctype html><title>engine bench</title><body>engine bench</body>");
    await page.addScriptTag({ path: outfile });
    await page.waitForFunction(() => window.jointproofBench?.figures || window.jointproofBench?.error, null, {
      timeout: 600_000,
    });
    const result = await page.evaluate(() => window.jointproofBench);
    if (!result?.figures) throw new Error(`the browser engine bench failed: ${result?.error ?? "no result"}`);
    return { ...result.figures, browser: `Chromium ${browser.version()}` };
  } finally {
    await session.close();
  }
}
