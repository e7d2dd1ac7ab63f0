/**
 * Typed fetch wrappers over the /api/v1 routes, for TanStack Query in client components. Every
 * failure becomes an {@link ApiError} carrying the API's one error shape (code, message, field issues).
 */
import type { z } from "zod";
import { meansUnreachable, reportReachable, reportUnavailable } from "./connection";
import type { ArmListItem } from "@/db/queries/arms";
import type { AssignmentListItem, CourseForUser, MySubmission, RosterEntry } from "@/db/queries/courses";
import type { CommentItem, SubmissionForUser } from "@/db/queries/reviews";
import type { Assignment, Review, Submission } from "@/db/schema/courses";
import type { ProjectForUser } from "@/db/queries/projects";
import type { PlanListItem, VersionListItem } from "@/db/queries/plans";
import type { ArmRevision } from "@/db/schema/arms";
import type { PlanVersion } from "@/db/schema/plans";
import type { Report } from "@/kinematics";
import type { RuleProblem } from "@/lib/shared/courses/rules";
import type { Change } from "@/lib/shared/plan-diff";
import type {
  createAssignmentSchema,
  createCourseSchema,
  inviteSchema,
  submitSchema,
} from "@/lib/shared/schemas/courses";
import type { commentSchema, decisionSchema } from "@/lib/shared/schemas/reviews";

/** A type as it arrives over JSON: dates become ISO strings. */
export type Jsonified<T> = T extends Date
  ? string
  : T extends (infer U)[]
    ? Jsonified<U>[]
    : T extends object
      ? { [K in keyof T]: Jsonified<T[K]> }
      : T;

export type ProjectDto = Jsonified<ProjectForUser>;
export type PlanDto = Jsonified<PlanListItem>;
export type VersionDto = Jsonified<VersionListItem>;
export type ArmDto = Jsonified<ArmListItem>;
export type ArmRevisionDto = Jsonified<ArmRevision>;
export type SavedVersionDto = Jsonified<PlanVersion> & { armRevision: number };
/** A course as the API answers it: `joinCode` only for those who may see it (lib/server/permissions.ts). */
export type CourseDto = Jsonified<Omit<CourseForUser, "joinCode">> & { joinCode?: string; inviteUrl?: string };
export type AssignmentDto = Jsonified<Assignment>;
export type AssignmentListDto = Jsonified<AssignmentListItem>;
export type RosterEntryDto = Jsonified<RosterEntry>;
export type OwnSubmissionDto = Jsonified<MySubmission>;
export type SubmissionDto = Jsonified<SubmissionForUser>;
export type ReviewDto = Jsonified<Review>;
export type CommentDto = Jsonified<CommentItem>;
export type SubmissionDetailDto = { submission: SubmissionDto; comments: CommentDto[] };

export interface FieldIssue {
  path: string;
  message: string;
}

/** What to do next when an error response carries no message of its own (a proxy's page, say). */
function answerWithoutMessage(status: number): string {
  if (status === 401) return "You are signed out; sign in again and retry.";
  if (status === 403) return "You do not have access to this; ask the owner of the project or course for access.";
  if (status === 404) return "Nothing is here any more (it may have been deleted); reload the page.";
  if (status === 413) return "The upload is too large for the server; send a smaller file.";
  if (status >= 500) return `The server could not answer (status ${status}); try again in a minute.`;
  return `The request was refused (status ${status}); reload the page and try again.`;
}

/** An error answered by the API (or a network failure, status 0). */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly issues: FieldIssue[] = [],
    readonly details: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = "ApiError";
  }
}

/** One JSON request to our API from a client component; a non-2xx answer becomes an ApiError with the error shape's fields. */
export async function request<T>(path: string, init?: RequestInit): Promise<T> {
  let res: Response;
  try {
    res = await fetch(path, {
      ...init,
      headers: {
        Accept: "application/json",
        ...(init?.body ? { "Content-Type": "application/json" } : {}),
        ...init?.headers,
      },
      credentials: "same-origin",
    });
  } catch (err) {
    throw new ApiError(
      0,
      "network",
      `The server could not be reached (${err instanceof Error ? err.message : "network error"}); check your connection and try again.`,
    );
  }
  const text = await res.text();
  let body: unknown = null;
  try {
    body = text ? JSON.parse(text) : null;
  } catch {
    body = null;
  }
  if (!res.ok) {
    const e = (
      body as { error?: { code?: string; message?: string; issues?: FieldIssue[] } & Record<string, unknown> } | null
    )?.error;
    const { code, message, issues, ...details } = e ?? {};
    if (meansUnreachable(res.status, code)) reportUnavailable(Number(res.headers.get("Retry-After")));
    throw new ApiError(
      res.status,
      code ?? `http_${res.status}`,
      message ?? answerWithoutMessage(res.status),
      issues ?? [],
      details,
    );
  }
  reportReachable();
  return body as T;
}

