/**
 * Bad input on every write route: missing fields, wrong types, malformed JSON, the wrong
 * content type, oversized bodies, non-finite and huge numbers, wrong joint counts. Each must be
 * a 4xx naming the field path — never a 500 — and must write nothing.
 */
import "./_env";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "@/db";
import {
  apiTokens,
  armRevisions,
  arms,
  auditLog,
  datasets,
  planVersions,
  plans,
  projectMembers,
  projects,
  users,
} from "@/db/schema";
import { createArm } from "@/db/queries/arms";
import { createDataset } from "@/db/queries/datasets";
import { createPlan } from "@/db/queries/plans";
import { createProject } from "@/db/queries/projects";
import * as accounts from "@/app/api/v1/accounts/route";
import * as passwordReset from "@/app/api/v1/accounts/password-reset/route";
import * as passwordResetConfirm from "@/app/api/v1/accounts/password-reset/confirm/route";
import * as verifyEmail from "@/app/api/v1/accounts/verify-email/route";
import * as tokens from "@/app/api/v1/tokens/route";
import * as user from "@/app/api/v1/users/[userId]/route";
import * as projectsRoute from "@/app/api/v1/projects/route";
import * as project from "@/app/api/v1/projects/[projectId]/route";
import * as members from "@/app/api/v1/projects/[projectId]/members/route";
import * as projectArms from "@/app/api/v1/projects/[projectId]/arms/route";
import * as armRevisionsRoute from "@/app/api/v1/arms/[armId]/revisions/route";
import * as projectPlans from "@/app/api/v1/projects/[projectId]/plans/route";
import * as versions from "@/app/api/v1/plans/[planId]/versions/route";
import * as check from "@/app/api/v1/check/route";
import * as datasetMapping from "@/app/api/v1/datasets/[datasetId]/mapping/route";
import { armSchema } from "@/kinematics";
import { putObject } from "@/lib/server/storage";
import { matrixParquet } from "../datasets/_fixture";
import { call, demoArm, errorOf, gentlePlan, makeUser, tokenFor, type Auth, sessionCookieFor } from "./_helpers";

type Handler = Parameters<typeof call>[0];
type Target = {
  name: string;
  handler: Handler;
  method: string;
  path: () => string;
  params: () => Record<string, string>;
  admin?: boolean;
  session?: boolean;
  needsMailToken?: boolean;
  valid: () => unknown;
};
type BadCase = {
  what: string;
  body?: unknown;
  raw?: string;
  type?: string;
  status: number;
  path?: string;
  /** The message the issue at `path` must carry. */
  message?: string;
};

let auth: Auth;
let adminAuth: Auth;
/** The owner signed in (token management refuses API tokens). */
let sessionAuth: Auth;
let ids: { projectId: string; armId: string; planId: string; userId: string; memberEmail: string; datasetId: string };

beforeAll(async () => {
  const owner = await makeUser("researcher", "bad-input-owner");
  const colleague = await makeUser("student", "bad-input-colleague");
  const admin = await makeUser("admin", "bad-input-admin");
  auth = { bearer: await tokenFor(owner.id) };
  adminAuth = { bearer: await tokenFor(admin.id) };
  sessionAuth = { cookie: await sessionCookieFor(owner.id) };
  const p = await createProject({ name: "Bad input", kind: "research", userId: owner.id });
  const a = await createArm({ projectId: p.id, name: "Arm", description: demoArm.description, userId: owner.id });
  const pl = await createPlan({ projectId: p.id, armId: a!.armId, name: "Plan", userId: owner.id });
  const parquet = matrixParquet(armSchema.parse(demoArm.description));
  const key = `datasets/${p.id}/bad-input.parquet`;
  await putObject(key, parquet, "application/octet-stream");
  const dataset = await createDataset({
    projectId: p.id,
    name: "Bad input dataset",
    objectKey: key,
    fileKind: "parquet",
    sizeBytes: parquet.byteLength,
    sha256: "0".repeat(64),
    armRevisionId: null,
    mapping: {},
    createdBy: owner.id,
  });
  ids = {
    projectId: p.id,
    armId: a!.armId,
    planId: pl.id,
    userId: colleague.id,
    memberEmail: colleague.email,
    datasetId: dataset.id,
  };
});

const doc = () =>
  ({ ...gentlePlan(), arm: demoArm.description }) as unknown as Record<string, unknown> & {
    moves: Record<string, unknown>[];
    arm: { joints: Record<string, unknown>[] };
  };
