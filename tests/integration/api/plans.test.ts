import "./_env";
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { planVersions } from "@/db/schema";
import * as projectsRoute from "@/app/api/v1/projects/route";
import * as plansRoute from "@/app/api/v1/projects/[projectId]/plans/route";
import * as versionsRoute from "@/app/api/v1/plans/[planId]/versions/route";
import * as versionRoute from "@/app/api/v1/plans/[planId]/versions/[version]/route";
import * as exportRoute from "@/app/api/v1/plans/[planId]/versions/[version]/export/route";
import * as diffRoute from "@/app/api/v1/plans/[planId]/diff/route";
import * as checkRoute from "@/app/api/v1/check/route";
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { verifyExport } from "@/lib/shared/export-format";
import { call, demoArm, errorOf, gentlePlan, jumpPlan, makeUser, tokenFor, type Auth } from "./_helpers";

let auth: Auth;
let planId: string;

beforeAll(async () => {
  const user = await makeUser("researcher");
  auth = { bearer: await tokenFor(user.id) };
  const project = await call(projectsRoute.POST, {
    method: "POST",
    path: "/api/v1/projects",
    auth,
    body: { name: "Duration sweep", kind: "research" },
  });
  expect(project.status).toBe(201);
  const projectId = (project.body as { project: { id: string } }).project.id;
  const plan = await call(plansRoute.POST, {
    method: "POST",
    path: `/api/v1/projects/${projectId}/plans`,
    params: { projectId },
    auth,
    body: { name: "Pick approach", armId: demoArm.id },
  });
  expect(plan.status).toBe(201);
  planId = (plan.body as { plan: { id: string } }).plan.id;
});

function saveVersion(baseVersion: number, document: unknown) {
  return call(versionsRoute.POST, {
    method: "POST",
    path: `/api/v1/plans/${planId}/versions`,
    params: { planId },
    auth,
    body: { baseVersion, document },
  });
}