const post = (body: unknown): RequestInit => ({ method: "POST", body: JSON.stringify(body) });

/** Most pages {@link allPages} follows before it refuses to go on (200 rows each: 200,000 rows). */
const MAX_PAGES = 1000;

/**
 * Every row of a paged list (`?limit=&cursor=`, `nextCursor`): the pages are fetched one after
 * another until the last, so a screen never shows a list cut at the first page.
 */
export async function allPages<T>(path: string, key: string): Promise<T[]> {
  const rows: T[] = [];
  let cursor: string | null = null;
  for (let page = 0; page < MAX_PAGES; page++) {
    const sep = path.includes("?") ? "&" : "?";
    const url: string = `${path}${sep}limit=200${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ""}`;
    const body: Record<string, unknown> & { nextCursor?: string | null } = await request(url);
    rows.push(...((body[key] as T[] | undefined) ?? []));
    cursor = body.nextCursor ?? null;
    if (!cursor) return rows;
  }
  throw new Error(`The list has more than ${MAX_PAGES * 200} rows; it was not loaded.`);
}

export const api = {
  listProjects: () => allPages<ProjectDto>("/api/v1/projects", "projects"),
  createProject: (input: { name: string; kind?: "research" | "personal" | "course" }) =>
    request<{ project: ProjectDto }>("/api/v1/projects", post(input)).then((r) => r.project),
  listPlans: (projectId: string) => allPages<PlanDto>(`/api/v1/projects/${projectId}/plans`, "plans"),
  createPlan: (projectId: string, input: { name: string; armId: string }) =>
    request<{ plan: PlanDto }>(`/api/v1/projects/${projectId}/plans`, post(input)).then((r) => r.plan),
  listVersions: (planId: string) => allPages<VersionDto>(`/api/v1/plans/${planId}/versions`, "versions"),
  getVersion: (planId: string, number: number) =>
    request<{ version: Jsonified<PlanVersion> & { armRevision: number; authorName: string } }>(
      `/api/v1/plans/${planId}/versions/${number}`,
    ).then((r) => r.version),
  saveVersion: (
    planId: string,
    input: { baseVersion: number; document: unknown; note?: string; armRevision?: number },
  ) => request<{ version: SavedVersionDto; report: Report }>(`/api/v1/plans/${planId}/versions`, post(input)),
  diff: (planId: string, from: number, to: number) =>
    request<DiffDto>(`/api/v1/plans/${planId}/diff?from=${from}&to=${to}`),
  exportUrl: (planId: string, number: number, format: "json" | "csv", rateHz?: number) =>
    `/api/v1/plans/${planId}/versions/${number}/export?format=${format}${rateHz ? `&rateHz=${rateHz}` : ""}`,
  listArms: (projectId?: string) =>
    request<{ arms: ArmDto[] }>(projectId ? `/api/v1/projects/${projectId}/arms` : "/api/v1/arms").then((r) => r.arms),
  getArm: (armId: string) =>
    request<{
      arm: { id: string; name: string; projectId: string | null; role: string | null; projectArchived: boolean };
      revisions: ArmRevisionDto[];
    }>(`/api/v1/arms/${armId}`),
  createArmRevision: (armId: string, input: { description: unknown; note?: string }) =>
    request<{ revision: ArmRevisionDto }>(`/api/v1/arms/${armId}/revisions`, post(input)).then((r) => r.revision),
  createArm: (projectId: string, input: { name: string; description: unknown; note?: string }) =>
    request<{ arm: { id: string; name: string; projectId: string }; revision: ArmRevisionDto }>(
      `/api/v1/projects/${projectId}/arms`,
      post(input),
    ),
  listRecordings: (projectId: string) =>
    allPages<RecordingDto>(`/api/v1/projects/${projectId}/recordings`, "recordings"),
  recordingFileUrl: (recordingId: string) => `/api/v1/recordings/${recordingId}/file`,
  check: (document: unknown) => request<{ report: Report }>("/api/v1/check", post(document)),

  // Courses, assignments, submissions and reviews: inputs are the handlers' own zod schemas (z.input).
  createCourse: (input: z.input<typeof createCourseSchema>) =>
    request<{ course: CourseDto & { joinCode: string; inviteUrl: string } }>("/api/v1/courses", post(input)).then(
      (r) => r.course,
    ),
  joinCourse: (code: string) =>
    request<{ course: Pick<CourseDto, "id" | "title" | "term">; role: CourseDto["role"] }>(
      "/api/v1/courses/join",
      post({ code }),
    ),
  inviteToCourse: (courseId: string, input: z.input<typeof inviteSchema>) =>
    request<{ invited: string[]; inviteUrl: string }>(`/api/v1/courses/${courseId}/invitations`, post(input)),
  removeStudent: (courseId: string, userId: string) =>
    request<{ removed: string }>(`/api/v1/courses/${courseId}/roster/${userId}`, { method: "DELETE" }),
  createAssignment: (courseId: string, input: z.input<typeof createAssignmentSchema>) =>
    request<{ assignment: AssignmentDto }>(`/api/v1/courses/${courseId}/assignments`, post(input)).then(
      (r) => r.assignment,
    ),
  submit: (assignmentId: string, input: z.input<typeof submitSchema>) =>
    request<{ submission: Omit<Jsonified<Submission>, "document">; report: Report; ruleProblems: RuleProblem[] }>(
      `/api/v1/assignments/${assignmentId}/submissions`,
      post(input),
    ),
  listOwnSubmissions: () => allPages<OwnSubmissionDto>("/api/v1/submissions", "submissions"),
  getSubmission: (submissionId: string) => request<SubmissionDetailDto>(`/api/v1/submissions/${submissionId}`),
  addComment: (submissionId: string, input: z.input<typeof commentSchema>) =>
    request<{ comment: CommentDto }>(`/api/v1/reviews/${submissionId}/comments`, post(input)).then((r) => r.comment),
  decide: (submissionId: string, input: z.input<typeof decisionSchema>) =>
    request<{ review: ReviewDto }>(`/api/v1/reviews/${submissionId}/decision`, post(input)).then((r) => r.review),
};

