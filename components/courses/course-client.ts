/**
 * Typed fetch wrappers over the course, assignment, submission and review routes for client
 * components, through the one request helper of lib/client/api-client.ts; and the TanStack Query keys they use.
 */
import { request as send } from "@/lib/client/api-client";

const post = (body: unknown): RequestInit => ({ method: "POST", body: JSON.stringify(body) });

export const courseKeys = {
  all: ["courses"] as const,
  course: (id: string) => ["courses", id] as const,
  roster: (id: string) => ["courses", id, "roster"] as const,
  submission: (id: string) => ["submissions", id] as const,
  ownSubmissions: ["submissions", "own"] as const,
};

export type OwnSubmissionDto = { id: string; planId: string | null; status: "submitted" | "returned" | "approved"; attempt: number; assignmentTitle: string; submittedAt: string };
export type SubmissionDetailDto = {
  submission: { id: string; status: string; review: { decision: string; summary: string } | null };
  comments: { id: string; body: string; authorName: string; moveIndex: number | null; jointIndex: number | null; timeS: number | null }[];
};

export const courseApi = {
  ownSubmissions: () => send<{ submissions: OwnSubmissionDto[] }>("/api/v1/submissions").then((r) => r.submissions),
  submission: (id: string) => send<SubmissionDetailDto>(`/api/v1/submissions/${id}`),
  createCourse: (input: { title: string; term: string; requiredArmRevisionId?: string; limits?: { velocityScale?: number } }) =>
    send<{ course: { id: string; joinCode: string; inviteUrl: string } }>("/api/v1/courses", post(input)).then((r) => r.course),
  join: (code: string) => send<{ course: { id: string; title: string }; role: string }>("/api/v1/courses/join", post({ code })),
  invite: (courseId: string, emails: string[]) => send<{ invited: string[] }>(`/api/v1/courses/${courseId}/invitations`, post({ emails })),
  removeStudent: (courseId: string, userId: string) => send<{ removed: string }>(`/api/v1/courses/${courseId}/roster/${userId}`, { method: "DELETE" }),
  createAssignment: (courseId: string, input: Record<string, unknown>) =>
    send<{ assignment: { id: string } }>(`/api/v1/courses/${courseId}/assignments`, post(input)).then((r) => r.assignment),
  submit: (assignmentId: string, input: { planId: string; versionNumber: number }) =>
    send<{ submission: { id: string; verdict: string; attempt: number }; ruleProblems: { message: string }[] }>(`/api/v1/assignments/${assignmentId}/submissions`, post(input)),
  comment: (submissionId: string, input: { body: string; moveIndex?: number; jointIndex?: number; timeS?: number }) =>
    send<{ comment: { id: string } }>(`/api/v1/reviews/${submissionId}/comments`, post(input)).then((r) => r.comment),
  decide: (submissionId: string, input: { decision: "returned" | "approved"; summary: string }) =>
    send<{ review: { id: string } }>(`/api/v1/reviews/${submissionId}/decision`, post(input)).then((r) => r.review),
};
