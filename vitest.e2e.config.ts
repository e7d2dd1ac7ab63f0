import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

// Browser tests and security probes: the production server (started once by tests/e2e/server.ts),
// driven through playwright-core in Debian's Chromium or plain HTTP. Files run one at a time.
export default defineConfig({
  resolve: {
    alias: {
      "@": fileURLToPath(new URL("./", import.meta.url)),
      // The security probes set up their users and read row counts through db/queries (server-only modules).
      "server-only": fileURLToPath(new URL("./node_modules/server-only/empty.js", import.meta.url)),
    },
  },
  test: {
    // Browser tests, then the security probes (tests/security) against the same running server.
    include: ["tests/e2e/**/*.e2e.ts", "tests/security/**/*.probe.ts"],
    environment: "node",
    globalSetup: ["tests/e2e/server.ts"],
    testTimeout: 90_000,
    hookTimeout: 90_000,
    fileParallelism: false,
  },
});
