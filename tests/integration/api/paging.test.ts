/**
 * Cursor paging of the list endpoints (`?limit=&cursor=`) against the real test database:
 * walking the pages yields every row exactly once, in the same order as one large page, ties in
 * the sort key broken by id, and a cursor that is not one of the list's own is a 400.
 */
import "./_env";
import { eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "@/db";
import { apiTokens, plans } from "@/db/schema";
import { createRecording } from "@/db/queries/recordings";
import { createApiToken } from "@/db/queries/tokens";
import { generateToken } from "@/lib/server/tokens";
import * as versionsRoute from "@/app/api/v1/plans/[planId]/versions/route";
import * as recordingsRoute from "@/app/api/v1/projects/[projectId]/recordings/route";
import * as tokensRoute from "@/app/api/v1/tokens/route";
import * as submissionsRoute from "@/app/api/v1/submissions/route";
import * as projectsRoute from "@/app/api/v1/projects/route";
import * as plansRoute from "@/app/api/v1/projects/[projectId]/plans/route";
import * as membersRoute from "@/app/api/v1/projects/[projectId]/members/route";
import * as auditRoute from "@/app/api/v1/projects/[projectId]/audit/route";
import { encodeCursor } from "@/lib/server/paging";
import {
  call,
  demoArm,
  errorOf,
  gentlePlan,
  makeUser,
  sessionCookieFor,
  tokenFor,
  type Auth,
  type CallResult,
} from "./_helpers";

type Listed = { id?: string; userId?: string; email?: string; updatedAt?: string; createdAt?: string };

/** Follows `nextCursor` from the first page to the last; returns every page's rows. */
async function walk(
  get: (query: string) => Promise<CallResult>,
  key: string,
  limit: number,
): Promise<{ pages: Listed[][]; cursors: (string | null)[] }> {
  const pages: Listed[][] = [];
  const cursors: (string | null)[] = [];
  let cursor: string | null = null;
  for (let guard = 0; guard < 100; guard++) {
    const res = await get(`?limit=${limit}${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ""}`);
    expect(res.status, res.text).toBe(200);
    const body = res.body as Record<string, unknown> & { nextCursor: string | null };
    pages.push(body[key] as Listed[]);
    cursors.push(body.nextCursor);
    cursor = body.nextCursor;
    if (!cursor) break;
  }
  return { pages, cursors };
}

async function setUp() {
  const owner = await makeUser("researcher", "pager");
  const auth: Auth = { bearer: await tokenFor(owner.id) };
  const projectIds: string[] = [];
  for (let i = 0; i < 7; i++) {
    const res = await call(projectsRoute.POST, {
      method: "POST",
      path: "/api/v1/projects",
      auth,
      body: { name: `Paged ${i}`, kind: "research" },
    });
    expect(res.status, res.text).toBe(201);
    projectIds.push((res.body as { project: { id: string } }).project.id);
  }
  const projectId = projectIds[0];
  const planIds: string[] = [];
  for (let i = 0; i < 9; i++) {
    const res = await call(plansRoute.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/plans`,
      params: { projectId },
      auth,
      body: { name: `Plan ${i}`, armId: demoArm.id },
    });
    expect(res.status, res.text).toBe(201);
    planIds.push((res.body as { plan: { id: string } }).plan.id);
  }
  const memberEmails: string[] = [owner.email];
  for (let i = 0; i < 5; i++) {
    const m = await makeUser("student", `member${i}`);
    const res = await call(membersRoute.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/members`,
      params: { projectId },
      auth,
      body: { email: m.email, role: "viewer" },
    });
    expect(res.status, res.text).toBe(201);
    memberEmails.push(m.email);
  }
  return { auth, projectIds, projectId, planIds, memberEmails };
}

