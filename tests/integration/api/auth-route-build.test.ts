/**
 * `next build` imports every route module without the server's environment. The next-auth route
 * must therefore build its options on the first request, not at import. (Its requests need Next's
 * request scope for cookies(); the sign-in flow itself is tested through next-auth's core handler
 * in sign-in-flow.test.ts with the same options.)
 */
import "./_env";
import { describe, expect, it } from "vitest";

describe("the next-auth route at build time", () => {
  it("imports without DATABASE_URL, although the environment is invalid without it", async () => {
    const saved = process.env.DATABASE_URL;
    delete process.env.DATABASE_URL;
    try {
      const route = await import("@/app/api/auth/[...nextauth]/route");
      expect(typeof route.GET).toBe("function");
      expect(typeof route.POST).toBe("function");
      // The precondition is real: anything that reads the environment at import would have failed here.
      const { env } = await import("@/lib/server/env");
      expect(() => env()).toThrow(/DATABASE_URL/);
    } finally {
      process.env.DATABASE_URL = saved;
    }
  });
});
