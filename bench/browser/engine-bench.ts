/**
 * The browser side of the engine benchmark: bundled by bench/chromium.ts (esbuild) into a static
 * script under bench/tmp/ that only the benchmark loads (never served by the app), it runs the same
 * figures as Node (bench/engine-figures.ts) in Chromium and leaves them on `window`.
 */
import { measureEngine } from "../engine-figures";
import type { EngineFigures } from "../plans";

declare global {
  interface Window {
    jointproofBench?: { figures?: EngineFigures; error?: string };
  }
}

window.jointproofBench = {};
try {
  window.jointproofBench.figures = measureEngine();
} catch (err) {
  window.jointproofBench.error = err instanceof Error ? `${err.message}\n${err.stack}` : String(err);
}
