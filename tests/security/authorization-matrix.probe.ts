/**
 * The authorisation matrix over HTTP against the running server: every operation the server's own
 * OpenAPI document lists (so a new route joins by being described) × nine callers × four kinds of
 * id. Every answer is below 500 and carries nothing of a resource the caller may not see; anonymous
 * and revoked callers get 401, malformed ids and other people's resources 404, viewers' writes 403.
 * The exact per-role table lives in tests/integration/api/authorization-matrix.test.ts; this one
 * holds the same rules against the production build, the cookie and token paths and the real router.
 */
import "./_env";
import { randomUUID } from "node:crypto";
import { readFileSync } from "node:fs";
import { beforeAll, describe, expect, it } from "vitest";
import { demoArmRevision, studentPlan, baseMovePlan } from "../integration/courses/_fixtures";
import { demoArm, gentlePlan, http, makeUser, sessionCookieFor, type Answer, type Auth } from "./_probe";

type Method = "get" | "post" | "patch" | "delete";
/** `query` holds the required query parameters, filled with a valid value from their schema. */
type Operation = { method: Method; path: string; anonymous: boolean; hasBody: boolean; query: string };
type Caller =
  "anonymous" | "revoked token" | "unrelated user" | "viewer" | "editor" | "student" | "admin" | "instructor" | "owner";
/** Owners and instructors last: their writes (a delete, a decision) change what the others would see. */
const callers: Caller[] = [
  "anonymous",
  "revoked token",
  "unrelated user",
  "viewer",
  "editor",
  "student",
  "admin",
  "instructor",
  "owner",
];
type IdKind = "own" | "other's" | "malformed" | "other kind's";
const idKinds: IdKind[] = ["own", "other's", "malformed", "other kind's"];

/** The ids of one world: a project (owner, editor, viewer) and a course (instructor, student). */
type World = {
  marker: { project: string; course: string };
  ids: Record<string, string>;
  auth: Partial<Record<Caller, Auth>>;
  spareMemberId: string;
  spareStudentId: string;
  spareUserId: string;
  sparePlanId: string;
  spareTokenId: string;
  studentPlanId: string;
};

const names = demoArm.description.joints.map((j) => j.name);
const recordingCsv = `t,${names.join(",")}\n0,0,0,0,0,0,0,0.01\n0.01,0,0,0,0,0,0,0.01\n`;
const urdf = readFileSync("kinematics/arm/presets/bench-arm-l.urdf", "utf8");

function idOf(answer: Answer, ...path: string[]): string {
  let v: unknown = answer.body;
  for (const key of path) v = (v as Record<string, unknown> | undefined)?.[key];
  if (typeof v !== "string") throw new Error(`set-up request failed: ${answer.status} ${answer.text.slice(0, 300)}`);
  return v;
}