const withMove = (patch: Record<string, unknown>) => {
  const d = doc();
  d.moves = [{ ...d.moves[0], ...patch }];
  return d;
};
const withJoint = (j: number, patch: Record<string, unknown>) => {
  const d = doc();
  d.arm = { ...d.arm, joints: d.arm.joints.map((joint, i) => (i === j ? { ...joint, ...patch } : joint)) };
  return d;
};

/** The document with joint j's `from` field renamed to `to` (a misspelt key keeps its value). */
const withJointKeyRenamed = (j: number, from: string, to: string) => {
  const d = doc();
  d.arm = {
    ...d.arm,
    joints: d.arm.joints.map((joint, i) => {
      if (i !== j) return joint;
      const { [from]: value, ...rest } = joint;
      return { ...rest, [to]: value ?? 1 };
    }),
  };
  return d;
};

/** An unknown key is refused at its own path, with the known key it was probably meant to be. */
const didYouMean = (name: string) => `is not a known field; did you mean "${name}"?`;

/** Bad plan documents, with the field path each must be refused at (relative to the document). */
const badDocuments: {
  what: string;
  document?: unknown;
  raw?: (prefix: string) => string;
  path: string;
  message?: string;
}[] = [
  { what: "a start pose with one value too few", document: { ...doc(), start: [0, 0, 0, 0, 0, 0] }, path: "start" },
  {
    what: "a goal pose with one value too many",
    document: withMove({ goal: [0, 0, 0, 0, 0, 0, 0, 0] }),
    path: "moves[0].goal",
  },
  { what: "a negative duration", document: withMove({ duration: -1 }), path: "moves[0].duration" },
  { what: "a duration given as text", document: withMove({ duration: "2" }), path: "moves[0].duration" },
  { what: "NaN sent as text", document: withMove({ duration: "NaN" }), path: "moves[0].duration" },
  { what: "an unknown shape", document: withMove({ shape: "wobble" }), path: "moves[0].shape" },
  { what: "a zero velocity limit", document: withJoint(1, { maxVelocity: 0 }), path: "arm.joints[1].maxVelocity" },
  { what: "min above max", document: withJoint(2, { min: 1, max: -1 }), path: "arm.joints[2].max" },
  { what: "a missing format", document: { ...doc(), format: undefined }, path: "format" },
  {
    what: "a misspelt acceleration limit (maxAccelaration), which would otherwise leave the joint unlimited",
    document: withJointKeyRenamed(2, "maxAcceleration", "maxAccelaration"),
    path: "arm.joints[2].maxAccelaration",
    message: didYouMean("maxAcceleration"),
  },
  {
    what: "a misspelt keep-out list (keepOutt), which would otherwise be ignored",
    document: { ...doc(), keepOutt: [{ min: [0.2, -0.1, 0], max: [0.4, 0.1, 0.3] }] },
    path: "keepOutt",
    message: didYouMean("keepOut"),
  },
  {
    what: "a number too large for a double (1e400 parses as Infinity)",
    raw: (prefix) =>
      JSON.stringify(prefix ? { baseVersion: 0, document: doc() } : doc()).replace('"duration":2', '"duration":1e400'),
    path: "moves[0].duration",
  },
];

