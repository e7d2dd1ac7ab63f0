import { defineConfig } from "vitest/config";
import unitConfig from "./vitest.config";

// Browser tests and security probes: the production server (started once by tests/e2e/server.ts),
// driven through playwright-core in Debian's Chromium or plain HTTP. Files run one at a time.
// The same aliases as the unit tests: the probes set up users and read row counts through db/queries.
export default defineConfig({
  resolve: unitConfig.resolve,
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