describe("cursor paging of the list endpoints", () => {
  let f: Awaited<ReturnType<typeof setUp>>;
  beforeAll(async () => {
    f = await setUp();
  }, 60_000);
  const getProjects = (q: string) => call(projectsRoute.GET, { path: `/api/v1/projects${q}`, auth: f.auth });
  const getPlans = (q: string) =>
    call(plansRoute.GET, {
      path: `/api/v1/projects/${f.projectId}/plans${q}`,
      params: { projectId: f.projectId },
      auth: f.auth,
    });
  const getMembers = (q: string) =>
    call(membersRoute.GET, {
      path: `/api/v1/projects/${f.projectId}/members${q}`,
      params: { projectId: f.projectId },
      auth: f.auth,
    });
  const getAudit = (q: string) =>
    call(auditRoute.GET, {
      path: `/api/v1/projects/${f.projectId}/audit${q}`,
      params: { projectId: f.projectId },
      auth: f.auth,
    });

  it("pages the projects three at a time: every project once, newest activity first, the same order as one large page", async () => {
    const { pages, cursors } = await walk(getProjects, "projects", 3);
    expect(pages.map((p) => p.length)).toEqual([3, 3, 1]);
    expect(cursors.at(-1)).toBeNull();
    const ids = pages.flat().map((p) => p.id);
    expect(new Set(ids).size).toBe(ids.length);
    expect([...ids].sort()).toEqual([...f.projectIds].sort());
    const whole = (await getProjects("?limit=200")).body as { projects: Listed[]; nextCursor: string | null };
    expect(whole.nextCursor).toBeNull();
    expect(whole.projects.map((p) => p.id)).toEqual(ids);
    const times = pages.flat().map((p) => Date.parse(p.updatedAt!));
    for (let i = 1; i < times.length; i++) expect(times[i]).toBeLessThanOrEqual(times[i - 1]);
  });

  it("pages plans whose change times are all equal by id, every plan once", async () => {
    // The same instant on every plan: only the id can order them.
    await db
      .update(plans)
      .set({ updatedAt: new Date("2026-06-01T10:00:00.000Z") })
      .where(eq(plans.projectId, f.projectId));
    const { pages } = await walk(getPlans, "plans", 2);
    expect(pages.map((p) => p.length)).toEqual([2, 2, 2, 2, 1]);
    const ids = pages.flat().map((p) => p.id!);
    expect(ids).toEqual([...f.planIds].sort().reverse());
  });

  it("keeps plans apart that differ by one microsecond (finer than a JavaScript date)", async () => {
    const [a, b, c] = f.planIds;
    const at = (iso: string) => sql`${iso}::timestamptz`;
    for (const [id, iso] of [
      [a, "2026-06-02 10:00:00.000003+00"],
      [b, "2026-06-02 10:00:00.000002+00"],
      [c, "2026-06-02 10:00:00.000001+00"],
    ] as const) {
      await db
        .update(plans)
        .set({ updatedAt: at(iso) })
        .where(eq(plans.id, id));
    }
    const { pages } = await walk(getPlans, "plans", 1);
    const ids = pages.flat().map((p) => p.id!);
    expect(ids.slice(0, 3)).toEqual([a, b, c]);
    expect(new Set(ids).size).toBe(f.planIds.length);
  });

  it("pages the members by e-mail, two at a time, the owner included", async () => {
    const { pages } = await walk(getMembers, "members", 2);
    expect(pages.map((p) => p.length)).toEqual([2, 2, 2]);
    expect(pages.flat().map((m) => m.email)).toEqual([...f.memberEmails].sort());
  });

  it("pages the audit log newest first with every entry once", async () => {
    const whole = (await getAudit("?limit=200")).body as { entries: (Listed & { id: number })[] };
    // project.create, 9 × plan.create and 5 × member.set were recorded in this project.
    expect(whole.entries.length).toBe(15);
    const { pages } = await walk(getAudit, "entries", 4);
    expect(pages.map((p) => p.length)).toEqual([4, 4, 4, 3]);
    expect(pages.flat().map((e) => e.id)).toEqual(whole.entries.map((e) => e.id));
  });

  it("answers 400 for a cursor that is not one of the list's own, naming query.cursor", async () => {
    const membersCursor = encodeCursor({ key: "someone@example.com", id: f.planIds[0] });
    const impossibleDay = encodeCursor({ key: "2026-02-30T10:00:00.000000Z", id: f.planIds[0] });
    const serialAsUuid = encodeCursor({ key: "2026-06-01T10:00:00.000000Z", id: "12" });
    for (const cursor of ["not a cursor", "bm90LWpzb24", membersCursor, impossibleDay, serialAsUuid]) {
      const res = await getPlans(`?cursor=${encodeURIComponent(cursor)}`);
      expect(res.status, cursor).toBe(400);
      expect(errorOf(res).issues.map((i) => i.path)).toEqual(["query.cursor"]);
    }
    const auditWithUuid = await getAudit(
      `?cursor=${encodeCursor({ key: "2026-06-01T10:00:00.000000Z", id: f.planIds[0] })}`,
    );
    expect(auditWithUuid.status).toBe(400);
  });

  it("answers 400 for a limit outside 1 to 200, in the API's words", async () => {
    const zero = await getProjects("?limit=0");
    expect(zero.status).toBe(400);
    expect(errorOf(zero).issues).toEqual([{ path: "query.limit", message: "must be 1 or greater" }]);
    const big = await getMembers("?limit=201");
    expect(big.status).toBe(400);
    expect(errorOf(big).issues).toEqual([{ path: "query.limit", message: "must be 200 or less" }]);
  });
});

