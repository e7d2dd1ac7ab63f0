/** TanStack Query keys, defined once: every query and invalidation in the workspace uses these. */
export const queryKeys = {
  projects: () => ["projects"] as const,
  project: (projectId: string) => ["projects", projectId] as const,
  plans: (projectId: string) => ["projects", projectId, "plans"] as const,
  plan: (planId: string) => ["plans", planId] as const,
  versions: (planId: string) => ["plans", planId, "versions"] as const,
  version: (planId: string, number: number) => ["plans", planId, "versions", number] as const,
  diff: (planId: string, from: number, to: number) => ["plans", planId, "diff", from, to] as const,
  arms: (projectId?: string) => (projectId ? (["arms", { projectId }] as const) : (["arms"] as const)),
  arm: (armId: string) => ["arms", armId] as const,
  recordings: (projectId: string) => ["projects", projectId, "recordings"] as const,
  courses: () => ["courses"] as const,
  course: (courseId: string) => ["courses", courseId] as const,
  roster: (courseId: string) => ["courses", courseId, "roster"] as const,
  submission: (submissionId: string) => ["submissions", submissionId] as const,
  ownSubmissions: () => ["submissions", "own"] as const,
};