/** Makes one world through the API itself (and its users through the integration helpers). */
async function makeWorld(label: string): Promise<World> {
  const tag = randomUUID().slice(0, 8);
  const marker = { project: `P${label}${tag}`, course: `C${label}${tag}` };
  const people = {
    owner: await makeUser("researcher", `${label}-owner`),
    editor: await makeUser("researcher", `${label}-editor`),
    viewer: await makeUser("researcher", `${label}-viewer`),
    spare: await makeUser("researcher", `${label}-spare`),
    instructor: await makeUser("instructor", `${label}-instructor`),
    student: await makeUser("student", `${label}-student`),
    spareStudent: await makeUser("student", `${label}-spare-student`),
  };
  const cookie = async (id: string): Promise<Auth> => ({ cookie: await sessionCookieFor(id) });
  const owner = await cookie(people.owner.id);
  const instructor = await cookie(people.instructor.id);
  const student = await cookie(people.student.id);

  const project = await http("/api/v1/projects", {
    auth: owner,
    json: { name: `${marker.project} project`, kind: "research" },
  });
  const projectId = idOf(project, "project", "id");
  for (const [who, role] of [
    [people.editor, "editor"],
    [people.viewer, "viewer"],
    [people.spare, "viewer"],
  ] as const) {
    const m = await http(`/api/v1/projects/${projectId}/members`, {
      auth: owner,
      json: { email: who.email, role },
    });
    expect(m.status, m.text).toBe(201);
  }
  const arm = await http(`/api/v1/projects/${projectId}/arms`, {
    auth: owner,
    json: { name: `${marker.project} arm`, description: demoArm.description },
  });
  const armId = idOf(arm, "arm", "id");
  const plan = await http(`/api/v1/projects/${projectId}/plans`, {
    auth: owner,
    json: { name: `${marker.project} plan`, armId: demoArm.id },
  });
  const planId = idOf(plan, "plan", "id");
  const saved = await http(`/api/v1/plans/${planId}/versions`, {
    auth: owner,
    json: { baseVersion: 0, document: gentlePlan() },
  });
  expect(saved.status, saved.text).toBe(201);
  const spare = await http(`/api/v1/projects/${projectId}/plans`, {
    auth: owner,
    json: { name: `${marker.project} spare plan`, armId: demoArm.id },
  });
  const recording = await http(
    `/api/v1/projects/${projectId}/recordings?name=${encodeURIComponent(`${marker.project} recording`)}`,
    { auth: owner, body: recordingCsv, headers: { "content-type": "text/csv" } },
  );
  const recordingId = idOf(recording, "recording", "id");
  const token = await http("/api/v1/tokens", { auth: owner, json: { name: "spare" } });
  const revoked = await http("/api/v1/tokens", { auth: owner, json: { name: "revoked" } });
  const gone = await http(`/api/v1/tokens/${idOf(revoked, "id")}`, { method: "DELETE", auth: owner });
  expect(gone.status, gone.text).toBe(200);

  const course = await http("/api/v1/courses", {
    auth: instructor,
    json: { title: `${marker.course} course`, term: "Autumn" },
  });
  const courseId = idOf(course, "course", "id");
  const joinCode = idOf(course, "course", "joinCode");
  for (const who of [people.student, people.spareStudent]) {
    const j = await http("/api/v1/courses/join", { auth: await cookie(who.id), json: { code: joinCode } });
    expect(j.status, j.text).toBe(200);
  }
  const revision = await demoArmRevision();
  const assignment = await http(`/api/v1/courses/${courseId}/assignments`, {
    auth: instructor,
    json: {
      title: `${marker.course} assignment`,
      dueAt: new Date(Date.now() + 86_400_000).toISOString(),
      requiredArmRevisionId: revision.id,
    },
  });
  const assignmentId = idOf(assignment, "assignment", "id");
  const work = await studentPlan(people.student.id, [baseMovePlan(2)]);
  const submission = await http(`/api/v1/assignments/${assignmentId}/submissions`, {
    auth: student,
    json: { planId: work.planId, versionNumber: 1 },
  });
  const submissionId = idOf(submission, "submission", "id");

  return {
    marker,
    ids: {
      projectId,
      armId,
      planId,
      recordingId,
      courseId,
      assignmentId,
      submissionId,
      tokenId: idOf(token, "id"),
      // no dataset in the matrix: uploading and auditing one needs the worker (tests/e2e/datasets.e2e.ts)
      datasetId: randomUUID(),
      userId: people.spare.id,
    },
    auth: {
      owner,
      editor: await cookie(people.editor.id),
      viewer: await cookie(people.viewer.id),
      instructor,
      student,
      "revoked token": { bearer: idOf(revoked, "token") },
    },
    spareMemberId: people.spare.id,
    spareStudentId: people.spareStudent.id,
    spareUserId: people.spare.id,
    sparePlanId: idOf(spare, "plan", "id"),
    spareTokenId: idOf(token, "id"),
    studentPlanId: work.planId,
  };
}

/** Which world a path belongs to, by its first parameter. */
const projectParams = new Set(["projectId", "armId", "planId", "recordingId", "datasetId"]);
const courseParams = new Set(["courseId", "assignmentId", "submissionId"]);
/** An id of another kind for each parameter (a real id the caller may even be able to read). */
const otherKindOf: Record<string, string> = {
  projectId: "planId",
  armId: "projectId",
  planId: "armId",
  recordingId: "planId",
  datasetId: "projectId",
  courseId: "projectId",
  assignmentId: "courseId",
  submissionId: "assignmentId",
  tokenId: "projectId",
  userId: "projectId",
};

let own: World;
let other: World;
let unrelated: Auth;
let admin: Auth;
let operations: Operation[] = [];

function authOf(caller: Caller): Auth {
  if (caller === "anonymous") return null;
  if (caller === "unrelated user") return unrelated;
  if (caller === "admin") return admin;
  return own.auth[caller]!;
}

