/**
 * Every permission decision in one place: three tables (site role → actions, project membership
 * role → actions, course role → actions) and the functions that consult them. Handlers call
 * `authorizeSite` / `authorizeProject` / `authorizeCourse`; pages and components ask
 * `capabilities(actor, resource)` what to show. Nothing else decides who may do what.
 */
import type { CourseRole, SubmissionStatus } from "@/db/schema/courses";
import type { MemberRole } from "@/db/schema/projects";
import type { SiteRole } from "@/db/schema/users";
import { AppError } from "./errors";

/** Actions that do not belong to one project. */
export type SiteAction =
  | "project:create"
  | "project:create-course"
  | "token:manage"
  | "check:run"
  | "arm:read-builtin"
  | "user:list"
  | "user:manage";

/** Actions inside one project; the actor's membership role decides. */
export type ProjectAction =
  | "project:read"
  | "project:rename"
  | "project:archive"
  | "member:list"
  | "member:manage"
  | "arm:read"
  | "arm:write"
  | "plan:read"
  | "plan:create"
  | "plan:delete"
  | "version:create"
  | "recording:read"
  | "recording:create"
  | "dataset:read"
  | "dataset:create"
  | "dataset:audit"
  | "dataset:repair"
  | "audit:read";

const everyone: SiteAction[] = ["project:create", "token:manage", "check:run", "arm:read-builtin"];

export const sitePermissions: Record<SiteRole, ReadonlySet<SiteAction>> = {
  student: new Set(everyone),
  researcher: new Set(everyone),
  instructor: new Set([...everyone, "project:create-course"]),
  admin: new Set([...everyone, "project:create-course", "user:list", "user:manage"]),
};

const read: ProjectAction[] = [
  "project:read",
  "member:list",
  "arm:read",
  "plan:read",
  "recording:read",
  "dataset:read",
];
const write: ProjectAction[] = [
  "arm:write",
  "plan:create",
  "plan:delete",
  "version:create",
  "recording:create",
  "dataset:create",
  "dataset:audit",
  "dataset:repair",
];

export const projectPermissions: Record<MemberRole, ReadonlySet<ProjectAction>> = {
  viewer: new Set(read),
  editor: new Set([...read, ...write]),
  owner: new Set([...read, ...write, "project:rename", "project:archive", "member:manage", "audit:read"]),
};

/** What an archived project still allows: reading, and the owner un-archiving it. */
export const archivedProjectAllows: ReadonlySet<ProjectAction> = new Set([...read, "project:archive", "audit:read"]);

/** Who is acting: a signed-in user or an API token holder (same permissions as its owner). */
export type Actor = { userId: string; siteRole: SiteRole; via: "session" | "token"; tokenId?: string };

export function canSite(actor: Actor, action: SiteAction): boolean {
  return sitePermissions[actor.siteRole].has(action);
}

export function canProject(membership: { role: MemberRole; archived: boolean }, action: ProjectAction): boolean {
  if (membership.archived && !archivedProjectAllows.has(action)) return false;
  return projectPermissions[membership.role].has(action);
}

/** What each site action lets someone do, for refusals ("cannot create courses"). */
const siteActionWords: Record<SiteAction, string> = {
  "project:create": "create projects",
  "project:create-course": "create courses",
  "token:manage": "manage API tokens",
  "check:run": "run checks",
  "arm:read-builtin": "read the built-in arms",
  "user:list": "list the site's users",
  "user:manage": "manage the site's users",
};

/** What each project action lets someone do, for refusals ("cannot save a new version of a plan"). */
const projectActionWords: Record<ProjectAction, string> = {
  "project:read": "open this project",
  "project:rename": "rename this project",
  "project:archive": "archive or un-archive this project",
  "member:list": "see this project's members",
  "member:manage": "change this project's members",
  "arm:read": "see this project's arms",
  "arm:write": "change this project's arms",
  "plan:read": "open this project's plans",
  "plan:create": "create plans in this project",
  "plan:delete": "delete plans in this project",
  "version:create": "save a new version of a plan in this project",
  "recording:read": "open this project's recordings",
  "recording:create": "upload recordings to this project",
  "dataset:read": "open this project's datasets",
  "dataset:create": "upload datasets to this project",
  "dataset:audit": "audit this project's datasets",
  "dataset:repair": "repair this project's datasets",
  "audit:read": "read this project's audit log",
};

/**
 * A refusal of a site action: what was refused and who can grant it. Site roles are set by the
 * site's administrator, so that is who to ask.
 */