describe("cursor paging of versions, recordings, tokens and submissions", () => {
  let auth: Auth;
  let cookie: Auth;
  let planId: string;
  let projectId: string;
  const versionIds: string[] = [];
  const recordingIds: string[] = [];
  const tokenIds: string[] = [];
  beforeAll(async () => {
    const owner = await makeUser("researcher", "pager-lists");
    auth = { bearer: await tokenFor(owner.id) };
    cookie = { cookie: await sessionCookieFor(owner.id) };
    const project = await call(projectsRoute.POST, {
      method: "POST",
      path: "/api/v1/projects",
      auth,
      body: { name: "Paged lists", kind: "research" },
    });
    projectId = (project.body as { project: { id: string } }).project.id;
    const plan = await call(plansRoute.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/plans`,
      params: { projectId },
      auth,
      body: { name: "Versions", armId: demoArm.id },
    });
    planId = (plan.body as { plan: { id: string } }).plan.id;
    for (let v = 0; v < 5; v++) {
      const doc = gentlePlan() as { moves: { duration: number }[] };
      doc.moves[0].duration = 2 + v;
      const res = await call(versionsRoute.POST, {
        method: "POST",
        path: `/api/v1/plans/${planId}/versions`,
        params: { planId },
        auth,
        body: { baseVersion: v, document: doc },
      });
      expect(res.status, res.text).toBe(201);
      versionIds.push((res.body as { version: { id: string } }).version.id);
    }
    for (let r = 0; r < 5; r++) {
      const row = await createRecording({
        projectId,
        armId: null,
        name: `Recording ${r}`,
        objectKey: `recordings/${projectId}/paged-${r}.csv`,
        contentType: "text/csv",
        sizeBytes: 10,
        sha256: "0".repeat(64),
        sampleCount: 2,
        jointCount: 1,
        durationS: 1,
        createdBy: owner.id,
      });
      recordingIds.push(row.id);
    }
    // the token made above for `auth` is one of them
    const [own] = await db.select({ id: apiTokens.id }).from(apiTokens).where(eq(apiTokens.userId, owner.id));
    tokenIds.push(own.id);
    for (let t = 0; t < 4; t++) {
      const { hash, prefix } = generateToken();
      const row = await createApiToken({ userId: owner.id, name: `t${t}`, tokenHash: hash, prefix, expiresAt: null });
      tokenIds.push(row.id);
    }
  }, 60_000);

  const getVersions = (q: string) =>
    call(versionsRoute.GET, { path: `/api/v1/plans/${planId}/versions${q}`, params: { planId }, auth });
  const getRecordings = (q: string) =>
    call(recordingsRoute.GET, {
      path: `/api/v1/projects/${projectId}/recordings${q}`,
      params: { projectId },
      auth,
    });
  const getTokens = (q: string) => call(tokensRoute.GET, { path: `/api/v1/tokens${q}`, auth: cookie });
  const getSubmissions = (q: string) => call(submissionsRoute.GET, { path: `/api/v1/submissions${q}`, auth });

  it("pages a plan's versions two at a time, newest first, every version once", async () => {
    const { pages, cursors } = await walk(getVersions, "versions", 2);
    expect(pages.map((p) => p.length)).toEqual([2, 2, 1]);
    expect(cursors.at(-1)).toBeNull();
    expect(pages.flat().map((v) => v.id)).toEqual([...versionIds].reverse());
  });

  it("pages a project's recordings and the caller's tokens, every row once, the same order as one large page", async () => {
    for (const [get, key, ids] of [
      [getRecordings, "recordings", recordingIds],
      [getTokens, "tokens", tokenIds],
    ] as const) {
      const { pages } = await walk(get, key, 2);
      expect(pages.map((p) => p.length)).toEqual([2, 2, 1]);
      const walked = pages.flat().map((r) => r.id!);
      expect([...walked].sort()).toEqual([...ids].sort());
      const whole = (await get("?limit=200")).body as Record<string, Listed[]>;
      expect(whole[key].map((r) => r.id)).toEqual(walked);
    }
  });

  it("pages the caller's submissions (none here: one empty last page) and refuses another list's cursor on each", async () => {
    const none = await getSubmissions("?limit=5");
    expect(none.status).toBe(200);
    expect(none.body).toEqual({ submissions: [], nextCursor: null });
    const membersCursor = encodeCursor({ key: "someone@example.com", id: versionIds[0] });
    for (const get of [getVersions, getRecordings, getTokens, getSubmissions]) {
      const res = await get(`?cursor=${encodeURIComponent(membersCursor)}`);
      expect(res.status).toBe(400);
      expect(errorOf(res).issues.map((i) => i.path)).toEqual(["query.cursor"]);
    }
  });
});