/** The request body a caller entitled to the operation would send (valid, so 400 never hides a 401). */
function bodyFor(op: Operation, w: World): { json?: unknown; body?: string; headers?: Record<string, string> } {
  const key = `${op.method.toUpperCase()} ${op.path}`;
  const revisionDoc = { description: demoArm.description };
  const table: Record<string, () => { json?: unknown; body?: string; headers?: Record<string, string> }> = {
    "POST /accounts": () => ({
      json: { email: `matrix-${randomUUID().slice(0, 8)}@example.com`, name: "Matrix", password: "a-long-password-1" },
    }),
    "POST /accounts/password-reset": () => ({ json: { email: `nobody-${randomUUID().slice(0, 8)}@example.com` } }),
    "POST /accounts/password-reset/confirm": () => ({ json: { token: "0".repeat(43), password: "a-long-password-1" } }),
    "POST /accounts/verify-email": () => ({ json: { token: "0".repeat(43) } }),
    "POST /tokens": () => ({ json: { name: "matrix" } }),
    "PATCH /users/{userId}": () => ({ json: { siteRole: "researcher" } }),
    "POST /projects": () => ({ json: { name: "Matrix project" } }),
    "PATCH /projects/{projectId}": () => ({ json: { name: `${w.marker.project} project` } }),
    "POST /projects/{projectId}/members": () => ({ json: { email: "no-account@example.com", role: "viewer" } }),
    "POST /projects/{projectId}/arms": () => ({ json: { name: `arm ${randomUUID()}`, ...revisionDoc } }),
    "POST /projects/{projectId}/arms/import": () => ({
      body: urdf,
      headers: { "content-type": "application/xml" },
    }),
    "POST /arms/{armId}/revisions": () => ({ json: revisionDoc }),
    "POST /projects/{projectId}/plans": () => ({ json: { name: "Matrix plan", armId: demoArm.id } }),
    "POST /plans/{planId}/versions": () => ({ json: { baseVersion: 1, document: gentlePlan() } }),
    "POST /check": () => ({ json: gentlePlan() }),
    "POST /projects/{projectId}/recordings": () => ({ body: recordingCsv, headers: { "content-type": "text/csv" } }),
    "POST /courses": () => ({ json: { title: "Matrix course", term: "Spring" } }),
    "POST /courses/join": () => ({ json: { code: "ZZZZ0000" } }),
    "POST /courses/{courseId}/invitations": () => ({ json: { emails: ["invitee@example.com"] } }),
    "POST /courses/{courseId}/assignments": () => ({
      json: {
        title: "Matrix assignment",
        dueAt: new Date(Date.now() + 86_400_000).toISOString(),
        requiredArmRevisionId: randomUUID(),
      },
    }),
    "POST /assignments/{assignmentId}/submissions": () => ({ json: { planId: w.studentPlanId, versionNumber: 1 } }),
    "POST /reviews/{submissionId}/comments": () => ({ json: { body: "Matrix comment" } }),
    "POST /reviews/{submissionId}/decision": () => ({ json: { decision: "returned", summary: "Matrix" } }),
  };
  return table[key]?.() ?? (op.hasBody ? { json: {} } : {});
}

/** Operations whose body the table above does not make valid: parsing (400/415) may answer before authentication. */
function parsesFirst(op: Operation): boolean {
  return op.hasBody && (op.path.startsWith("/datasets/") || op.path.endsWith("/datasets"));
}

/** The path with its parameters filled for one kind of id. */
function pathFor(op: Operation, kind: IdKind): { url: string; first: string | null } {
  const params = [...op.path.matchAll(/\{(\w+)\}/g)].map((m) => m[1]);
  const first = params[0] ?? null;
  let url = op.path;
  for (const [i, name] of params.entries()) {
    let value: string;
    if (i === 0) {
      const w = kind === "other's" ? other : own;
      if (kind === "malformed") value = "not-an-id";
      else if (kind === "other kind's") value = own.ids[otherKindOf[name]];
      else if (op.method === "delete" && name === "planId") value = w.sparePlanId;
      else if (op.method === "delete" && name === "tokenId") value = w.spareTokenId;
      else value = w.ids[name];
    } else if (name === "version") value = "1";
    else if (name === "index") value = "0";
    else if (name === "userId") {
      const w = kind === "other's" ? other : own;
      value = op.path.startsWith("/courses/") ? w.spareStudentId : w.spareMemberId;
    } else throw new Error(`no value for path parameter ${name} of ${op.path}`);
    url = url.replace(`{${name}}`, value);
  }
  return { url: `/api/v1${url}${op.query}`, first };
}

/** What the answer must (or must not) be; null when only "below 500, no leak" applies. */
function expectation(
  op: Operation,
  caller: Caller,
  kind: IdKind,
  first: string | null,
): { is?: number[]; not?: number[] } | null {
  const parse = parsesFirst(op) ? [400, 415] : [];
  if (op.anonymous) return null;
  if (caller === "anonymous" || caller === "revoked token") {
    if (kind === "malformed" && first) return { is: [404, 401, ...parse] };
    return { is: [401, ...parse] };
  }
  if (!first) return null;
  if (kind === "malformed") return { is: [404] };
  if (first === "userId") {
    if (caller !== "admin") return { is: [403] };
    return kind === "other kind's" ? { is: [404] } : { not: [401, 403, 404] };
  }
  if (kind === "other's" || kind === "other kind's") return { is: [404, ...parse] };
  // own id
  if (first === "tokenId") return caller === "owner" ? { not: [401, 403, 404] } : { is: [404] };
  if (first === "datasetId") return { is: [404, ...parse] };
  if (projectParams.has(first)) {
    // the editor, asked first, may already have deleted the spare plan
    if (caller === "owner") return op.method === "delete" ? { not: [401, 403] } : { not: [401, 403, 404] };
    if (caller === "editor") return { not: [401, 404] };
    // some reads are the owner's alone (the audit log): a viewer may get 403 there, never 401 or 404
    if (caller === "viewer") return op.method === "get" ? { not: [401, 404] } : { is: [403, ...parse] };
    return { is: [404, ...parse] };
  }
  if (courseParams.has(first)) {
    if (caller === "student" || caller === "instructor") return { not: [401, 404] };
    return { is: [404] };
  }
  return null;
}

