/**
 * The OpenAPI 3.1 description of /api/v1, generated from the same zod schemas the handlers use
 * (zod 4's JSON Schema output, draft 2020-12 — the dialect OpenAPI 3.1 uses, OpenAPI 3.1.0 §4.8.24).
 */
import { z } from "zod";
import * as course from "@/lib/shared/schemas/courses";
import * as review from "@/lib/shared/schemas/reviews";
import * as ds from "@/lib/shared/schemas/datasets";
import { planSchema } from "@/kinematics";
import * as s from "../shared/schemas/api";
import { auditPageQuery, memberPageQuery, projectsPageQuery, timePageQuery } from "./paging";
import { reviewQueueQueryFields } from "./review-queue-paging";

type Json = Record<string, unknown>;

function schemaOf(schema: z.ZodType): Json {
  const out = z.toJSONSchema(schema, { target: "draft-2020-12", io: "input", unrepresentable: "any" }) as Json;
  delete out.$schema;
  return out;
}

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });

function withPlanDocument(schema: Json): Json {
  const properties = (schema.properties ?? {}) as Record<string, Json>;
  return { ...schema, properties: { ...properties, document: ref("PlanDocument") } };
}

type Param = { name: string; in: "path" | "query"; required?: boolean; schema: Json; description?: string };
type Op = {
  method: "get" | "post" | "patch" | "delete";
  path: string;
  summary: string;
  tag: string;
  params?: Param[];
  query?: z.ZodObject;
  body?: Json;
  bodyType?: string;
  ok: number;
  okDescription?: string;
  errors: number[];
  anonymous?: boolean;
};

const uuid = { type: "string", format: "uuid" };

/** What a paged list answers (lib/server/paging.ts). */
const PAGE_DESCRIPTION =
  "One page of the list and `nextCursor`: pass it as `?cursor=` for the next page; null on the last page.";
const p = (name: string): Param => ({ name, in: "path", required: true, schema: uuid });

