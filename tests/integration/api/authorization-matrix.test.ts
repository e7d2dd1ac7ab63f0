/**
 * The authorisation matrix: every route × every actor (anonymous, student, researcher,
 * instructor, admin, API-token holder) × the actor's relation to the resource (own project,
 * editor, viewer, someone else's project), with the expected status generated from the
 * expectation tables below — the specification, written independently of lib/permissions.
 */
import "./_env";
import { describe, expect, it } from "vitest";
import { createArm } from "@/db/queries/arms";
import { createPlan, createPlanVersion } from "@/db/queries/plans";
import { createProject, upsertMember } from "@/db/queries/projects";
import { createApiToken } from "@/db/queries/tokens";
import type { SiteRole } from "@/db/schema";
import { generateToken } from "@/lib/server/tokens";
import * as accounts from "@/app/api/v1/accounts/route";
import * as passwordReset from "@/app/api/v1/accounts/password-reset/route";
import * as passwordResetConfirm from "@/app/api/v1/accounts/password-reset/confirm/route";
import * as verifyEmail from "@/app/api/v1/accounts/verify-email/route";
import * as me from "@/app/api/v1/me/route";
import * as tokens from "@/app/api/v1/tokens/route";
import * as token from "@/app/api/v1/tokens/[tokenId]/route";
import * as users from "@/app/api/v1/users/route";
import * as user from "@/app/api/v1/users/[userId]/route";
import * as projects from "@/app/api/v1/projects/route";
import * as project from "@/app/api/v1/projects/[projectId]/route";
import * as members from "@/app/api/v1/projects/[projectId]/members/route";
import * as member from "@/app/api/v1/projects/[projectId]/members/[userId]/route";
import * as projectArms from "@/app/api/v1/projects/[projectId]/arms/route";
import * as arms from "@/app/api/v1/arms/route";
import * as arm from "@/app/api/v1/arms/[armId]/route";
import * as armRevisions from "@/app/api/v1/arms/[armId]/revisions/route";
import * as projectPlans from "@/app/api/v1/projects/[projectId]/plans/route";
import * as plan from "@/app/api/v1/plans/[planId]/route";
import * as versions from "@/app/api/v1/plans/[planId]/versions/route";
import * as version from "@/app/api/v1/plans/[planId]/versions/[version]/route";
import * as exportRoute from "@/app/api/v1/plans/[planId]/versions/[version]/export/route";
import * as diff from "@/app/api/v1/plans/[planId]/diff/route";
import * as check from "@/app/api/v1/check/route";
import * as recordingsRoute from "@/app/api/v1/projects/[projectId]/recordings/route";
import * as recordingFile from "@/app/api/v1/recordings/[recordingId]/file/route";
import * as armImport from "@/app/api/v1/projects/[projectId]/arms/import/route";
import * as openapi from "@/app/api/v1/openapi.json/route";
import * as audit from "@/app/api/v1/projects/[projectId]/audit/route";
import * as projectDatasets from "@/app/api/v1/projects/[projectId]/datasets/route";
import * as datasetRoute from "@/app/api/v1/datasets/[datasetId]/route";
import * as datasetPreview from "@/app/api/v1/datasets/[datasetId]/preview/route";
import * as datasetMapping from "@/app/api/v1/datasets/[datasetId]/mapping/route";
import * as datasetAudit from "@/app/api/v1/datasets/[datasetId]/audit/route";
import * as datasetEpisodes from "@/app/api/v1/datasets/[datasetId]/episodes/route";
import * as datasetEpisode from "@/app/api/v1/datasets/[datasetId]/episodes/[index]/route";
import * as datasetReplay from "@/app/api/v1/datasets/[datasetId]/episodes/[index]/replay-plan/route";
import * as datasetRepair from "@/app/api/v1/datasets/[datasetId]/repair/route";
import * as datasetExport from "@/app/api/v1/datasets/[datasetId]/export/route";
import { auditedDataset, matrixParquet } from "../datasets/_fixture";
import { armSchema } from "@/kinematics";
import { readFileSync } from "node:fs";
import { createRecording } from "@/db/queries/recordings";
import { putObject } from "@/lib/server/storage";
import {
  call,
  demoArm,
  gentlePlan,
  makeUser,
  sessionCookieFor,
  tokenFor,
  type Auth,
  type CallResult,
  type TestUser,
} from "./_helpers";