const targets: Target[] = [
  {
    name: "POST /accounts",
    handler: accounts.POST,
    method: "POST",
    path: () => "/api/v1/accounts",
    params: () => ({}),
    valid: () => ({ email: "x@example.com", name: "X", password: "long-enough-1" }),
  },
  {
    name: "POST /accounts/password-reset",
    handler: passwordReset.POST,
    method: "POST",
    path: () => "/api/v1/accounts/password-reset",
    params: () => ({}),
    valid: () => ({ email: "bad-input-nobody@example.com" }),
  },
  // A valid body needs a real token from an e-mail: tests/integration/accounts covers the accepted case.
  {
    name: "POST /accounts/password-reset/confirm",
    handler: passwordResetConfirm.POST,
    method: "POST",
    path: () => "/api/v1/accounts/password-reset/confirm",
    params: () => ({}),
    needsMailToken: true,
    valid: () => ({ token: "D".repeat(43), password: "long-enough-pass-1" }),
  },
  {
    name: "POST /accounts/verify-email",
    handler: verifyEmail.POST,
    method: "POST",
    path: () => "/api/v1/accounts/verify-email",
    params: () => ({}),
    needsMailToken: true,
    valid: () => ({ token: "E".repeat(43) }),
  },
  {
    name: "POST /tokens",
    handler: tokens.POST,
    method: "POST",
    path: () => "/api/v1/tokens",
    params: () => ({}),
    session: true,
    valid: () => ({ name: "ci" }),
  },
  {
    name: "PATCH /users/:id",
    handler: user.PATCH,
    method: "PATCH",
    path: () => `/api/v1/users/${ids.userId}`,
    params: () => ({ userId: ids.userId }),
    admin: true,
    valid: () => ({ siteRole: "researcher" }),
  },
  {
    name: "POST /projects",
    handler: projectsRoute.POST,
    method: "POST",
    path: () => "/api/v1/projects",
    params: () => ({}),
    valid: () => ({ name: "P" }),
  },
  {
    name: "PATCH /projects/:id",
    handler: project.PATCH,
    method: "PATCH",
    path: () => `/api/v1/projects/${ids.projectId}`,
    params: () => ({ projectId: ids.projectId }),
    valid: () => ({ name: "P" }),
  },
  {
    name: "POST /projects/:id/members",
    handler: members.POST,
    method: "POST",
    path: () => `/api/v1/projects/${ids.projectId}/members`,
    params: () => ({ projectId: ids.projectId }),
    valid: () => ({ email: ids.memberEmail, role: "viewer" }),
  },
  {
    name: "POST /projects/:id/arms",
    handler: projectArms.POST,
    method: "POST",
    path: () => `/api/v1/projects/${ids.projectId}/arms`,
    params: () => ({ projectId: ids.projectId }),
    valid: () => ({ name: "A", description: demoArm.description }),
  },
  {
    name: "POST /arms/:id/revisions",
    handler: armRevisionsRoute.POST,
    method: "POST",
    path: () => `/api/v1/arms/${ids.armId}/revisions`,
    params: () => ({ armId: ids.armId }),
    valid: () => ({ description: demoArm.description }),
  },
  {
    name: "POST /projects/:id/plans",
    handler: projectPlans.POST,
    method: "POST",
    path: () => `/api/v1/projects/${ids.projectId}/plans`,
    params: () => ({ projectId: ids.projectId }),
    valid: () => ({ name: "P", armId: ids.armId }),
  },
  {
    name: "POST /plans/:id/versions",
    handler: versions.POST,
    method: "POST",
    path: () => `/api/v1/plans/${ids.planId}/versions`,
    params: () => ({ planId: ids.planId }),
    valid: () => ({ baseVersion: 0, document: doc() }),
  },
  {
    name: "POST /check",
    handler: check.POST,
    method: "POST",
    path: () => "/api/v1/check",
    params: () => ({}),
    valid: () => doc(),
  },
  {
    name: "POST /datasets/:id/mapping",
    handler: datasetMapping.POST,
    method: "POST",
    path: () => `/api/v1/datasets/${ids.datasetId}/mapping`,
    params: () => ({ datasetId: ids.datasetId }),
    valid: () => ({ armId: ids.armId, mapping: {} }),
  },
];

/** Cases every write route must refuse, whatever its body looks like. */
const generalCases: BadCase[] = [
  { what: "malformed JSON", raw: '{"name": ', status: 400, path: "(body)" },
  { what: "a JSON array instead of an object", body: [1, 2, 3], status: 400 },
  { what: "a plain-text content type", raw: "{}", type: "text/plain", status: 415 },
  { what: "a body over the size limit", raw: JSON.stringify({ name: "x".repeat(1_100_000) }), status: 413 },
  // PostgreSQL text cannot hold NUL; a lone surrogate is not Unicode text; RFC 8259 §8.1 forbids a byte-order mark.
  { what: "a NUL character in a string", raw: '{"name":"a\\u0000b"}', status: 400, path: "name" },
  { what: "a lone surrogate in a string", raw: '{"name":"a\\ud800"}', status: 400, path: "name" },
  { what: "a byte-order mark before the JSON", raw: "\ufeff{}", status: 400 },
  { what: "JSON nested 10,000 levels deep", raw: `{"name":${"[".repeat(10_000)}${"]".repeat(10_000)}}`, status: 400 },
];