/** Every operation; a new route adds a line here (and a row to the authorisation-matrix test). */
const operations: Op[] = [
  {
    method: "post",
    path: "/accounts",
    summary:
      "Create an account (student or researcher); 202 whether or not the address has an account (its owner is e-mailed instead)",
    tag: "Accounts",
    body: ref("SignUp"),
    ok: 202,
    errors: [400, 403, 413, 415, 429],
    anonymous: true,
  },
  {
    method: "post",
    path: "/accounts/password-reset",
    summary: "E-mail a one-time password-reset link; 202 whether or not the address has an account",
    tag: "Accounts",
    body: ref("PasswordResetRequest"),
    ok: 202,
    errors: [400, 403, 413, 415],
    anonymous: true,
  },
  {
    method: "post",
    path: "/accounts/password-reset/confirm",
    summary: "Set a new password with the token from the reset e-mail (once; 400 when expired or used)",
    tag: "Accounts",
    body: ref("PasswordResetConfirm"),
    ok: 200,
    errors: [400, 403, 413, 415],
    anonymous: true,
  },
  {
    method: "post",
    path: "/accounts/verify-email",
    summary: "Confirm an e-mail address with the token from the verification e-mail (once)",
    tag: "Accounts",
    body: ref("VerifyEmail"),
    ok: 200,
    errors: [400, 403, 413, 415],
    anonymous: true,
  },
  {
    method: "get",
    path: "/me",
    summary: "The account behind the session or token",
    tag: "Accounts",
    ok: 200,
    errors: [401],
  },
  {
    method: "get",
    path: "/tokens",
    summary:
      "List your API tokens, newest first, a page at a time (signed-in session only: an API token cannot manage tokens)",
    tag: "Tokens",
    query: timePageQuery,
    ok: 200,
    okDescription: PAGE_DESCRIPTION,
    errors: [400, 401, 403],
  },
  {
    method: "post",
    path: "/tokens",
    summary: "Create an API token (shown once; signed-in session only)",
    tag: "Tokens",
    body: ref("CreateToken"),
    ok: 201,
    errors: [400, 401, 403],
  },
  {
    method: "delete",
    path: "/tokens/{tokenId}",
    summary: "Revoke an API token, effective at once (signed-in session only)",
    tag: "Tokens",
    params: [p("tokenId")],
    ok: 200,
    errors: [401, 403, 404],
  },
  { method: "get", path: "/users", summary: "List accounts (admins)", tag: "Accounts", ok: 200, errors: [401, 403] },
  {
    method: "patch",
    path: "/users/{userId}",
    summary: "Change a site role or disable an account (admins)",
    tag: "Accounts",
    params: [p("userId")],
    body: ref("AdminUpdateUser"),
    ok: 200,
    errors: [400, 401, 403, 404, 422],
  },
  {
    method: "get",
    path: "/projects",
    summary: "List your projects, newest activity first, a page at a time",
    tag: "Projects",
    query: projectsPageQuery,
    ok: 200,
    okDescription: PAGE_DESCRIPTION,
    errors: [400, 401],
  },
  {
    method: "post",
    path: "/projects",
    summary: "Create a project (course projects: instructors)",
    tag: "Projects",
    body: ref("CreateProject"),
    ok: 201,
    errors: [400, 401, 403],
  },
  {
    method: "get",
    path: "/projects/{projectId}",
    summary: "Get a project",
    tag: "Projects",
    params: [p("projectId")],
    ok: 200,
    errors: [401, 404],
  },
  {
    method: "patch",
    path: "/projects/{projectId}",
    summary: "Rename or archive a project (owners)",
    tag: "Projects",
    params: [p("projectId")],
    body: ref("UpdateProject"),
    ok: 200,
    errors: [400, 401, 403, 404],
  },
  {
    method: "get",
    path: "/projects/{projectId}/members",
    summary: "List members by e-mail, a page at a time",
    tag: "Projects",
    params: [p("projectId")],
    query: memberPageQuery,
    ok: 200,
    okDescription: PAGE_DESCRIPTION,
    errors: [400, 401, 404],
  },
  {
    method: "post",
    path: "/projects/{projectId}/members",
    summary: "Add a member or change their role (owners)",
    tag: "Projects",
    params: [p("projectId")],
    body: ref("AddMember"),
    ok: 201,
    errors: [400, 401, 403, 404, 422],
  },
  {
    method: "delete",
    path: "/projects/{projectId}/members/{userId}",
    summary: "Remove a member (owners)",
    tag: "Projects",
    params: [p("projectId"), p("userId")],
    ok: 200,
    errors: [401, 403, 404, 422],
  },
  {
    method: "get",
    path: "/projects/{projectId}/audit",
    summary: "Who did what in a project, newest first, a page at a time (owners)",
    tag: "Projects",
    params: [p("projectId")],
    query: auditPageQuery,
    ok: 200,
    okDescription: PAGE_DESCRIPTION,
    errors: [400, 401, 403, 404],
  },
  {
    method: "get",
    path: "/arms",
    summary: "Built-in arms and your projects' arms",
    tag: "Arms",
    ok: 200,
    errors: [401],
  },
  {
    method: "get",
    path: "/projects/{projectId}/arms",
    summary: "Arms usable in a project",
    tag: "Arms",
    params: [p("projectId")],
    ok: 200,
    errors: [401, 404],
  },
  {
    method: "post",
    path: "/projects/{projectId}/arms",
    summary: "Create a custom arm with its first revision",
    tag: "Arms",
    params: [p("projectId")],
    body: ref("CreateArm"),
    ok: 201,
    errors: [400, 401, 403, 404, 409],
  },
  {
    method: "post",
    path: "/projects/{projectId}/arms/import",
    summary: "Import a custom arm from a URDF file",
    tag: "Arms",
    params: [p("projectId")],
    query: s.importUrdfQuery,
    body: { type: "string", description: "The URDF file (XML)" },
    bodyType: "application/xml",
    ok: 201,
    errors: [400, 401, 403, 404, 409, 413, 415, 422],
  },
  {
    method: "get",
    path: "/arms/{armId}",
    summary: "An arm and its revisions",
    tag: "Arms",
    params: [p("armId")],
    ok: 200,
    errors: [401, 404],
  },
  {
    method: "post",
    path: "/arms/{armId}/revisions",
    summary: "Add a revision to a custom arm (revisions are immutable)",
    tag: "Arms",
    params: [p("armId")],
    body: ref("CreateArmRevision"),
    ok: 201,
    errors: [400, 401, 403, 404],
  },
  {
    method: "get",
    path: "/projects/{projectId}/plans",
    summary: "List a project's plans, most recently changed first, a page at a time",
    tag: "Plans",
    params: [p("projectId")],
    query: timePageQuery,
    ok: 200,
    okDescription: PAGE_DESCRIPTION,
    errors: [400, 401, 404],
  },
  {
    method: "post",
    path: "/projects/{projectId}/plans",
    summary: "Create a plan",
    tag: "Plans",
    params: [p("projectId")],
    body: ref("CreatePlan"),
    ok: 201,
    errors: [400, 401, 403, 404, 422],
  },
  {
    method: "get",
    path: "/plans/{planId}",
    summary: "Get a plan",
    tag: "Plans",
    params: [p("planId")],
    ok: 200,
    errors: [401, 404],
  },
  {
    method: "delete",
    path: "/plans/{planId}",
    summary: "Delete a plan and its versions",
    tag: "Plans",
    params: [p("planId")],
    ok: 200,
    errors: [401, 403, 404],
  },
  {
    method: "get",
    path: "/plans/{planId}/versions",
    summary: "List a plan's versions, newest first, a page at a time",
    tag: "Versions",
    params: [p("planId")],
    query: timePageQuery,
    ok: 200,
    okDescription: PAGE_DESCRIPTION,
    errors: [400, 401, 404],
  },
  {
    method: "post",
    path: "/plans/{planId}/versions",
    summary: "Save a version: checked on the server; 409 when baseVersion is stale",
    tag: "Versions",
    params: [p("planId")],
    body: ref("CreateVersion"),
    ok: 201,
    errors: [400, 401, 403, 404, 409, 413, 422],
  },
  {
    method: "get",
    path: "/plans/{planId}/versions/{version}",
    summary: "Get a version with its document",
    tag: "Versions",
    params: [p("planId"), { name: "version", in: "path", required: true, schema: { type: "integer", minimum: 1 } }],
    ok: 200,
    errors: [401, 404],
  },
  {
    method: "get",
    path: "/plans/{planId}/versions/{version}/export",
    summary: "Export the checked waypoint list (JSON or CSV) with report, arm revision and SHA-256",
    tag: "Versions",
    params: [p("planId"), { name: "version", in: "path", required: true, schema: { type: "integer", minimum: 1 } }],
    query: s.exportQuery,
    ok: 200,
    okDescription: "JSON: a plan document with an `export` field; CSV: comment lines, header, rows, `# sha256:` line",
    errors: [400, 401, 404, 422],
  },
  {
    method: "get",
    path: "/plans/{planId}/diff",
    summary: "Field-by-field difference of two versions",
    tag: "Versions",
    params: [p("planId")],
    query: s.diffQuery,
    ok: 200,
    errors: [400, 401, 404],
  },
  {
    method: "post",
    path: "/check",
    summary: "Check a plan document; nothing is stored",
    tag: "Check",
    body: ref("PlanDocument"),
    ok: 200,
    errors: [400, 401, 413, 415],
  },
  {
    method: "get",
    path: "/projects/{projectId}/recordings",
    summary: "List a project's recordings, newest first, a page at a time",
    tag: "Recordings",
    params: [p("projectId")],
    query: timePageQuery,
    ok: 200,
    okDescription: PAGE_DESCRIPTION,
    errors: [400, 401, 404],
  },
  {
    method: "post",
    path: "/projects/{projectId}/recordings",
    summary: "Upload a recording (CSV `t,<joint names…>`); stream-checked when armId is given",
    tag: "Recordings",
    params: [p("projectId")],
    query: s.uploadRecordingQuery,
    body: { type: "string", description: "The CSV file" },
    bodyType: "text/csv",
    ok: 201,
    errors: [400, 401, 403, 404, 413, 415, 422],
  },
  {
    method: "get",
    path: "/recordings/{recordingId}/file",
    summary: "Download a recording's CSV",
    tag: "Recordings",
    params: [p("recordingId")],
    ok: 200,
    errors: [401, 404],
  },
  {
    method: "get",
    path: "/courses",
    summary: "Courses you teach or are enrolled in (join codes for instructors only)",
    tag: "Courses",
    ok: 200,
    errors: [401],
  },
  {
    method: "post",
    path: "/courses",
    summary: "Create a course and get its join code and invitation link (instructors)",
    tag: "Courses",
    body: ref("CreateCourse"),
    ok: 201,
    errors: [400, 401, 403, 413, 415, 422],
  },
  {
    method: "post",
    path: "/courses/join",
    summary: "Join a course as a student with its join code",
    tag: "Courses",
    body: ref("JoinCourse"),
    ok: 200,
    errors: [400, 401, 403, 404],
  },
  {
    method: "get",
    path: "/courses/{courseId}",
    summary: "A course (instructors also get the join code and invitation link)",
    tag: "Courses",
    params: [p("courseId")],
    ok: 200,
    errors: [401, 404],
  },
  {
    method: "get",
    path: "/courses/{courseId}/roster",
    summary: "Instructors and students of a course (instructors)",
    tag: "Courses",
    params: [p("courseId")],
    ok: 200,
    errors: [401, 403, 404],
  },
  {
    method: "delete",
    path: "/courses/{courseId}/roster/{userId}",
    summary: "Remove a student; their submissions stay on record (instructors)",
    tag: "Courses",
    params: [p("courseId"), p("userId")],
    ok: 200,
    errors: [401, 403, 404],
  },
  {
    method: "post",
    path: "/courses/{courseId}/invitations",
    summary: "E-mail the join link to a list of addresses (instructors)",
    tag: "Courses",
    params: [p("courseId")],
    body: ref("InviteToCourse"),
    ok: 202,
    errors: [400, 401, 403, 404, 413, 415],
  },
  {
    method: "get",
    path: "/courses/{courseId}/grades",
    summary: "Grades and verdicts as CSV: each student's latest submission per assignment (instructors)",
    tag: "Courses",
    params: [p("courseId")],
    ok: 200,
    okDescription:
      "CSV (text/csv): student, email, assignment, due_at, attempt, submitted_at, late, verdict, status, review_summary",
    errors: [401, 403, 404],
  },
  {
    method: "get",
    path: "/courses/{courseId}/assignments",
    summary: "A course's assignments by due date, each with your status",
    tag: "Assignments",
    params: [p("courseId")],
    ok: 200,
    errors: [401, 404],
  },
  {
    method: "post",
    path: "/courses/{courseId}/assignments",
    summary: "Set an assignment on a required arm revision, with optional poses and stricter limits (instructors)",
    tag: "Assignments",
    params: [p("courseId")],
    body: ref("CreateAssignment"),
    ok: 201,
    errors: [400, 401, 403, 404, 413, 415, 422],
  },
  {
    method: "get",
    path: "/assignments/{assignmentId}",
    summary: "An assignment, for anyone enrolled in its course",
    tag: "Assignments",
    params: [p("assignmentId")],
    ok: 200,
    errors: [401, 404],
  },
  {
    method: "get",
    path: "/assignments/{assignmentId}/submissions",
    summary: "Your own submissions to an assignment, newest first, a page at a time",
    tag: "Submissions",
    params: [p("assignmentId")],
    query: timePageQuery,
    ok: 200,
    okDescription: PAGE_DESCRIPTION,
    errors: [400, 401, 403, 404],
  },
  {
    method: "post",
    path: "/assignments/{assignmentId}/submissions",
    summary:
      "Submit a saved plan version: re-checked on the server against the assignment's rules and limits, then frozen",
    tag: "Submissions",
    params: [p("assignmentId")],
    body: ref("Submit"),
    ok: 201,
    errors: [400, 401, 403, 404, 409, 413, 415, 422],
  },
  {
    method: "get",
    path: "/submissions",
    summary: "Your own submissions across courses, newest first, a page at a time",
    tag: "Submissions",
    query: timePageQuery,
    ok: 200,
    okDescription: PAGE_DESCRIPTION,
    errors: [400, 401],
  },
  {
    method: "get",
    path: "/submissions/{submissionId}",
    summary:
      "A submission: the frozen plan, its report, the review and the comments (its student or the course's instructors)",
    tag: "Submissions",
    params: [p("submissionId")],
    ok: 200,
    errors: [401, 403, 404],
  },
  {
    method: "get",
    path: "/reviews",
    summary:
      "The review queue of the courses you teach, a page at a time: waiting for review first and the longest wait on top, or sorted by a column (its ties in that order), with filters",
    tag: "Reviews",
    query: reviewQueueQueryFields,
    ok: 200,
    okDescription: PAGE_DESCRIPTION,
    errors: [400, 401],
  },
  {
    method: "get",
    path: "/reviews/{submissionId}/comments",
    summary: "The comments on a submission",
    tag: "Reviews",
    params: [p("submissionId")],
    ok: 200,
    errors: [401, 403, 404],
  },
  {
    method: "post",
    path: "/reviews/{submissionId}/comments",
    summary: "Pin a comment to a move, a joint and a time of a submission (instructors)",
    tag: "Reviews",
    params: [p("submissionId")],
    body: ref("Comment"),
    ok: 201,
    errors: [400, 401, 403, 404, 409, 413, 415],
  },
  {
    method: "post",
    path: "/reviews/{submissionId}/decision",
    summary:
      "Approve a submission or return it with a summary (instructors); the student is e-mailed. Approving one whose check found a fault needs confirmFaults: true and a reason (422 otherwise); approval accepts the work and does not clear a plan to run",
    tag: "Reviews",
    params: [p("submissionId")],
    body: ref("Decision"),
    ok: 201,
    errors: [400, 401, 403, 404, 409, 413, 415, 422],
  },
  {
    method: "get",
    path: "/projects/{projectId}/datasets",
    summary: "List a project's datasets (and the upload limit)",
    tag: "Datasets",
    params: [p("projectId")],
    ok: 200,
    errors: [401, 404],
  },
  {
    method: "post",
    path: "/projects/{projectId}/datasets",
    summary:
      "Upload a dataset (one Parquet file, a zip of Parquet or CSV files, or a CSV) with its Content-Length; stored whole or not at all",
    tag: "Datasets",
    params: [p("projectId")],
    query: ds.uploadDatasetQuery,
    body: { type: "string", format: "binary", description: "The dataset file" },
    bodyType: "application/octet-stream",
    ok: 201,
    errors: [400, 401, 403, 404, 413, 422],
  },
  {
    method: "get",
    path: "/datasets/{datasetId}",
    summary: "A dataset with its audit progress and summary (counts by verdict and by finding kind; timed replay)",
    tag: "Datasets",
    params: [p("datasetId")],
    ok: 200,
    errors: [401, 404],
  },
  {
    method: "post",
    path: "/datasets/{datasetId}/preview",
    summary:
      "Read the dataset with an arm and a column mapping: columns and types, episodes, first rows, problems; nothing is saved",
    tag: "Datasets",
    params: [p("datasetId")],
    body: ref("DatasetMapping"),
    ok: 200,
    errors: [400, 401, 404, 422],
  },
  {
    method: "post",
    path: "/datasets/{datasetId}/mapping",
    summary: "Choose the arm revision and column mapping (422 with the file's columns when they cannot be mapped)",
    tag: "Datasets",
    params: [p("datasetId")],
    body: ref("DatasetMapping"),
    ok: 200,
    errors: [400, 401, 403, 404, 409, 422],
  },
  {
    method: "post",
    path: "/datasets/{datasetId}/audit",
    summary: "Start the timed-replay audit of every episode in the background workers",
    tag: "Datasets",
    params: [p("datasetId")],
    ok: 202,
    errors: [401, 403, 404, 422],
  },
  {
    method: "get",
    path: "/datasets/{datasetId}/episodes",
    summary: "The audited episodes: verdict, frames, duration, worst finding",
    tag: "Datasets",
    params: [p("datasetId")],
    ok: 200,
    errors: [401, 404],
  },
  {
    method: "get",
    path: "/datasets/{datasetId}/episodes/{index}",
    summary: "One episode (0-based index): findings, frames, and the repaired frames when repaired",
    tag: "Datasets",
    params: [p("datasetId"), { name: "index", in: "path", required: true, schema: { type: "integer", minimum: 0 } }],
    ok: 200,
    errors: [400, 401, 404, 422],
  },
  {
    method: "get",
    path: "/datasets/{datasetId}/episodes/{index}/replay-plan",
    summary:
      "The episode's replay: ease in from rest, every frame passed through without stopping, ease out; each part checked, what is not checked listed; with the safety caution",
    tag: "Datasets",
    params: [p("datasetId"), { name: "index", in: "path", required: true, schema: { type: "integer", minimum: 0 } }],
    ok: 200,
    errors: [400, 401, 404, 422],
  },
  {
    method: "post",
    path: "/datasets/{datasetId}/repair",
    summary: "Repair the listed episodes or every one with findings; each result is audited again",
    tag: "Datasets",
    params: [p("datasetId")],
    body: ref("RepairDataset"),
    ok: 200,
    errors: [400, 401, 403, 404, 409, 422],
  },
  {
    method: "get",
    path: "/datasets/{datasetId}/export",
    summary:
      "The checked dataset as a zip: dataset.parquet, report.json, manifest.json (SHA-256; `jointproof verify manifest.json`)",
    tag: "Datasets",
    params: [p("datasetId")],
    ok: 200,
    okDescription:
      "A zip archive. A passing audit does not make a replay safe: follow the safety caution in report.json.",
    errors: [401, 404, 409, 422],
  },
];