/** Markers of resources this caller may not see. */
function forbiddenMarkers(caller: Caller): string[] {
  const markers = [other.marker.project, other.marker.course];
  if (!["owner", "editor", "viewer"].includes(caller)) markers.push(own.marker.project);
  if (!["student", "instructor"].includes(caller)) markers.push(own.marker.course);
  return markers;
}

beforeAll(async () => {
  const doc = await http("/api/v1/openapi.json");
  type Parameter = {
    name: string;
    in: string;
    required?: boolean;
    schema: { type?: string; enum?: unknown[]; pattern?: string };
  };
  type Described = { security?: unknown[]; requestBody?: unknown; parameters?: Parameter[] };
  const paths = (doc.body as { paths: Record<string, Record<string, Described>> }).paths;
  const valueOf = (p: Parameter) =>
    p.schema.enum?.[0] ??
    (p.schema.type === "integer" || p.schema.type === "number" || new RegExp(p.schema.pattern ?? "^$").test("1")
      ? 1
      : "matrix");
  operations = Object.entries(paths).flatMap(([path, methods]) =>
    Object.entries(methods).map(([method, o]) => ({
      method: method as Method,
      path,
      anonymous: Array.isArray(o.security) && o.security.length === 0,
      hasBody: o.requestBody !== undefined,
      query: (o.parameters ?? [])
        .filter((p) => p.in === "query" && p.required)
        .reduce((q, p, i) => `${q}${i ? "&" : "?"}${p.name}=${encodeURIComponent(String(valueOf(p)))}`, ""),
    })),
  );
  own = await makeWorld("own");
  other = await makeWorld("other");
  unrelated = { cookie: await sessionCookieFor((await makeUser("researcher", "unrelated")).id) };
  admin = { cookie: await sessionCookieFor((await makeUser("admin", "matrix-admin")).id) };
}, 120_000);

describe("authorisation matrix over HTTP, generated from the server's OpenAPI document", () => {
  it("lists every operation, so a route joins the matrix by being described", () => {
    expect(operations.length).toBeGreaterThanOrEqual(60);
    expect(operations.some((o) => o.path === "/plans/{planId}/versions/{version}/export")).toBe(true);
  });

  it("every operation × caller × kind of id: no 500, nothing of another's resource, and the expected 401/403/404", async () => {
    const failures: string[] = [];
    const statuses = new Map<number, number>();
    let cells = 0;
    let slowestMs = 0;
    const started = performance.now();
    for (const op of operations) {
      const kinds: IdKind[] = op.path.includes("{") ? idKinds : ["own"];
      for (const caller of callers) {
        for (const kind of kinds) {
          const { url, first } = pathFor(op, kind);
          const res = await http(url, { method: op.method.toUpperCase(), auth: authOf(caller), ...bodyFor(op, own) });
          cells++;
          slowestMs = Math.max(slowestMs, res.ms);
          statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
          const cell = `${op.method.toUpperCase()} ${op.path} · ${caller} · ${kind}: ${res.status}`;
          if (res.status >= 500) failures.push(`${cell} (server error ${res.text.slice(0, 120)})`);
          const leaked = forbiddenMarkers(caller).filter((m) => res.text.includes(m));
          if (leaked.length) failures.push(`${cell} leaks ${leaked.join(", ")}`);
          const want = expectation(op, caller, kind, first);
          if (want?.is && !want.is.includes(res.status)) failures.push(`${cell}, expected ${want.is.join("/")}`);
          if (want?.not?.includes(res.status)) failures.push(`${cell}, expected none of ${want.not.join("/")}`);
        }
      }
    }
    console.log(
      `[matrix] ${operations.length} operations, ${cells} cells in ${((performance.now() - started) / 1000).toFixed(1)} s; ` +
        `slowest ${slowestMs.toFixed(0)} ms; statuses ${JSON.stringify(Object.fromEntries([...statuses].sort((a, b) => a[0] - b[0])))}; ` +
        `${failures.length} failures`,
    );
    expect(failures).toEqual([]);
  }, 240_000);
});
