/**
 * A write and its audit entry commit together or not at all (issue "Hardening", defect 3: a rename
 * was committed while its audit entry failed). A trigger in the test database refuses every audit
 * entry of one probe user, so the audit insert fails inside the real server; each write route that
 * user calls must then leave its tables exactly as they were. Other users' entries are untouched.
 */
import "./_env";
import { randomUUID } from "node:crypto";
import { eq, sql } from "drizzle-orm";
import type { PgTable } from "drizzle-orm/pg-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "@/db";
import { arms, courses, planVersions, plans, projectMembers, projects, recordings } from "@/db/schema";
import { demoArm, gentlePlan, http, makeUser, rows, sessionCookieFor, type Auth, type TestUser } from "./_probe";

const trigger = `jp_probe_audit_${randomUUID().replace(/-/g, "").slice(0, 12)}`;
let researcher: TestUser;
let instructor: TestUser;
let auth: Auth;
let instructorAuth: Auth;
let projectId = "";
let planId = "";
let spareEmail = "";

beforeAll(async () => {
  researcher = await makeUser("researcher", "audit-fail");
  instructor = await makeUser("instructor", "audit-fail");
  spareEmail = (await makeUser("researcher", "audit-spare")).email;
  auth = { cookie: await sessionCookieFor(researcher.id) };
  instructorAuth = { cookie: await sessionCookieFor(instructor.id) };
  // set up while audit entries still work
  const p = await http("/api/v1/projects", { auth, json: { name: "Audit probe" } });
  projectId = (p.body as { project: { id: string } }).project.id;
  const plan = await http(`/api/v1/projects/${projectId}/plans`, {
    auth,
    json: { name: "Audit probe plan", armId: demoArm.id },
  });
  planId = (plan.body as { plan: { id: string } }).plan.id;
  const actors = `'${researcher.id}', '${instructor.id}'`;
  await db.execute(
    sql.raw(`create function ${trigger}() returns trigger language plpgsql as $$
      begin
        if new.actor_id in (${actors}) then raise exception 'audit entry refused by the probe'; end if;
        return new;
      end $$`),
  );
  await db.execute(
    sql.raw(`create trigger ${trigger} before insert on audit_log for each row execute function ${trigger}()`),
  );
});

afterAll(async () => {
  await db.execute(sql.raw(`drop trigger if exists ${trigger} on audit_log`));
  await db.execute(sql.raw(`drop function if exists ${trigger}()`));
});

const csv = `t,${demoArm.description.joints.map((j) => j.name).join(",")}\n0,0,0,0,0,0,0,0.01\n0.01,0,0,0,0,0,0,0.01\n`;

describe("a write whose audit entry fails is not stored", () => {
  const cases: [string, () => PgTable, () => Promise<{ status: number }>][] = [
    ["create a project", () => projects, () => http("/api/v1/projects", { auth, json: { name: "Never stored" } })],
    [
      "create a plan",
      () => plans,
      () => http(`/api/v1/projects/${projectId}/plans`, { auth, json: { name: "Never", armId: demoArm.id } }),
    ],
    [
      "save a version",
      () => planVersions,
      () => http(`/api/v1/plans/${planId}/versions`, { auth, json: { baseVersion: 0, document: gentlePlan() } }),
    ],
    [
      "create an arm",
      () => arms,
      () =>
        http(`/api/v1/projects/${projectId}/arms`, {
          auth,
          json: { name: "Never", description: demoArm.description },
        }),
    ],
    [
      "add a member",
      () => projectMembers,
      () => http(`/api/v1/projects/${projectId}/members`, { auth, json: { email: spareEmail, role: "viewer" } }),
    ],
    [
      "upload a recording",
      () => recordings,
      () =>
        http(`/api/v1/projects/${projectId}/recordings?name=never`, {
          auth,
          body: csv,
          headers: { "content-type": "text/csv" },
        }),
    ],
    [
      "create a course",
      () => courses,
      () => http("/api/v1/courses", { auth: instructorAuth, json: { title: "Never", term: "Never" } }),
    ],
  ];
  for (const [what, table, act] of cases) {
    it(`${what}: the server reports an error and the table's row count does not move`, async () => {
      const before = await rows(table());
      const res = await act();
      expect(res.status).toBe(500);
      expect(await rows(table())).toBe(before);
    });
  }

  it("delete a plan: the plan is still there", async () => {
    const res = await http(`/api/v1/plans/${planId}`, { method: "DELETE", auth });
    expect(res.status).toBe(500);
    const [row] = await db.select({ id: plans.id }).from(plans).where(eq(plans.id, planId));
    expect(row?.id).toBe(planId);
  });

  it("rename a project: the name is unchanged", async () => {
    const res = await http(`/api/v1/projects/${projectId}`, { method: "PATCH", auth, json: { name: "Renamed" } });
    expect(res.status).toBe(500);
    const [row] = await db.select({ name: projects.name }).from(projects).where(eq(projects.id, projectId));
    expect(row.name).toBe("Audit probe");
  });
});
