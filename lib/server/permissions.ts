/**
 * Every permission decision in one place: two tables (site role → actions, project
 * membership role → actions) and the functions that consult them. Handlers call
 * `authorizeSite` / `authorizeProject`; nothing else decides who may do what.
 */
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
  | "audit:read";

const everyone: SiteAction[] = ["project:create", "token:manage", "check:run", "arm:read-builtin"];

export const sitePermissions: Record<SiteRole, ReadonlySet<SiteAction>> = {
  student: new Set(everyone),
  researcher: new Set(everyone),
  instructor: new Set([...everyone, "project:create-course"]),
  admin: new Set([...everyone, "project:create-course", "user:list", "user:manage"]),
};

const read: ProjectAction[] = ["project:read", "member:list", "arm:read", "plan:read", "recording:read"];
const write: ProjectAction[] = ["arm:write", "plan:create", "plan:delete", "version:create", "recording:create"];

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

/** Throws `forbidden:<subject>` unless the actor's site role allows the action. */
export function authorizeSite(actor: Actor, action: SiteAction): void {
  if (!canSite(actor, action)) throw new AppError(`forbidden:${action.split(":")[0]}`, `Your role (${actor.siteRole}) does not allow ${action}.`);
}

/** Throws `forbidden:<subject>` unless the membership allows the action. */
export function authorizeProject(membership: { role: MemberRole; archived: boolean }, action: ProjectAction): void {
  if (canProject(membership, action)) return;
  if (membership.archived && projectPermissions[membership.role].has(action)) {
    throw new AppError("forbidden:archived", "The project is archived; un-archive it to make changes.");
  }
  throw new AppError(`forbidden:${action.split(":")[0]}`, `Your project role (${membership.role}) does not allow ${action}.`);
}