type ActorName = "anonymous" | "student" | "researcher" | "instructor" | "admin" | "token holder";
const actorNames: ActorName[] = ["anonymous", "student", "researcher", "instructor", "admin", "token holder"];
/** The token holder is a student using an API token: it must get exactly a student's answers. */
const siteRoleOf: Record<Exclude<ActorName, "anonymous">, SiteRole> = {
  student: "student",
  researcher: "researcher",
  instructor: "instructor",
  admin: "admin",
  "token holder": "student",
};

type Relation = "owner" | "editor" | "viewer" | "outsider";
const relations: Relation[] = ["owner", "editor", "viewer", "outsider"];

/** Expected outcome by kind of project action and the actor's relation to the project. */
type Need = "read" | "write" | "owner";
const projectExpectation: Record<Need, Record<Relation, "ok" | 403 | 404>> = {
  read: { owner: "ok", editor: "ok", viewer: "ok", outsider: 404 },
  write: { owner: "ok", editor: "ok", viewer: 403, outsider: 404 },
  owner: { owner: "ok", editor: 403, viewer: 403, outsider: 404 },
};

type Actor = { name: ActorName; user: TestUser | null; auth: Auth };

async function makeActor(name: ActorName): Promise<Actor> {
  if (name === "anonymous") return { name, user: null, auth: null };
  const u = await makeUser(siteRoleOf[name], name.replace(" ", "-"));
  return {
    name,
    user: u,
    auth: name === "token holder" ? { bearer: await tokenFor(u.id) } : { cookie: await sessionCookieFor(u.id) },
  };
}

type Fixture = {
  projectId: string;
  armId: string;
  planId: string;
  hostId: string;
  spareEmail: string;
  spareId: string;
  recordingId: string;
};

const recordingCsv = `t,${demoArm.description.joints.map((j) => j.name).join(",")}\n0,0,0,0,0,0,0,0.01\n0.01,0,0,0,0,0,0,0.01\n`;
const urdf = readFileSync("kinematics/arm/presets/bench-arm-l.urdf", "utf8");

/** A project the actor stands in `relation` to, with a custom arm and a plan with one version. */
async function projectFixture(actor: Actor, relation: Relation): Promise<Fixture> {
  const host = await makeUser("researcher", "host");
  const spare = await makeUser("student", "spare");
  const ownerId = relation === "owner" && actor.user ? actor.user.id : host.id;
  const p = await createProject({ name: "Matrix project", kind: "research", userId: ownerId });
  if (actor.user && (relation === "editor" || relation === "viewer")) {
    await upsertMember({ projectId: p.id, ownerId, email: actor.user.email, role: relation });
  }
  await upsertMember({ projectId: p.id, ownerId, email: spare.email, role: "viewer" });
  const a = await createArm({ projectId: p.id, name: "Matrix arm", description: demoArm.description, userId: ownerId });
  if (!a) throw new Error("fixture arm not created");
  const pl = await createPlan({ projectId: p.id, armId: a.armId, name: "Matrix plan", userId: ownerId });
  await createPlanVersion({
    planId: pl.id,
    baseVersion: 0,
    document: { ...gentlePlan(), arm: demoArm.description },
    armRevisionId: a.revision.id,
    verdict: "pass",
    summary: {},
    note: null,
    authorId: ownerId,
  });
  const key = `recordings/${p.id}/matrix.csv`;
  await putObject(key, new TextEncoder().encode(recordingCsv), "text/csv");
  const rec = await createRecording({
    projectId: p.id,
    name: "Matrix recording",
    objectKey: key,
    contentType: "text/csv",
    sizeBytes: recordingCsv.length,
    sha256: "0".repeat(64),
    sampleCount: 2,
    jointCount: 7,
    durationS: 0.01,
    createdBy: ownerId,
  });
  return {
    projectId: p.id,
    armId: a.armId,
    planId: pl.id,
    hostId: host.id,
    spareEmail: spare.email,
    spareId: spare.id,
    recordingId: rec.id,
  };
}