/** Route-specific cases: the field each must name. */
const specificCases: Record<string, BadCase[]> = {
  "POST /accounts": [
    { what: "no fields", body: {}, status: 400, path: "email" },
    {
      what: "a short password",
      body: { email: "a@example.com", name: "A", password: "short" },
      status: 400,
      path: "password",
    },
    {
      what: "a bad e-mail",
      body: { email: "not-an-address", name: "A", password: "long-enough-1" },
      status: 400,
      path: "email",
    },
    {
      what: "a site role that cannot be chosen",
      body: { email: "a@example.com", name: "A", password: "long-enough-1", siteRole: "admin" },
      status: 400,
      path: "siteRole",
    },
  ],
  "POST /accounts/password-reset": [
    { what: "no e-mail", body: {}, status: 400, path: "email" },
    { what: "a bad e-mail", body: { email: "not-an-address" }, status: 400, path: "email" },
    { what: "an e-mail as a number", body: { email: 42 }, status: 400, path: "email" },
    { what: "an unknown field", body: { email: "a@example.com", admin: true }, status: 400, path: "admin" },
  ],
  "POST /accounts/password-reset/confirm": [
    { what: "no token", body: { password: "long-enough-pass-1" }, status: 400, path: "token" },
    {
      what: "a token with spaces",
      body: { token: "not a token", password: "long-enough-pass-1" },
      status: 400,
      path: "token",
    },
    { what: "a short password", body: { token: "D".repeat(43), password: "short" }, status: 400, path: "password" },
    {
      what: "a password over 72 bytes",
      body: { token: "D".repeat(43), password: "é".repeat(40) },
      status: 400,
      path: "password",
    },
    {
      what: "a token nobody was sent",
      body: { token: "D".repeat(43), password: "long-enough-pass-1" },
      status: 400,
      path: "token",
    },
  ],
  "POST /accounts/verify-email": [
    { what: "no token", body: {}, status: 400, path: "token" },
    { what: "a token as a number", body: { token: 7 }, status: 400, path: "token" },
    { what: "a token nobody was sent", body: { token: "E".repeat(43) }, status: 400, path: "token" },
  ],
  "POST /tokens": [
    { what: "no name", body: {}, status: 400, path: "name" },
    { what: "a zero expiry", body: { name: "t", expiresInDays: 0 }, status: 400, path: "expiresInDays" },
    { what: "a huge expiry", body: { name: "t", expiresInDays: 1e12 }, status: 400, path: "expiresInDays" },
  ],
  "PATCH /users/:id": [
    { what: "no fields", body: {}, status: 400, path: "siteRole" },
    { what: "an unknown role", body: { siteRole: "superuser" }, status: 400, path: "siteRole" },
    { what: "disabled as text", body: { disabled: "yes" }, status: 400, path: "disabled" },
  ],
  "POST /projects": [
    { what: "no name", body: {}, status: 400, path: "name" },
    { what: "a number as name", body: { name: 42 }, status: 400, path: "name" },
    { what: "a name of 121 characters", body: { name: "n".repeat(121) }, status: 400, path: "name" },
    { what: "an unknown kind", body: { name: "P", kind: "lab" }, status: 400, path: "kind" },
    { what: "an unknown field", body: { name: "P", owner: "me" }, status: 400, path: "owner" },
  ],
  "PATCH /projects/:id": [
    { what: "no fields", body: {}, status: 400, path: "name" },
    { what: "archived as text", body: { archived: "true" }, status: 400, path: "archived" },
  ],
  "POST /projects/:id/members": [
    { what: "a bad e-mail", body: { email: "nobody", role: "viewer" }, status: 400, path: "email" },
    { what: "an unknown role", body: { email: "x@example.com", role: "boss" }, status: 400, path: "role" },
  ],
  "POST /projects/:id/arms": [
    { what: "no description", body: { name: "A" }, status: 400, path: "description" },
    {
      what: "a joint with min above max",
      body: { name: "A", description: withJoint(0, { min: 2, max: 1 }).arm },
      status: 400,
      path: "description.joints[0].max",
    },
    {
      what: "repeated joint names",
      body: { name: "A", description: withJoint(1, { name: "base" }).arm },
      status: 400,
      path: "description.joints[1].name",
    },
    {
      what: "a negative control rate",
      body: { name: "A", description: { ...demoArm.description, controlRateHz: -1000 } },
      status: 400,
      path: "description.controlRateHz",
    },
    {
      what: "a misspelt acceleration limit",
      body: { name: "A", description: withJointKeyRenamed(2, "maxAcceleration", "maxAccelaration").arm },
      status: 400,
      path: "description.joints[2].maxAccelaration",
      message: didYouMean("maxAcceleration"),
    },
  ],
  "POST /arms/:id/revisions": [
    {
      what: "no joints",
      body: { description: { ...demoArm.description, joints: [] } },
      status: 400,
      path: "description.joints",
    },
    {
      what: "an infinite velocity limit (as text)",
      body: { description: withJoint(3, { maxVelocity: "Infinity" }).arm },
      status: 400,
      path: "description.joints[3].maxVelocity",
    },
    {
      what: "a misspelt acceleration limit",
      body: { description: withJointKeyRenamed(2, "maxAcceleration", "maxAccelaration").arm },
      status: 400,
      path: "description.joints[2].maxAccelaration",
      message: didYouMean("maxAcceleration"),
    },
    {
      what: "a speed limit in the wrong letter case",
      body: { description: withJointKeyRenamed(0, "maxVelocity", "MaxVelocity").arm },
      status: 400,
      path: "description.joints[0].MaxVelocity",
      message: didYouMean("maxVelocity"),
    },
  ],
  "POST /projects/:id/plans": [
    { what: "no arm", body: { name: "P" }, status: 400, path: "armId" },
    { what: "an arm id that is not an id", body: { name: "P", armId: "arm-1" }, status: 400, path: "armId" },
    {
      what: "a misspelt arm id field",
      body: { name: "P", armid: "00000000-0000-4000-8000-000000000201" },
      status: 400,
      path: "armid",
      message: didYouMean("armId"),
    },
  ],
  "POST /plans/:id/versions": [
    { what: "no base version", body: { document: doc() }, status: 400, path: "baseVersion" },
    { what: "a base version as text", body: { baseVersion: "0", document: doc() }, status: 400, path: "baseVersion" },
    {
      what: "a fractional base version",
      body: { baseVersion: 0.5, document: doc() },
      status: 400,
      path: "baseVersion",
    },
    { what: "no document", body: { baseVersion: 0 }, status: 400, path: "document" },
    {
      what: "a plan lasting ten million seconds",
      body: { baseVersion: 0, document: withMove({ duration: 1e7 }) },
      status: 422,
      path: "document.moves",
    },
    ...badDocuments.map((d) =>
      d.raw
        ? { what: d.what, raw: d.raw("document"), status: 400, path: `document.${d.path}` }
        : {
            what: d.what,
            body: { baseVersion: 0, document: d.document },
            status: 400,
            path: `document.${d.path}`,
            message: d.message,
          },
    ),
  ],
  "POST /check": [
    ...badDocuments.map((d) =>
      d.raw
        ? { what: d.what, raw: d.raw(""), status: 400, path: d.path }
        : { what: d.what, body: d.document, status: 400, path: d.path, message: d.message },
    ),
    {
      what: "a plan lasting ten million seconds (too long to check in one request)",
      body: withMove({ duration: 1e7 }),
      status: 422,
      path: "moves",
    },
  ],
  "POST /datasets/:id/mapping": [
    { what: "no arm", body: { mapping: {} }, status: 400, path: "armId" },
    {
      what: "a misspelt time column field, which would otherwise audit with the default time column",
      body: { armId: "00000000-0000-4000-8000-000000000201", mapping: { timeColum: "t" } },
      status: 400,
      path: "mapping.timeColum",
      message: didYouMean("timeColumn"),
    },
    {
      what: "a misspelt revision field",
      body: { armId: "00000000-0000-4000-8000-000000000201", revison: 1 },
      status: 400,
      path: "revison",
      message: didYouMean("revision"),
    },
  ],
};

