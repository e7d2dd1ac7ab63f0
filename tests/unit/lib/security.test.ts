import { describe, expect, it } from "vitest";
import nextConfig from "@/next.config";
import { contentSecurityPolicy } from "@/lib/server/security-headers";

function directives(csp: string): Map<string, string[]> {
  return new Map(
    csp
      .split(";")
      .map((d) => d.trim().split(/\s+/))
      .map(([name, ...values]) => [name, values]),
  );
}

describe("security headers", () => {
  it("forbid framing, keep referrers on this site and stop content sniffing on every path, static files included", async () => {
    const rules = (await nextConfig.headers?.()) ?? [];
    const all = rules.find((r) => r.source === "/:path*");
    const headers = new Map((all?.headers ?? []).map((h) => [h.key.toLowerCase(), h.value]));
    const csp = directives(headers.get("content-security-policy") ?? "");
    expect(csp.get("frame-ancestors")).toEqual(["'none'"]);
    expect(headers.get("x-frame-options")).toBe("DENY");
    expect(headers.get("referrer-policy")).toBe("same-origin");
    expect(headers.get("x-content-type-options")).toBe("nosniff");
  });

  it("let the 3D viewer run (blob: workers and textures) while loading nothing from other origins", () => {
    const csp = directives(contentSecurityPolicy(false));
    expect(csp.get("default-src")).toEqual(["'self'"]);
    expect(csp.get("worker-src")).toContain("blob:");
    expect(csp.get("img-src")).toEqual(expect.arrayContaining(["blob:", "data:"]));
    expect(csp.get("object-src")).toEqual(["'none'"]);
    for (const [, values] of csp) for (const v of values) expect(v).not.toMatch(/^https?:/);
  });

  it("allow eval only in development", () => {
    expect(directives(contentSecurityPolicy(false)).get("script-src")).not.toContain("'unsafe-eval'");
    expect(directives(contentSecurityPolicy(true)).get("script-src")).toContain("'unsafe-eval'");
  });
});
