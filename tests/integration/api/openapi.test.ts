import "./_env";
import { existsSync, readdirSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import * as openapiRoute from "@/app/api/v1/openapi.json/route";
import { call } from "./_helpers";

type Doc = {
  openapi: string;
  paths: Record<string, Record<string, { responses: Record<string, unknown> }>>;
  components: { schemas: Record<string, unknown> };
};

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
    const ops = Object.entries(doc.paths).flatMap(([path, methods]) =>
      Object.keys(methods).map((m) => [path, m] as const),
    );
    expect(ops.length).toBeGreaterThan(20);
    for (const [path, method] of ops) {
      const file = routeFile(path);
      expect(existsSync(file), file).toBe(true);
      const mod = (await import(/* @vite-ignore */ `@/${file.replace(/\.ts$/, "")}`)) as Record<string, unknown>;
      expect(typeof mod[method.toUpperCase()], `${method.toUpperCase()} ${path}`).toBe("function");
    }
  });

  it("documents every route file under app/api/v1 and every method it exports", async () => {
    const doc = (await call(openapiRoute.GET, { path: "/api/v1/openapi.json" })).body as Doc;
    const files = readdirSync("app/api/v1", { recursive: true, encoding: "utf8" }).filter(
      (f) => path.basename(f) === "route.ts",
    );
    expect(files.length).toBeGreaterThan(30);
    const missing: string[] = [];
    for (const file of files) {
      const dir = path.dirname(file).split(path.sep).join("/");
      if (dir === "openapi.json") continue; // the document itself
      const apiPath = `/${dir}`.replace(/\[(\w+)\]/g, "{$1}");
      const mod = (await import(/* @vite-ignore */ `@/app/api/v1/${dir}/route`)) as Record<string, unknown>;
      for (const method of ["GET", "POST", "PATCH", "PUT", "DELETE"]) {
        if (typeof mod[method] === "function" && !doc.paths[apiPath]?.[method.toLowerCase()])
          missing.push(`${method} ${apiPath}`);
      }
    }
    expect(missing).toEqual([]);
  });

  it("takes the course, review and account bodies from the zod schemas the handlers use", async () => {
    const doc = (await call(openapiRoute.GET, { path: "/api/v1/openapi.json" })).body as Doc & {
      paths: Record<string, Record<string, { requestBody?: unknown }>>;
    };
    const bodyRef = (p: string) => JSON.stringify(doc.paths[p]?.post?.requestBody ?? null);
    expect(bodyRef("/courses/{courseId}/assignments")).toContain("#/components/schemas/CreateAssignment");
    expect(bodyRef("/reviews/{submissionId}/decision")).toContain("#/components/schemas/Decision");
    expect(bodyRef("/accounts/password-reset/confirm")).toContain("#/components/schemas/PasswordResetConfirm");
    const schemas = doc.components.schemas as Record<
      string,
      { properties?: Record<string, unknown>; required?: string[] }
    >;
    expect(schemas.CreateAssignment.required).toEqual(
      expect.arrayContaining(["title", "dueAt", "requiredArmRevisionId"]),
    );
    expect(Object.keys(schemas.CreateCourse.properties ?? {})).toEqual(
      expect.arrayContaining(["title", "term", "limits"]),
    );
    expect(JSON.stringify(schemas.Decision)).toContain("approved");
    expect(schemas.PasswordResetConfirm.required).toEqual(expect.arrayContaining(["token", "password"]));
  });

  it("resolves every schema reference and gives every operation its error responses", async () => {
    const doc = (await call(openapiRoute.GET, { path: "/api/v1/openapi.json" })).body as Doc;
    const refs = [...JSON.stringify(doc).matchAll(/"\$ref":"#\/components\/schemas\/(\w+)"/g)].map((m) => m[1]);
    expect(refs.length).toBeGreaterThan(0);
    for (const name of refs) expect(doc.components.schemas[name], name).toBeDefined();
    for (const methods of Object.values(doc.paths))
      for (const op of Object.values(methods)) expect(Object.keys(op.responses).length).toBeGreaterThan(1);
    // The plan document schema comes from the engine's zod schema: its joints carry maxVelocity.
    expect(JSON.stringify(doc.components.schemas.PlanDocument)).toContain("maxVelocity");
  });
});
