import { describe, expect, it } from "vitest";
import { NextRequest } from "next/server";
import { proxy } from "@/proxy";
import { contentSecurityPolicy } from "@/lib/server/security";

function directives(csp: string): Map<string, string[]> {
  return new Map(csp.split(";").map((d) => d.trim().split(/\s+/)).map(([name, ...values]) => [name, values]));
}

describe("security headers", () => {
  it("forbid framing, keep referrers on this site and stop content sniffing on every proxied response", () => {
    const res = proxy(new NextRequest("http://127.0.0.1:3000/projects"));
    const csp = directives(res.headers.get("content-security-policy") ?? "");
    expect(csp.get("frame-ancestors")).toEqual(["'none'"]);
    expect(res.headers.get("x-frame-options")).toBe("DENY");
    expect(res.headers.get("referrer-policy")).toBe("same-origin");
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
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
