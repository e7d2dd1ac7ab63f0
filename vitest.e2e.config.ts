import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

// Browser tests: the production server (started once by tests/e2e/server.ts) driven
// through playwright-core in Debian's Chromium. Files run one at a time.
export default defineConfig({
  resolve: { alias: { "@": fileURLToPath(new URL("./", import.meta.url)) } },
  test: {
    include: ["tests/e2e/**/*.e2e.ts"],
    environment: "node",
    globalSetup: ["tests/e2e/server.ts"],
    testTimeout: 90_000,
    hookTimeout: 90_000,
    fileParallelism: false,
  },
});