export function siteRefusal(role: SiteRole, action: SiteAction): string {
  const roles = (Object.keys(sitePermissions) as SiteRole[]).filter((r) => sitePermissions[r].has(action));
  const who = roles.includes("instructor") ? "an instructor or administrator account" : "an administrator account";
  return `Your ${role} account cannot ${siteActionWords[action]}: that needs ${who}. Ask the site's administrator to change your account's role.`;
}

/**
 * A refusal of a project action: what was refused, the least role that allows it, and who grants it
 * (the project's owner, who manages its members).
 */
export function projectRefusal(role: MemberRole, action: ProjectAction): string {
  const least = (["viewer", "editor", "owner"] as const).find((r) => projectPermissions[r].has(action)) ?? "owner";
  return `As ${article(role)} ${role} of this project you cannot ${projectActionWords[action]}. Ask the project's owner to make you ${article(least)} ${least}.`;
}

function article(word: string): string {
  return /^[aeiou]/.test(word) ? "an" : "a";
}

/** Throws `forbidden:<subject>` unless the actor's site role allows the action. */
export function authorizeSite(actor: Actor, action: SiteAction): void {
  if (!canSite(actor, action))
    throw new AppError(`forbidden:${action.split(":")[0]}`, siteRefusal(actor.siteRole, action));
}

/** Throws `forbidden:<subject>` unless the membership allows the action. */
export function authorizeProject(membership: { role: MemberRole; archived: boolean }, action: ProjectAction): void {
  if (canProject(membership, action)) return;
  if (membership.archived && projectPermissions[membership.role].has(action)) {
    throw new AppError(
      "forbidden:archived",
      membership.role === "owner"
        ? "The project is archived, so nothing in it can change; un-archive it first."
        : "The project is archived, so nothing in it can change; ask the project's owner to un-archive it.",
    );
  }
  throw new AppError(`forbidden:${action.split(":")[0]}`, projectRefusal(membership.role, action));
}

/** Actions inside one course; the actor's course role decides (independent of their site role). */
export type CourseAction =
  | "course:read"
  | "course:manage"
  | "course:read-join-code"
  | "roster:read"
  | "roster:manage"
  | "assignment:read"
  | "assignment:create"
  | "submission:create"
  | "submission:read-own"
  | "submission:read-all"
  | "review:comment"
  | "review:decide"
  | "grades:export";

export const coursePermissions: Record<CourseRole, ReadonlySet<CourseAction>> = {
  student: new Set(["course:read", "assignment:read", "submission:create", "submission:read-own"]),
  instructor: new Set([
    "course:read",
    "course:manage",
    "course:read-join-code",
    "roster:read",
    "roster:manage",
    "assignment:read",
    "assignment:create",
    "submission:read-all",
    "review:comment",
    "review:decide",
    "grades:export",
  ]),
};

export function canCourse(role: CourseRole, action: CourseAction): boolean {
  return coursePermissions[role].has(action);
}

/** What each course action lets someone do, for refusals ("cannot approve or return submissions"). */
const courseActionWords: Record<CourseAction, string> = {
  "course:read": "open this course",
  "course:manage": "change this course",
  "course:read-join-code": "see this course's join code",
  "roster:read": "see this course's roster",
  "roster:manage": "change this course's roster",
  "assignment:read": "read this course's assignments",
  "assignment:create": "create assignments in this course",
  "submission:create": "submit work in this course",
  "submission:read-own": "read your own submissions in this course",
  "submission:read-all": "read every submission in this course",
  "review:comment": "comment on submissions",
  "review:decide": "approve or return submissions",
  "grades:export": "export this course's grades",
};

/**
 * A refusal of a course action: what was refused and who can help. Instructors manage the course and
 * its roster; students submit their own work.
 */
export function courseRefusal(role: CourseRole, action: CourseAction): string {
  const byInstructor = coursePermissions.instructor.has(action);
  const next = byInstructor
    ? "Only the course's instructors can; ask one of them to do it or to add you as an instructor."
    : "Only the course's students can; join the course as a student with its join code, using a student account.";
  return `As ${article(role)} ${role} of this course you cannot ${courseActionWords[action]}. ${next}`;
}

/** Throws `forbidden:<subject>` unless the course role allows the action. */
export function authorizeCourse(role: CourseRole, action: CourseAction): void {
  if (!canCourse(role, action)) {
    throw new AppError(`forbidden:${action.split(":")[0]}`, courseRefusal(role, action));
  }
}