type ProjectRoute = { name: string; need: Need; ok: number; run: (f: Fixture, auth: Auth) => Promise<CallResult> };

const planDoc = () => ({ ...gentlePlan(), arm: demoArm.description });

const projectRoutes: ProjectRoute[] = [
  {
    name: "GET /projects/:id",
    need: "read",
    ok: 200,
    run: (f, auth) =>
      call(project.GET, { path: `/api/v1/projects/${f.projectId}`, params: { projectId: f.projectId }, auth }),
  },
  {
    name: "PATCH /projects/:id (rename)",
    need: "owner",
    ok: 200,
    run: (f, auth) =>
      call(project.PATCH, {
        method: "PATCH",
        path: `/api/v1/projects/${f.projectId}`,
        params: { projectId: f.projectId },
        auth,
        body: { name: "Renamed" },
      }),
  },
  {
    name: "PATCH /projects/:id (archive)",
    need: "owner",
    ok: 200,
    run: (f, auth) =>
      call(project.PATCH, {
        method: "PATCH",
        path: `/api/v1/projects/${f.projectId}`,
        params: { projectId: f.projectId },
        auth,
        body: { archived: true },
      }),
  },
  {
    name: "GET /projects/:id/audit",
    need: "owner",
    ok: 200,
    run: (f, auth) =>
      call(audit.GET, { path: `/api/v1/projects/${f.projectId}/audit`, params: { projectId: f.projectId }, auth }),
  },
  {
    name: "GET /projects/:id/members",
    need: "read",
    ok: 200,
    run: (f, auth) =>
      call(members.GET, { path: `/api/v1/projects/${f.projectId}/members`, params: { projectId: f.projectId }, auth }),
  },
  {
    name: "POST /projects/:id/members",
    need: "owner",
    ok: 200,
    run: (f, auth) =>
      call(members.POST, {
        method: "POST",
        path: `/api/v1/projects/${f.projectId}/members`,
        params: { projectId: f.projectId },
        auth,
        body: { email: f.spareEmail, role: "editor" },
      }),
  },
  {
    name: "DELETE /projects/:id/members/:userId",
    need: "owner",
    ok: 200,
    run: (f, auth) =>
      call(member.DELETE, {
        method: "DELETE",
        path: `/api/v1/projects/${f.projectId}/members/${f.spareId}`,
        params: { projectId: f.projectId, userId: f.spareId },
        auth,
      }),
  },
  {
    name: "GET /projects/:id/arms",
    need: "read",
    ok: 200,
    run: (f, auth) =>
      call(projectArms.GET, { path: `/api/v1/projects/${f.projectId}/arms`, params: { projectId: f.projectId }, auth }),
  },
  {
    name: "POST /projects/:id/arms",
    need: "write",
    ok: 201,
    run: (f, auth) =>
      call(projectArms.POST, {
        method: "POST",
        path: `/api/v1/projects/${f.projectId}/arms`,
        params: { projectId: f.projectId },
        auth,
        body: { name: "Second arm", description: demoArm.description },
      }),
  },
  {
    name: "GET /arms/:armId",
    need: "read",
    ok: 200,
    run: (f, auth) => call(arm.GET, { path: `/api/v1/arms/${f.armId}`, params: { armId: f.armId }, auth }),
  },
  {
    name: "POST /arms/:armId/revisions",
    need: "write",
    ok: 201,
    run: (f, auth) =>
      call(armRevisions.POST, {
        method: "POST",
        path: `/api/v1/arms/${f.armId}/revisions`,
        params: { armId: f.armId },
        auth,
        body: { description: { ...demoArm.description, controlRateHz: 500 } },
      }),
  },
  {
    name: "GET /projects/:id/plans",
    need: "read",
    ok: 200,
    run: (f, auth) =>
      call(projectPlans.GET, {
        path: `/api/v1/projects/${f.projectId}/plans`,
        params: { projectId: f.projectId },
        auth,
      }),
  },
  {
    name: "POST /projects/:id/plans",
    need: "write",
    ok: 201,
    run: (f, auth) =>
      call(projectPlans.POST, {
        method: "POST",
        path: `/api/v1/projects/${f.projectId}/plans`,
        params: { projectId: f.projectId },
        auth,
        body: { name: "New plan", armId: f.armId },
      }),
  },
  {
    name: "GET /plans/:id",
    need: "read",
    ok: 200,
    run: (f, auth) => call(plan.GET, { path: `/api/v1/plans/${f.planId}`, params: { planId: f.planId }, auth }),
  },
  {
    name: "DELETE /plans/:id",
    need: "write",
    ok: 200,
    run: (f, auth) =>
      call(plan.DELETE, { method: "DELETE", path: `/api/v1/plans/${f.planId}`, params: { planId: f.planId }, auth }),
  },
  {
    name: "GET /plans/:id/versions",
    need: "read",
    ok: 200,
    run: (f, auth) =>
      call(versions.GET, { path: `/api/v1/plans/${f.planId}/versions`, params: { planId: f.planId }, auth }),
  },
  {
    name: "POST /plans/:id/versions",
    need: "write",
    ok: 201,
    run: (f, auth) =>
      call(versions.POST, {
        method: "POST",
        path: `/api/v1/plans/${f.planId}/versions`,
        params: { planId: f.planId },
        auth,
        body: { baseVersion: 1, document: planDoc() },
      }),
  },
  {
    name: "GET /plans/:id/versions/:n",
    need: "read",
    ok: 200,
    run: (f, auth) =>
      call(version.GET, {
        path: `/api/v1/plans/${f.planId}/versions/1`,
        params: { planId: f.planId, version: "1" },
        auth,
      }),
  },
  {
    name: "GET /plans/:id/versions/:n/export",
    need: "read",
    ok: 200,
    run: (f, auth) =>
      call(exportRoute.GET, {
        path: `/api/v1/plans/${f.planId}/versions/1/export?format=csv&rateHz=10`,
        params: { planId: f.planId, version: "1" },
        auth,
      }),
  },
  {
    name: "GET /projects/:id/recordings",
    need: "read",
    ok: 200,
    run: (f, auth) =>
      call(recordingsRoute.GET, {
        path: `/api/v1/projects/${f.projectId}/recordings`,
        params: { projectId: f.projectId },
        auth,
      }),
  },
  {
    name: "POST /projects/:id/recordings",
    need: "write",
    ok: 201,
    run: (f, auth) =>
      call(recordingsRoute.POST, {
        method: "POST",
        path: `/api/v1/projects/${f.projectId}/recordings?name=Upload`,
        params: { projectId: f.projectId },
        auth,
        rawBody: recordingCsv,
        headers: { "content-type": "text/csv" },
      }),
  },
  {
    name: "GET /recordings/:id/file",
    need: "read",
    ok: 200,
    run: (f, auth) =>
      call(recordingFile.GET, {
        path: `/api/v1/recordings/${f.recordingId}/file`,
        params: { recordingId: f.recordingId },
        auth,
      }),
  },
  {
    name: "POST /projects/:id/arms/import",
    need: "write",
    ok: 201,
    run: (f, auth) =>
      call(armImport.POST, {
        method: "POST",
        path: `/api/v1/projects/${f.projectId}/arms/import?name=Imported`,
        params: { projectId: f.projectId },
        auth,
        rawBody: urdf,
        headers: { "content-type": "application/xml" },
      }),
  },
  {
    name: "GET /plans/:id/diff",
    need: "read",
    ok: 200,
    run: (f, auth) =>
      call(diff.GET, { path: `/api/v1/plans/${f.planId}/diff?from=1&to=1`, params: { planId: f.planId }, auth }),
  },
  ...datasetRoutes(),
];