const statusText: Record<number, string> = {
  400: "Invalid input; `issues` names each field path",
  401: "No valid session or token",
  403: "Your role does not allow this; the message says who can grant access (or a cross-site request with a session cookie)",
  404: "Not found (or not visible to you)",
  409: "Conflict (e.g. a newer version was saved)",
  413: "Body too large",
  415: "Wrong content type",
  422: "Well-formed but not processable",
};

function queryParams(query: z.ZodObject): Param[] {
  const json = schemaOf(query) as { properties?: Record<string, Json>; required?: string[] };
  return Object.entries(json.properties ?? {}).map(([name, schema]) => ({
    name,
    in: "query",
    required: json.required?.includes(name) ?? false,
    schema,
  }));
}

/** The whole OpenAPI 3.1 document. */
export function openApiDocument(serverUrl: string): Json {
  const paths: Record<string, Record<string, Json>> = {};
  for (const op of operations) {
    const parameters = [...(op.params ?? []), ...(op.query ? queryParams(op.query) : [])];
    const responses: Record<string, Json> = {
      [String(op.ok)]: { description: op.okDescription ?? "Success" },
    };
    for (const code of op.errors) {
      responses[String(code)] = {
        description: statusText[code],
        content: { "application/json": { schema: ref("Error") } },
      };
    }
    paths[op.path] ??= {};
    paths[op.path][op.method] = {
      summary: op.summary,
      tags: [op.tag],
      ...(parameters.length ? { parameters } : {}),
      ...(op.body
        ? { requestBody: { required: true, content: { [op.bodyType ?? "application/json"]: { schema: op.body } } } }
        : {}),
      responses,
      ...(op.anonymous ? { security: [] } : {}),
    };
  }
  return {
    openapi: "3.1.0",
    info: {
      title: "Jointproof API",
      version: "1",
      description:
        "Plans, versions, checks and exports for small robot arms. Authenticate with a personal API token as " +
        "`Authorization: Bearer <token>` (RFC 6750) or with a browser session. A passing check is a prediction " +
        "from a model of the arm, not a guarantee that a motion is safe: clamp the arm, clear the workspace, keep " +
        "the emergency stop in reach, run new plans slowly first and follow your lab's rules and the applicable standards. " +
        "Numbering: JSON fields and field paths are 0-based (the first move is `move: 0`, `moves[0]`); messages count " +
        'as people do, from 1 ("Move 1" is the first move; recordings name the file\'s line, the header being line 1).',
    },
    servers: [{ url: `${serverUrl.replace(/\/$/, "")}/api/v1` }],
    security: [{ bearer: [] }, { session: [] }],
    paths,
    components: {
      securitySchemes: {
        bearer: { type: "http", scheme: "bearer", description: "A personal API token (RFC 6750)" },
        session: {
          type: "apiKey",
          in: "cookie",
          name: "jp.session",
          description: "The browser session (`__Secure-jp.session` over HTTPS)",
        },
      },
      schemas: {
        Error: {
          type: "object",
          required: ["error"],
          properties: {
            error: {
              type: "object",
              required: ["code", "message", "issues"],
              properties: {
                code: { type: "string", examples: ["bad_request:validation", "conflict:version"] },
                message: { type: "string" },
                issues: {
                  type: "array",
                  items: {
                    type: "object",
                    required: ["path", "message"],
                    properties: {
                      path: { type: "string", examples: ["document.arm.joints[1].maxVelocity"] },
                      message: { type: "string" },
                    },
                  },
                },
              },
            },
          },
        },
        PlanDocument: schemaOf(planSchema),
        SignUp: schemaOf(s.signUpSchema),
        PasswordResetRequest: schemaOf(s.passwordResetRequestSchema),
        PasswordResetConfirm: schemaOf(s.passwordResetConfirmSchema),
        VerifyEmail: schemaOf(s.verifyEmailSchema),
        CreateCourse: schemaOf(course.createCourseSchema),
        JoinCourse: schemaOf(course.joinCourseSchema),
        DatasetMapping: schemaOf(ds.datasetMappingSchema),
        RepairDataset: schemaOf(ds.repairDatasetSchema),
        InviteToCourse: schemaOf(course.inviteSchema),
        CreateAssignment: schemaOf(course.createAssignmentSchema),
        Submit: schemaOf(course.submitSchema),
        Comment: schemaOf(review.commentSchema),
        Decision: schemaOf(review.decisionSchema),
        CreateToken: schemaOf(s.createTokenSchema),
        AdminUpdateUser: schemaOf(s.adminUpdateUserSchema),
        CreateProject: schemaOf(s.createProjectSchema),
        UpdateProject: schemaOf(s.updateProjectSchema),
        AddMember: schemaOf(s.addMemberSchema),
        CreateArm: schemaOf(s.createArmSchema),
        CreateArmRevision: schemaOf(s.createArmRevisionSchema),
        CreatePlan: schemaOf(s.createPlanSchema),
        // The document is read by the engine's parsePlan (a transform, opaque to JSON Schema): point it at PlanDocument.
        CreateVersion: withPlanDocument(schemaOf(s.createVersionSchema)),
      },
    },
  };
}

/** The operations, for the reference page. */
export function apiOperations(): readonly Op[] {
  return operations;
}