/**
 * Reading one submission: its student reads their own, the course's instructors read all. `viewerRole`
 * is how the submission query found the caller (the submitting student, or an instructor of its course).
 */
export function authorizeSubmissionRead(viewerRole: CourseRole): void {
  authorizeCourse(viewerRole, viewerRole === "instructor" ? "submission:read-all" : "submission:read-own");
}

/** Join-code visibility, decided once: the code is handed out by instructors, so only they see it (null for anyone else). */
export function visibleJoinCode(course: { role: CourseRole; joinCode: string }): string | null {
  return canCourse(course.role, "course:read-join-code") ? course.joinCode : null;
}

/**
 * The last-owner rule, decided once: a project always keeps at least one owner. Refuses removing
 * (`nextRole: null`) or demoting the only owner.
 */
export function assertKeepsAnOwner(change: {
  currentRole: MemberRole | undefined;
  nextRole: MemberRole | null;
  ownerCount: number;
}): void {
  if (change.currentRole === "owner" && change.nextRole !== "owner" && change.ownerCount <= 1) {
    throw new AppError(
      "unprocessable:last-owner",
      "A project needs at least one owner; make someone else owner first.",
    );
  }
}

/** A resource as the capability question needs it. */
export type CapabilityResource =
  | { kind: "site" }
  | { kind: "project"; role: MemberRole; archived: boolean }
  | { kind: "course"; role: CourseRole }
  | { kind: "submission"; viewerRole: CourseRole; status: SubmissionStatus };

export type SiteCapabilities = { canCreateProject: boolean; canCreateCourse: boolean; canManageUsers: boolean };
export type ProjectCapabilities = {
  canRead: boolean;
  /** Create and change plans, versions, arms and recordings (false for viewers and in an archived project). */
  canEdit: boolean;
  canManageMembers: boolean;
  canRename: boolean;
  canArchive: boolean;
  canReadAudit: boolean;
};
export type CourseCapabilities = {
  canManage: boolean;
  canSeeJoinCode: boolean;
  canReadRoster: boolean;
  canManageRoster: boolean;
  canSetAssignments: boolean;
  canSubmit: boolean;
  canReadAllSubmissions: boolean;
  canReview: boolean;
  canExportGrades: boolean;
};
export type SubmissionCapabilities = { canComment: boolean; canDecide: boolean };

/**
 * What the actor may do with one resource, answered from the same tables the handlers enforce, so a
 * page never shows a control the API would refuse (nor hides one it would allow).
 */
export function capabilities(actor: Actor, resource: { kind: "site" }): SiteCapabilities;
export function capabilities(
  actor: Actor,
  resource: { kind: "project"; role: MemberRole; archived: boolean },
): ProjectCapabilities;
export function capabilities(actor: Actor, resource: { kind: "course"; role: CourseRole }): CourseCapabilities;
export function capabilities(
  actor: Actor,
  resource: { kind: "submission"; viewerRole: CourseRole; status: SubmissionStatus },
): SubmissionCapabilities;
export function capabilities(
  actor: Actor,
  resource: CapabilityResource,
): SiteCapabilities | ProjectCapabilities | CourseCapabilities | SubmissionCapabilities {
  switch (resource.kind) {
    case "site":
      return {
        canCreateProject: canSite(actor, "project:create"),
        canCreateCourse: canSite(actor, "project:create-course"),
        canManageUsers: canSite(actor, "user:manage"),
      };
    case "project": {
      const can = (action: ProjectAction) => canProject(resource, action);
      return {
        canRead: can("project:read"),
        canEdit: write.every(can),
        canManageMembers: can("member:manage"),
        canRename: can("project:rename"),
        canArchive: can("project:archive"),
        canReadAudit: can("audit:read"),
      };
    }
    case "course": {
      const can = (action: CourseAction) => canCourse(resource.role, action);
      return {
        canManage: can("course:manage"),
        canSeeJoinCode: can("course:read-join-code"),
        canReadRoster: can("roster:read"),
        canManageRoster: can("roster:manage"),
        canSetAssignments: can("assignment:create"),
        canSubmit: can("submission:create"),
        canReadAllSubmissions: can("submission:read-all"),
        canReview: can("review:decide"),
        canExportGrades: can("grades:export"),
      };
    }
    case "submission": {
      // Comments and decisions are for a submission still waiting for review (the queries refuse later ones).
      const open = resource.status === "submitted";
      return {
        canComment: open && canCourse(resource.viewerRole, "review:comment"),
        canDecide: open && canCourse(resource.viewerRole, "review:decide"),
      };
    }
  }
}
