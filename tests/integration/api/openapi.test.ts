import "./_env";
import { existsSync } from "node:fs";
import { describe, expect, it } from "vitest";
import * as openapiRoute from "@/app/api/v1/openapi.json/route";
import { call } from "./_helpers";

type Doc = { openapi: string; paths: Record<string, Record<string, { responses: Record<string, unknown> }>>; components: { schemas: Record<string, unknown> } };

/** `/plans/{planId}/versions` → app/api/v1/plans/[planId]/versions/route.ts */
const routeFile = (path: string) => `app/api/v1${path.replace(/\{(\w+)\}/g, "[$1]")}/route.ts`;

describe("OpenAPI 3.1 document", () => {
  it("is served without signing in and names OpenAPI 3.1", async () => {
    const res = await call(openapiRoute.GET, { path: "/api/v1/openapi.json" });
    expect(res.status).toBe(200);
    expect((res.body as Doc).openapi).toBe("3.1.0");
  });

  it("describes only operations that exist: each path has a route file exporting the method", async () => {
    const doc = (await call(openapiRoute.GET, { path: "/api/v1/openapi.json" })).body as Doc;
    const ops = Object.entries(doc.paths).flatMap(([path, methods]) => Object.keys(methods).map((m) => [path, m] as const));
    expect(ops.length).toBeGreaterThan(20);
    for (const [path, method] of ops) {
      const file = routeFile(path);
      expect(existsSync(file), file).toBe(true);
      const mod = (await import(/* @vite-ignore */ `@/${file.replace(/\.ts$/, "")}`)) as Record<string, unknown>;
      expect(typeof mod[method.toUpperCase()], `${method.toUpperCase()} ${path}`).toBe("function");
    }
  });

  it("resolves every schema reference and gives every operation its error responses", async () => {
    const doc = (await call(openapiRoute.GET, { path: "/api/v1/openapi.json" })).body as Doc;
    const refs = [...JSON.stringify(doc).matchAll(/"\$ref":"#\/components\/schemas\/(\w+)"/g)].map((m) => m[1]);
    expect(refs.length).toBeGreaterThan(0);
    for (const name of refs) expect(doc.components.schemas[name], name).toBeDefined();
    for (const methods of Object.values(doc.paths)) for (const op of Object.values(methods)) expect(Object.keys(op.responses).length).toBeGreaterThan(1);
    // The plan document schema comes from the engine's zod schema: its joints carry maxVelocity.
    expect(JSON.stringify(doc.components.schemas.PlanDocument)).toContain("maxVelocity");
  });
});