describe("plan versions", () => {
  it("stores the engine's verdict with each saved version, checked on the server", async () => {
    const first = await saveVersion(0, gentlePlan());
    expect(first.status).toBe(201);
    expect((first.body as { version: { number: number; verdict: string } }).version).toMatchObject({
      number: 1,
      verdict: "pass",
    });
    const second = await saveVersion(1, jumpPlan());
    expect(second.status).toBe(201);
    const body = second.body as {
      version: { number: number; verdict: string };
      report: { findings: { kind: string }[] };
    };
    expect(body.version).toMatchObject({ number: 2, verdict: "fault" });
    expect(body.report.findings.map((f) => f.kind)).toContain("jump");
    const rows = await db.select().from(planVersions).where(eq(planVersions.planId, planId));
    expect(rows.map((r) => [r.number, r.verdict]).sort()).toEqual([
      [1, "pass"],
      [2, "fault"],
    ]);
  });

  it("answers 409 when a save is based on a version that is no longer the newest, and writes nothing", async () => {
    const before = await db.$count(planVersions, eq(planVersions.planId, planId));
    const stale = await saveVersion(1, gentlePlan());
    expect(stale.status).toBe(409);
    expect(errorOf(stale).code).toBe("conflict:version");
    expect((stale.body as { error: { latestVersion: number } }).error.latestVersion).toBe(before);
    expect(await db.$count(planVersions, eq(planVersions.planId, planId))).toBe(before);
  });

  it("lets exactly one of two concurrent saves on the same base version win", async () => {
    const base = await db.$count(planVersions, eq(planVersions.planId, planId));
    const results = await Promise.all([saveVersion(base, gentlePlan()), saveVersion(base, gentlePlan())]);
    expect(results.map((r) => r.status).sort()).toEqual([201, 409]);
    expect(await db.$count(planVersions, eq(planVersions.planId, planId))).toBe(base + 1);
  });

  it("refuses a document whose arm differs from the plan's arm revision (422 naming document.arm)", async () => {
    const doc = gentlePlan();
    doc.arm = { ...demoArm.description, controlRateHz: 500 };
    const res = await saveVersion(await db.$count(planVersions, eq(planVersions.planId, planId)), doc);
    expect(res.status).toBe(422);
    expect(errorOf(res).issues[0].path).toBe("document.arm");
  });

  it("reads a document the way the command line does: a Cartesian target becomes a joint goal, an unreachable one is refused at its path", async () => {
    const base = await db.$count(planVersions, eq(planVersions.planId, planId));
    const withTarget = {
      ...gentlePlan(),
      start: [0, 0.3, 0.5, 0.2, 0, 0, 0.01],
      moves: [{ target: { position: [0.3, 0, 0.3] }, duration: 2 }],
    };
    const saved = await saveVersion(base, withTarget);
    expect(saved.status, saved.text).toBe(201);
    const number = (saved.body as { version: { number: number } }).version.number;
    const [row] = await db
      .select()
      .from(planVersions)
      .where(eq(planVersions.planId, planId))
      .orderBy(planVersions.number)
      .offset(number - 1);
    const goal = (row.document as { moves: { goal: number[] }[] }).moves[0].goal;
    expect(goal).toHaveLength(7);
    expect(goal[6]).toBe(0.01); // the gripper is outside the chain and keeps its value
    const unreachable = await saveVersion(number, {
      ...withTarget,
      moves: [{ target: { position: [5, 5, 5] }, duration: 2 }],
    });
    expect(unreachable.status).toBe(400);
    expect(errorOf(unreachable).issues.map((i) => i.path)).toContain("document.moves[0].target");
  });

  it("returns a version's document and the arm revision it was checked against", async () => {
    const res = await call(versionRoute.GET, {
      path: `/api/v1/plans/${planId}/versions/2`,
      params: { planId, version: "2" },
      auth,
    });
    expect(res.status).toBe(200);
    const v = (res.body as { version: { document: { moves: unknown[] }; armRevision: number; verdict: string } })
      .version;
    expect(v.verdict).toBe("fault");
    expect(v.armRevision).toBeGreaterThanOrEqual(1);
    expect(v.document.moves).toEqual((jumpPlan().moves as object[]).map((m) => ({ shape: "quintic", ...m })));
  });

  it("diffs two versions field by field", async () => {
    const res = await call(diffRoute.GET, {
      path: `/api/v1/plans/${planId}/diff?from=1&to=2`,
      params: { planId },
      auth,
    });
    expect(res.status).toBe(200);
    const body = res.body as {
      from: { verdict: string };
      to: { verdict: string };
      changes: { path: string; from: unknown; to: unknown }[];
    };
    expect([body.from.verdict, body.to.verdict]).toEqual(["pass", "fault"]);
    expect(body.changes).toContainEqual({ path: "moves[0].duration", change: "changed", from: 2, to: 0 });
    expect(body.changes).toContainEqual({ path: "moves[0].goal[0]", change: "changed", from: 0.3, to: 1.2 });
    expect(body.changes.some((c) => c.path.startsWith("arm"))).toBe(false);
  });
});