/** The dataset routes (viewers read; editors upload, map, audit and repair), each on a freshly audited dataset. */
function datasetRoutes(): ProjectRoute[] {
  const parquet = matrixParquet(armSchema.parse(demoArm.description));
  const on =
    (run: (f: Fixture, auth: Auth, datasetId: string) => Promise<CallResult>) => async (f: Fixture, auth: Auth) =>
      run(f, auth, await auditedDataset(f.projectId));
  const at = (id: string, rest = "") => ({ path: `/api/v1/datasets/${id}${rest}`, params: { datasetId: id } });
  return [
    {
      name: "GET /projects/:id/datasets",
      need: "read",
      ok: 200,
      run: (f, auth) =>
        call(projectDatasets.GET, {
          path: `/api/v1/projects/${f.projectId}/datasets`,
          params: { projectId: f.projectId },
          auth,
        }),
    },
    {
      name: "POST /projects/:id/datasets",
      need: "write",
      ok: 201,
      run: (f, auth) =>
        call(projectDatasets.POST, {
          method: "POST",
          path: `/api/v1/projects/${f.projectId}/datasets?name=Upload`,
          params: { projectId: f.projectId },
          auth,
          rawBody: parquet,
          headers: { "content-length": String(parquet.byteLength) },
        }),
    },
    {
      name: "GET /datasets/:id",
      need: "read",
      ok: 200,
      run: on((_f, auth, id) => call(datasetRoute.GET, { ...at(id), auth })),
    },
    {
      name: "POST /datasets/:id/preview",
      need: "read",
      ok: 200,
      run: on((f, auth, id) =>
        call(datasetPreview.POST, {
          method: "POST",
          ...at(id, "/preview"),
          auth,
          body: { armId: f.armId, mapping: {} },
        }),
      ),
    },
    {
      name: "POST /datasets/:id/mapping",
      need: "write",
      ok: 200,
      run: on((f, auth, id) =>
        call(datasetMapping.POST, {
          method: "POST",
          ...at(id, "/mapping"),
          auth,
          body: { armId: f.armId, mapping: {} },
        }),
      ),
    },
    {
      name: "POST /datasets/:id/audit",
      need: "write",
      ok: 202,
      run: on((_f, auth, id) => call(datasetAudit.POST, { method: "POST", ...at(id, "/audit"), auth })),
    },
    {
      name: "GET /datasets/:id/episodes",
      need: "read",
      ok: 200,
      run: on((_f, auth, id) => call(datasetEpisodes.GET, { ...at(id, "/episodes"), auth })),
    },
    {
      name: "GET /datasets/:id/episodes/:index",
      need: "read",
      ok: 200,
      run: on((_f, auth, id) =>
        call(datasetEpisode.GET, {
          path: `/api/v1/datasets/${id}/episodes/1`,
          params: { datasetId: id, index: "1" },
          auth,
        }),
      ),
    },
    {
      name: "GET /datasets/:id/episodes/:index/replay-plan",
      need: "read",
      ok: 200,
      run: on((_f, auth, id) =>
        call(datasetReplay.GET, {
          path: `/api/v1/datasets/${id}/episodes/0/replay-plan`,
          params: { datasetId: id, index: "0" },
          auth,
        }),
      ),
    },
    {
      name: "POST /datasets/:id/repair",
      need: "write",
      ok: 200,
      run: on((_f, auth, id) => call(datasetRepair.POST, { method: "POST", ...at(id, "/repair"), auth, body: {} })),
    },
    {
      name: "GET /datasets/:id/export",
      need: "read",
      ok: 200,
      run: on((_f, auth, id) => call(datasetExport.GET, { ...at(id, "/export"), auth })),
    },
  ];
}