async function counts() {
  const tables = {
    users,
    projects,
    projectMembers,
    arms,
    armRevisions,
    plans,
    planVersions,
    apiTokens,
    auditLog,
    datasets,
  };
  const out: Record<string, number> = {};
  for (const [name, table] of Object.entries(tables)) out[name] = await db.$count(table);
  return out;
}

const cases = targets.flatMap((t) =>
  [...generalCases, ...(specificCases[t.name] ?? [])].map((c) => ({ target: t, ...c })),
);

describe("bad input on every write route", () => {
  it("has specific cases for every write route", () => {
    for (const t of targets) expect(specificCases[t.name]?.length ?? 0, t.name).toBeGreaterThan(0);
  });

  it("accepts each route's valid body (so the refusals below are about the bad field)", async () => {
    for (const t of targets.filter((t) => t.name !== "POST /accounts" && !t.needsMailToken)) {
      const res = await call(t.handler, {
        method: t.method,
        path: t.path(),
        params: t.params(),
        auth: t.admin ? adminAuth : t.session ? sessionAuth : auth,
        body: t.valid(),
      });
      expect(res.status, `${t.name}: ${res.text}`).toBeLessThan(300);
    }
  });

  it.each(cases)("$target.name refuses $what with $status", async (c) => {
    const before = await counts();
    const res = await call(c.target.handler, {
      method: c.target.method,
      path: c.target.path(),
      params: c.target.params(),
      auth: c.target.admin ? adminAuth : c.target.session ? sessionAuth : auth,
      ...(c.raw !== undefined
        ? { rawBody: c.raw, headers: { "content-type": c.type ?? "application/json" } }
        : { body: c.body }),
    });
    expect(res.status, res.text).toBe(c.status);
    const error = errorOf(res);
    expect(typeof error.code).toBe("string");
    expect(typeof error.message).toBe("string");
    if (c.path) expect(error.issues.map((i) => i.path)).toContain(c.path);
    if (c.message) expect(error.issues.find((i) => i.path === c.path)?.message).toBe(c.message);
    expect(await counts()).toEqual(before);
  });
});

