// Adds up the Vitest JSON reports given as arguments and prints one closing line,
// "tests: N passed, N failed", so the whole run has a single count.
import { existsSync, readFileSync } from "node:fs";

let passed = 0;
let failed = 0;
let skipped = 0;
for (const file of process.argv.slice(2)) {
  if (!existsSync(file)) continue;
  const report = JSON.parse(readFileSync(file, "utf8"));
  passed += report.numPassedTests ?? 0;
  failed += (report.numFailedTests ?? 0) + (report.numRuntimeErrorTestSuites ?? 0);
  skipped += (report.numPendingTests ?? 0) + (report.numTodoTests ?? 0);
}
console.log(`tests: ${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ""}`);