type SiteRoute = {
  name: string;
  /** Expected status per signed-in site role (and whether the caller uses an API token); anonymous is always 401. */
  expect: (role: SiteRole, viaToken: boolean) => number;
  run: (actor: Actor) => Promise<CallResult>;
};
const all = (status: number) => () => status;
/** Token management: a signed-in person only; an API token may not mint or revoke tokens (403). */
const sessionOnly = (status: number) => (_role: SiteRole, viaToken: boolean) => (viaToken ? 403 : status);
const adminOnly = (status: number) => (role: SiteRole) => (role === "admin" ? status : 403);
const teachers = (status: number) => (role: SiteRole) => (role === "instructor" || role === "admin" ? status : 403);

const siteRoutes: SiteRoute[] = [
  { name: "GET /me", expect: all(200), run: (a) => call(me.GET, { path: "/api/v1/me", auth: a.auth }) },
  {
    name: "GET /projects",
    expect: all(200),
    run: (a) => call(projects.GET, { path: "/api/v1/projects", auth: a.auth }),
  },
  {
    name: "POST /projects (personal)",
    expect: all(201),
    run: (a) => call(projects.POST, { method: "POST", path: "/api/v1/projects", auth: a.auth, body: { name: "Mine" } }),
  },
  {
    name: "POST /projects (course)",
    expect: teachers(201),
    run: (a) =>
      call(projects.POST, {
        method: "POST",
        path: "/api/v1/projects",
        auth: a.auth,
        body: { name: "A course", kind: "course" },
      }),
  },
  { name: "GET /arms", expect: all(200), run: (a) => call(arms.GET, { path: "/api/v1/arms", auth: a.auth }) },
  {
    name: "GET /arms/:builtIn",
    expect: all(200),
    run: (a) => call(arm.GET, { path: `/api/v1/arms/${demoArm.id}`, params: { armId: demoArm.id }, auth: a.auth }),
  },
  {
    name: "POST /arms/:builtIn/revisions",
    expect: all(403),
    run: (a) =>
      call(armRevisions.POST, {
        method: "POST",
        path: `/api/v1/arms/${demoArm.id}/revisions`,
        params: { armId: demoArm.id },
        auth: a.auth,
        body: { description: demoArm.description },
      }),
  },
  {
    name: "POST /check",
    expect: all(200),
    run: (a) => call(check.POST, { method: "POST", path: "/api/v1/check", auth: a.auth, body: gentlePlan() }),
  },
  {
    name: "GET /tokens",
    expect: sessionOnly(200),
    run: (a) => call(tokens.GET, { path: "/api/v1/tokens", auth: a.auth }),
  },
  {
    name: "POST /tokens",
    expect: sessionOnly(201),
    run: (a) => call(tokens.POST, { method: "POST", path: "/api/v1/tokens", auth: a.auth, body: { name: "ci" } }),
  },
  {
    name: "DELETE /tokens/:id (own)",
    expect: sessionOnly(200),
    run: async (a) => {
      const t = generateToken();
      const row = await createApiToken({
        userId: a.user?.id ?? (await makeUser("student")).id,
        name: "own",
        tokenHash: t.hash,
        prefix: t.prefix,
        expiresAt: null,
      });
      return call(token.DELETE, {
        method: "DELETE",
        path: `/api/v1/tokens/${row.id}`,
        params: { tokenId: row.id },
        auth: a.auth,
      });
    },
  },
  {
    name: "DELETE /tokens/:id (someone else's)",
    expect: sessionOnly(404),
    run: async (a) => {
      const t = generateToken();
      const row = await createApiToken({
        userId: (await makeUser("student")).id,
        name: "theirs",
        tokenHash: t.hash,
        prefix: t.prefix,
        expiresAt: null,
      });
      return call(token.DELETE, {
        method: "DELETE",
        path: `/api/v1/tokens/${row.id}`,
        params: { tokenId: row.id },
        auth: a.auth,
      });
    },
  },
  { name: "GET /users", expect: adminOnly(200), run: (a) => call(users.GET, { path: "/api/v1/users", auth: a.auth }) },
  {
    name: "PATCH /users/:id",
    expect: adminOnly(200),
    run: async (a) => {
      const target = await makeUser("student", "target");
      return call(user.PATCH, {
        method: "PATCH",
        path: `/api/v1/users/${target.id}`,
        params: { userId: target.id },
        auth: a.auth,
        body: { siteRole: "researcher" },
      });
    },
  },
];