/** A stored recording's metadata, as the API lists it. */
export interface RecordingDto {
  id: string;
  name: string;
  armId: string | null;
  sizeBytes: number;
  sampleCount: number;
  jointCount: number;
  durationS: number;
  createdAt: string;
}

/**
 * Sends a file as the request body, reporting upload progress (0..1); fetch has no upload progress,
 * so uploads use XMLHttpRequest. Resolves with the parsed JSON answer; errors arrive as {@link ApiError}.
 */
export function uploadWithProgress(
  url: string,
  file: Blob,
  contentType: string,
  onProgress: (fraction: number) => void,
  networkMessage: string,
): Promise<unknown> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.setRequestHeader("Content-Type", contentType);
    xhr.setRequestHeader("Accept", "application/json");
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable && e.total > 0) onProgress(e.loaded / e.total);
    };
    xhr.onerror = () => reject(new ApiError(0, "network", networkMessage));
    xhr.onload = () => {
      let body: unknown = null;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        body = null;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        onProgress(1);
        resolve(body);
        return;
      }
      const e = (
        body as { error?: { code?: string; message?: string; issues?: FieldIssue[] } & Record<string, unknown> } | null
      )?.error;
      const { code, message, issues, ...details } = e ?? {};
      reject(
        new ApiError(
          xhr.status,
          code ?? `http_${xhr.status}`,
          message ?? answerWithoutMessage(xhr.status),
          issues ?? [],
          details,
        ),
      );
    };
    xhr.send(file);
  });
}

/** Uploads a recording CSV with upload progress (0..1). */
export async function uploadRecording(
  projectId: string,
  file: Blob,
  input: { name: string; armId?: string },
  onProgress: (fraction: number) => void,
): Promise<RecordingDto> {
  const q = new URLSearchParams({ name: input.name, ...(input.armId ? { armId: input.armId } : {}) });
  const body = await uploadWithProgress(
    `/api/v1/projects/${projectId}/recordings?${q}`,
    file,
    "text/csv",
    onProgress,
    "The upload did not reach the server.",
  );
  return (body as { recording: RecordingDto }).recording;
}

export interface DiffDto {
  from: { number: number; verdict: "pass" | "caution" | "fault"; armRevision: number };
  to: { number: number; verdict: "pass" | "caution" | "fault"; armRevision: number };
  changes: Change[];
}
