/**
 * Documents the product writes itself still parse now that every object refuses unknown keys: the
 * seeded plan versions and arm revisions, a version saved through the API, an arm imported from
 * URDF, and a JSON export from the export route (read without its `export` block, as the CLI and
 * the bench read it). The export with its block is refused by the scratch check, naming `export`.
 */
import "./_env";
import { readFileSync } from "node:fs";
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { db } from "@/db";
import { armRevisions, planVersions } from "@/db/schema";
import { demoPeople, demoPlans } from "@/db/demo";
import * as importRoute from "@/app/api/v1/projects/[projectId]/arms/import/route";
import * as projectsRoute from "@/app/api/v1/projects/route";
import * as plansRoute from "@/app/api/v1/projects/[projectId]/plans/route";
import * as versionsRoute from "@/app/api/v1/plans/[planId]/versions/route";
import * as exportRoute from "@/app/api/v1/plans/[planId]/versions/[version]/export/route";
import * as checkRoute from "@/app/api/v1/check/route";
import { formatProblem, parseArm, parsePlan } from "@/kinematics";
import { planOfExport, verifyExport } from "@/lib/shared/export-format";
import { call, errorOf, gentlePlan, makeUser, tokenFor, type Auth } from "./_helpers";

const linesOf = (r: ReturnType<typeof parsePlan> | ReturnType<typeof parseArm>) =>
  r.ok ? [] : r.problems.map((p) => formatProblem(p));

describe("stored documents parse with the strict schemas", () => {
  it("every seeded plan version parses, and parses back to the stored document", async () => {
    const rows = await db.select({ document: planVersions.document }).from(planVersions);
    const seeded = demoPlans.reduce((n, p) => n + p.versions.length, 0);
    expect(rows.length).toBeGreaterThanOrEqual(seeded);
    for (const row of rows) {
      const parsed = parsePlan(row.document);
      expect(linesOf(parsed)).toEqual([]);
      if (parsed.ok) expect(parsed.value).toEqual(row.document);
    }
  });

  it("every stored arm revision (the built-in arms as seeded) parses as an arm", async () => {
    const rows = await db.select({ description: armRevisions.description }).from(armRevisions);
    expect(rows.length).toBeGreaterThanOrEqual(2);
    for (const row of rows) expect(linesOf(parseArm(row.description))).toEqual([]);
  });
});

describe("documents written through the API parse", () => {
  let auth: Auth;
  let projectId: string;

  beforeAll(async () => {
    const u = await makeUser("researcher", "documents-parse");
    auth = { bearer: await tokenFor(u.id) };
    const p = await call(projectsRoute.POST, {
      method: "POST",
      path: "/api/v1/projects",
      auth,
      body: { name: "Parse" },
    });
    projectId = (p.body as { project: { id: string } }).project.id;
  });

  it("an arm imported from URDF is stored as an arm the strict schema reads, and a plan saved on it parses back", async () => {
    const urdf = readFileSync("kinematics/arm/presets/bench-arm-h.urdf", "utf8");
    const imported = await call(importRoute.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/arms/import?name=Imported%20H`,
      params: { projectId },
      auth,
      rawBody: urdf,
      headers: { "content-type": "application/xml" },
    });
    expect(imported.status, imported.text).toBe(201);
    const armId = (imported.body as { arm: { id: string } }).arm.id;
    const [revision] = await db.select().from(armRevisions).where(eq(armRevisions.armId, armId));
    const arm = parseArm(revision.description);
    expect(linesOf(arm)).toEqual([]);
    if (!arm.ok) return;

    const plan = await call(plansRoute.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/plans`,
      params: { projectId },
      auth,
      body: { name: "On the imported arm", armId },
    });
    expect(plan.status, plan.text).toBe(201);
    const planId = (plan.body as { plan: { id: string } }).plan.id;
    const n = arm.value.joints.length;
    const document = {
      ...gentlePlan(),
      arm: revision.description,
      start: new Array(n).fill(0),
      moves: [{ goal: new Array(n).fill(0.01), duration: 2 }],
    };
    const saved = await call(versionsRoute.POST, {
      method: "POST",
      path: `/api/v1/plans/${planId}/versions`,
      params: { planId },
      auth,
      body: { baseVersion: 0, document },
    });
    expect(saved.status, saved.text).toBe(201);
    const [stored] = await db.select().from(planVersions).where(eq(planVersions.planId, planId));
    const again = parsePlan(stored.document);
    expect(again.ok ? again.value : linesOf(again)).toEqual(stored.document);
  });
});

describe("an export from the export route", () => {
  const researcher = demoPeople.find((p) => p.role === "researcher")!;
  const seededPlan = demoPlans.find((p) => p.authorId === researcher.id)!;
  let auth: Auth;

  beforeAll(async () => {
    auth = { bearer: await tokenFor(researcher.id) };
  });

  it("reads as the stored plan without its export block, and its checksum verifies", async () => {
    const res = await call(exportRoute.GET, {
      path: `/api/v1/plans/${seededPlan.id}/versions/1/export?format=json&rateHz=50`,
      params: { planId: seededPlan.id, version: "1" },
      auth,
    });
    expect(res.status, res.text).toBe(200);
    expect(await verifyExport(res.text)).toMatchObject({ ok: true, format: "json" });
    const exported = JSON.parse(res.text);
    const back = parsePlan(planOfExport(exported));
    const [stored] = await db
      .select()
      .from(planVersions)
      .where(and(eq(planVersions.planId, seededPlan.id), eq(planVersions.number, 1)));
    expect(back.ok ? back.value : linesOf(back)).toEqual(stored.document);
  });

  it("is refused by the scratch check with its block, naming the export field (the plan schema reads plans, not exports)", async () => {
    const res = await call(exportRoute.GET, {
      path: `/api/v1/plans/${seededPlan.id}/versions/1/export?format=json&rateHz=50`,
      params: { planId: seededPlan.id, version: "1" },
      auth,
    });
    const checked = await call(checkRoute.POST, { method: "POST", path: "/api/v1/check", auth, body: res.body });
    expect(checked.status).toBe(400);
    expect(errorOf(checked).issues.map((i) => i.path)).toEqual(["export"]);
  });
});