// The upload limits and the arm revisions a course may name, here beside the other bad input
// (their own tests: recordings.test.ts, recordings-stream.test.ts, tests/security/uploads.probe.ts,
// tests/integration/courses/authorization.test.ts).
describe("bad input: uploads over the limit and arm revisions one cannot read", () => {
  it("refuses a recording upload over the limit with 413, declared or streamed, and stores nothing", async () => {
    const { env } = await import("@/lib/server/env");
    const upload = await import("@/app/api/v1/projects/[projectId]/recordings/route");
    const { recordings } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    const limit = env().UPLOAD_LIMIT_BYTES;
    const url = `http://127.0.0.1/api/v1/projects/${ids.projectId}/recordings?name=Over`;
    const headers = { "content-type": "text/csv", authorization: `Bearer ${(auth as { bearer: string }).bearer}` };
    const params = { params: Promise.resolve({ projectId: ids.projectId }) };
    // declared: refused from the headers, before any of the body is read
    let pulled = 0;
    const declared = new ReadableStream<Uint8Array>({
      pull(controller) {
        pulled++;
        controller.enqueue(new Uint8Array(1024));
      },
    });
    const first = await upload.POST(
      new Request(url, {
        method: "POST",
        headers: { ...headers, "content-length": String(limit + 1) },
        body: declared,
        duplex: "half",
      } as RequestInit),
      params,
    );
    expect(first.status).toBe(413);
    expect(pulled).toBeLessThanOrEqual(1); // a stream may be asked for its first chunk when it is made
    // streamed (no length): refused once the count passes the limit
    const chunk = new TextEncoder().encode("0,0\n".repeat(16_384));
    let sent = 0;
    const streamed = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (sent > limit + chunk.byteLength) return controller.close();
        sent += chunk.byteLength;
        controller.enqueue(chunk);
      },
    });
    const second = await upload.POST(
      new Request(url, { method: "POST", headers, body: streamed, duplex: "half" } as RequestInit),
      params,
    );
    expect(second.status).toBe(413);
    expect(((await second.json()) as { error: { code: string } }).error.code).toBe("payload_too_large");
    const stored = await db.select().from(recordings).where(eq(recordings.projectId, ids.projectId));
    expect(stored.filter((r) => r.name === "Over")).toEqual([]);
  });

  it("refuses a course on another project's private arm revision with 422, in the same words as an id that does not exist", async () => {
    const courses = await import("@/app/api/v1/courses/route");
    const stranger = await makeUser("researcher", "bad-input-stranger");
    const theirs = await createProject({ name: "Private", kind: "research", userId: stranger.id });
    const secret = await createArm({
      projectId: theirs.id,
      name: "Secret arm",
      description: demoArm.description,
      userId: stranger.id,
    });
    const instructor = await makeUser("instructor", "bad-input-instructor");
    const as = { bearer: await tokenFor(instructor.id) };
    const attempt = (requiredArmRevisionId: string) =>
      call(courses.POST, {
        method: "POST",
        path: "/api/v1/courses",
        auth: as,
        body: { title: "Course", term: "Spring", requiredArmRevisionId },
      });
    const existing = await attempt(secret!.revision.id);
    const missing = await attempt("00000000-0000-4000-8000-000000000000");
    expect(existing.status).toBe(422);
    expect(missing.status).toBe(422);
    // nothing tells the two apart: the revision's existence is not revealed
    const words = (r: typeof existing) => {
      const { code, message, issues } = errorOf(r);
      return { code, message, issues };
    };
    expect(words(existing)).toEqual(words(missing));
    expect(JSON.stringify(existing.body)).not.toContain("Secret arm");
  });
});