describe("exports", () => {
  it("exports JSON whose SHA-256 verifies, with the waypoints at the chosen rate and the stored verdict", async () => {
    const res = await call(exportRoute.GET, {
      path: `/api/v1/plans/${planId}/versions/1/export?format=json&rateHz=50`,
      params: { planId, version: "1" },
      auth,
    });
    expect(res.status).toBe(200);
    expect((await verifyExport(res.text)).ok).toBe(true);
    const body = res.body as { export: { rateHz: number; waypoints: number[][]; report: { verdict: string } } };
    expect(body.export.rateHz).toBe(50);
    expect(body.export.report.verdict).toBe("pass");
    // 2 s at 50 Hz: samples at 0, 0.02, …, 2.0 → 101 rows of t plus 7 joints.
    expect(body.export.waypoints).toHaveLength(101);
    expect(body.export.waypoints[100][0]).toBeCloseTo(2, 12);
    expect(body.export.waypoints[100][1]).toBeCloseTo(0.3, 12);
    const tampered = res.text.replace('"duration":2', '"duration":3');
    expect(tampered).not.toBe(res.text);
    expect((await verifyExport(tampered)).ok).toBe(false);
  });

  it("exports CSV with a header per joint and a checksum line that detects any edit", async () => {
    const res = await call(exportRoute.GET, {
      path: `/api/v1/plans/${planId}/versions/2/export?format=csv`,
      params: { planId, version: "2" },
      auth,
    });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(res.headers.get("x-jointproof-verdict")).toBe("fault");
    expect((await verifyExport(res.text)).ok).toBe(true);
    expect(res.text).toContain(`t,${demoArm.description.joints.map((j) => j.name).join(",")}\n`);
    expect(res.text).toMatch(/# verdict: fault/);
    expect((await verifyExport(res.text.replace("\n0,", "\n0.001,"))).ok).toBe(false);
  });

  it("refuses an export that would hold too many waypoints (422 naming query.rateHz) and a rate that is not a number (400)", async () => {
    const long = gentlePlan();
    long.moves = [{ goal: [0.3, -0.2, 0.4, 0.1, 0, 0.2, 0.01], duration: 100, shape: "quintic" }];
    const saved = await saveVersion(await db.$count(planVersions, eq(planVersions.planId, planId)), long);
    expect(saved.status).toBe(201);
    const number = String((saved.body as { version: { number: number } }).version.number);
    // 100 s × 10 kHz × 8 columns = 8 million values, over the 5 million limit; 100 s × 100 Hz is fine.
    const tooMany = await call(exportRoute.GET, {
      path: `/api/v1/plans/${planId}/versions/${number}/export?rateHz=10000`,
      params: { planId, version: number },
      auth,
    });
    expect(tooMany.status).toBe(422);
    expect(errorOf(tooMany).issues[0].path).toBe("query.rateHz");
    const fine = await call(exportRoute.GET, {
      path: `/api/v1/plans/${planId}/versions/${number}/export?format=csv&rateHz=100`,
      params: { planId, version: number },
      auth,
    });
    expect(fine.status).toBe(200);
    const bad = await call(exportRoute.GET, {
      path: `/api/v1/plans/${planId}/versions/1/export?rateHz=abc`,
      params: { planId, version: "1" },
      auth,
    });
    expect(bad.status).toBe(400);
    expect(errorOf(bad).issues[0].path).toBe("query.rateHz");
  });
});

describe("export and the command-line checker", () => {
  it.each([
    ["1", "pass", 0],
    ["2", "fault", 1],
  ])(
    "bin/jointproof check reads export of version %s as a plan and finds the stored verdict (%s)",
    async (number, verdict, exitCode) => {
      const res = await call(exportRoute.GET, {
        path: `/api/v1/plans/${planId}/versions/${number}/export?rateHz=20`,
        params: { planId, version: number },
        auth,
      });
      expect((await verifyExport(res.text)).ok).toBe(true);
      const dir = mkdtempSync(join(tmpdir(), "jp-export-"));
      try {
        const file = join(dir, "export.json");
        writeFileSync(file, res.text);
        const run = spawnSync(process.execPath, ["bin/jointproof", "check", "--json", file], {
          encoding: "utf8",
          timeout: 60_000,
        });
        expect(run.status, run.stderr).toBe(exitCode);
        expect((JSON.parse(run.stdout) as { verdict: string }).verdict).toBe(verdict);
        expect((res.body as { export: { report: { verdict: string } } }).export.report.verdict).toBe(verdict);
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    },
  );
});

describe("stateless check", () => {
  it("returns the report of a plan document and stores nothing", async () => {
    const before = await db.$count(planVersions);
    const res = await call(checkRoute.POST, { method: "POST", path: "/api/v1/check", auth, body: jumpPlan() });
    expect(res.status).toBe(200);
    expect((res.body as { report: { verdict: string } }).report.verdict).toBe("fault");
    expect(await db.$count(planVersions)).toBe(before);
  });
});

describe("immutability in the database", () => {
  it("refuses to edit a saved plan version or arm revision, whoever asks", async () => {
    const { armRevisions } = await import("@/db/schema");
    await expect(
      db.update(planVersions).set({ note: "edited" }).where(eq(planVersions.planId, planId)),
    ).rejects.toThrow();
    await expect(
      db.update(armRevisions).set({ note: "edited" }).where(eq(armRevisions.armId, demoArm.id)),
    ).rejects.toThrow();
    const rows = await db.select().from(planVersions).where(eq(planVersions.planId, planId));
    expect(rows.some((r) => r.note === "edited")).toBe(false);
  });
});