type Cell = {
  route: string;
  actor: ActorName;
  relation: Relation | "-";
  expected: number;
  run: (a: Actor) => Promise<CallResult>;
};

const cells: Cell[] = [];
for (const r of projectRoutes) {
  for (const actor of actorNames) {
    for (const relation of actor === "anonymous" ? (["outsider"] as Relation[]) : relations) {
      const outcome = actor === "anonymous" ? 401 : projectExpectation[r.need][relation];
      cells.push({
        route: r.name,
        actor,
        relation,
        expected: outcome === "ok" ? r.ok : outcome,
        run: async (a) => r.run(await projectFixture(a, relation), a.auth),
      });
    }
  }
}
for (const r of siteRoutes) {
  for (const actor of actorNames) {
    cells.push({
      route: r.name,
      actor,
      relation: "-",
      expected: actor === "anonymous" ? 401 : r.expect(siteRoleOf[actor], actor === "token holder"),
      run: r.run,
    });
  }
}
/** Public routes: the same answer for everyone, signed in or not. */
const publicRoutes: { name: string; status: number; run: (a: Actor) => Promise<CallResult> }[] = [
  {
    name: "GET /openapi.json",
    status: 200,
    run: (a) => call(openapi.GET, { path: "/api/v1/openapi.json", auth: a.auth }),
  },
  // The account links work without a session (the person may not be able to sign in); a session changes nothing.
  {
    name: "POST /accounts/password-reset",
    status: 202,
    run: (a) =>
      call(passwordReset.POST, {
        method: "POST",
        path: "/api/v1/accounts/password-reset",
        auth: a.auth,
        body: { email: "matrix-nobody@example.com" },
      }),
  },
  {
    name: "POST /accounts/password-reset/confirm (unknown token)",
    status: 400,
    run: (a) =>
      call(passwordResetConfirm.POST, {
        method: "POST",
        path: "/api/v1/accounts/password-reset/confirm",
        auth: a.auth,
        body: { token: "B".repeat(43), password: "long-enough-pass-1" },
      }),
  },
  {
    name: "POST /accounts/verify-email (unknown token)",
    status: 400,
    run: (a) =>
      call(verifyEmail.POST, {
        method: "POST",
        path: "/api/v1/accounts/verify-email",
        auth: a.auth,
        body: { token: "C".repeat(43) },
      }),
  },
];
for (const r of publicRoutes)
  for (const actor of actorNames) cells.push({ route: r.name, actor, relation: "-", expected: r.status, run: r.run });

describe("authorisation matrix", () => {
  it.each(cells)("$route as $actor ($relation) → $expected", async (cell) => {
    const actor = await makeActor(cell.actor);
    const result = await cell.run(actor);
    expect({ status: result.status, body: result.status === cell.expected ? "" : result.body }).toEqual({
      status: cell.expected,
      body: "",
    });
  });

  it("covers every project route for every actor and relation, and every site route for every actor", () => {
    expect(cells).toHaveLength(
      projectRoutes.length * (1 + 5 * relations.length) + (siteRoutes.length + publicRoutes.length) * actorNames.length,
    );
  });

  it("lets anyone sign up without a session", async () => {
    const res = await call(accounts.POST, {
      method: "POST",
      path: "/api/v1/accounts",
      body: { email: `new-${Date.now()}@example.com`, name: "New Student", password: "a-long-password" },
    });
    expect(res.status).toBe(202);
  });
});
