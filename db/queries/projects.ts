import "server-only";
import { and, asc, desc, eq, exists as eqExists, isNull } from "drizzle-orm";
import { db } from "@/db";
import { projectMembers, projects, users, type MemberRole, type Project, type ProjectKind } from "@/db/schema";
import { toPage, type Page, type PageAfter } from "@/lib/server/paging";
import { pageOrderBy, pastCursor, timestampPageKey, type PageOrder } from "./paging";

/** A project as its member sees it: the project and the member's own role. */
export type ProjectForUser = Project & { role: MemberRole };

const projectWithRole = {
  id: projects.id,
  name: projects.name,
  kind: projects.kind,
  createdBy: projects.createdBy,
  archivedAt: projects.archivedAt,
  createdAt: projects.createdAt,
  updatedAt: projects.updatedAt,
  role: projectMembers.role,
};

/** The projects the user is a member of, newest activity first; archived ones only on request. */
export async function listProjectsForUser({
  userId,
  includeArchived = false,
}: {
  userId: string;
  includeArchived?: boolean;
}): Promise<ProjectForUser[]> {
  return db
    .select(projectWithRole)
    .from(projects)
    .innerJoin(projectMembers, and(eq(projectMembers.projectId, projects.id), eq(projectMembers.userId, userId)))
    .where(includeArchived ? undefined : isNull(projects.archivedAt))
    .orderBy(desc(projects.updatedAt));
}

/** One project, only if the user is a member (otherwise undefined: it does not exist for them). */
export async function getProjectForUser({
  projectId,
  userId,
}: {
  projectId: string;
  userId: string;
}): Promise<ProjectForUser | undefined> {
  const [row] = await db
    .select(projectWithRole)
    .from(projects)
    .innerJoin(projectMembers, and(eq(projectMembers.projectId, projects.id), eq(projectMembers.userId, userId)))
    .where(eq(projects.id, projectId));
  return row;
}

/** Creates a project with its creator as owner, in one transaction. */
export async function createProject({
  name,
  kind,
  userId,
}: {
  name: string;
  kind: ProjectKind;
  userId: string;
}): Promise<ProjectForUser> {
  return db.transaction(async (tx) => {
    const [project] = await tx.insert(projects).values({ name, kind, createdBy: userId }).returning();
    await tx.insert(projectMembers).values({ projectId: project.id, userId, role: "owner" });
    return { ...project, role: "owner" as const };
  });
}

/** Renames and/or (un)archives a project the user owns. */
export async function updateProject({
  projectId,
  userId,
  name,
  archived,
}: {
  projectId: string;
  userId: string;
  name?: string;
  archived?: boolean;
}): Promise<Project | undefined> {
  const [row] = await db
    .update(projects)
    .set({
      ...(name === undefined ? {} : { name }),
      ...(archived === undefined ? {} : { archivedAt: archived ? new Date() : null }),
      updatedAt: new Date(),
    })
    .where(and(eq(projects.id, projectId), inMembership(projectId, userId, "owner")))
    .returning();
  return row;
}

/** SQL condition: the user holds this role in the project (keeps the scope in the write's own WHERE). */
function inMembership(projectId: string, userId: string, role: MemberRole) {
  return eqExists(
    db
      .select({ one: projectMembers.userId })
      .from(projectMembers)
      .where(
        and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, userId), eq(projectMembers.role, role)),
      ),
  );
}

export type MemberListItem = { userId: string; email: string; name: string; role: MemberRole; createdAt: Date };

const memberFields = {
  userId: projectMembers.userId,
  email: users.email,
  name: users.name,
  role: projectMembers.role,
  createdAt: projectMembers.createdAt,
};

/** The asking user is a member of the project (members are listed only to members). */
function askerIsMember(projectId: string, userId: string) {
  return eqExists(
    db
      .select({ one: projectMembers.userId })
      .from(projectMembers)
      .where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, userId))),
  );
}

/** Members of a project, listed only to someone who is a member of it. */
export async function listMembers({
  projectId,
  userId,
}: {
  projectId: string;
  userId: string;
}): Promise<MemberListItem[]> {
  return db
    .select(memberFields)
    .from(projectMembers)
    .innerJoin(users, eq(users.id, projectMembers.userId))
    .where(and(eq(projectMembers.projectId, projectId), askerIsMember(projectId, userId)))
    .orderBy(asc(users.email));
}

/**
 * Adds a member by e-mail, or changes their role. The caller's ownership is checked by the handler
 * (through lib/permissions) and again here in the WHERE clause of the lookup.
 */
export async function upsertMember({
  projectId,
  ownerId,
  email,
  role,
}: {
  projectId: string;
  ownerId: string;
  email: string;
  role: MemberRole;
}): Promise<MemberListItem | undefined> {
  const [target] = await db
    .select({ id: users.id, email: users.email, name: users.name })
    .from(users)
    .where(
      and(eq(users.email, email.toLowerCase()), isNull(users.disabledAt), inMembership(projectId, ownerId, "owner")),
    );
  if (!target) return undefined;
  const [row] = await db
    .insert(projectMembers)
    .values({ projectId, userId: target.id, role })
    .onConflictDoUpdate({ target: [projectMembers.projectId, projectMembers.userId], set: { role } })
    .returning();
  return { userId: target.id, email: target.email, name: target.name, role: row.role, createdAt: row.createdAt };
}

/** Removes a member from a project the caller owns. */
export async function removeMember({
  projectId,
  ownerId,
  userId,
}: {
  projectId: string;
  ownerId: string;
  userId: string;
}): Promise<boolean> {
  const rows = await db
    .delete(projectMembers)
    .where(
      and(
        eq(projectMembers.projectId, projectId),
        eq(projectMembers.userId, userId),
        inMembership(projectId, ownerId, "owner"),
      ),
    )
    .returning({ userId: projectMembers.userId });
  return rows.length > 0;
}

/** Number of owners of a project (the last owner cannot leave or be demoted). */
export async function countOwners({ projectId }: { projectId: string }): Promise<number> {
  return db.$count(projectMembers, and(eq(projectMembers.projectId, projectId), eq(projectMembers.role, "owner")));
}

const projectsOrder: PageOrder = {
  key: projects.updatedAt,
  id: projects.id,
  direction: "newest first",
  keyType: "timestamptz",
  idType: "uuid",
};
const membersOrder: PageOrder = {
  key: users.email,
  id: projectMembers.userId,
  direction: "ascending",
  keyType: "text",
  idType: "uuid",
};

/**
 * One page of the user's projects, newest activity first, ties broken by id (the order
 * `listProjectsForUser` uses, made total); `after` is the last row of the previous page.
 */
export async function listProjectsPageForUser({
  userId,
  includeArchived = false,
  limit,
  after,
}: {
  userId: string;
  includeArchived?: boolean;
  limit: number;
  after?: PageAfter;
}): Promise<Page<ProjectForUser>> {
  const rows = await db
    .select({ ...projectWithRole, pageKey: timestampPageKey(projects.updatedAt) })
    .from(projects)
    .innerJoin(projectMembers, and(eq(projectMembers.projectId, projects.id), eq(projectMembers.userId, userId)))
    .where(and(includeArchived ? undefined : isNull(projects.archivedAt), pastCursor(projectsOrder, after)))
    .orderBy(...pageOrderBy(projectsOrder))
    .limit(limit + 1);
  return toPage(
    rows,
    limit,
    (r) => r.id,
    ({ pageKey: _key, ...project }) => project,
  );
}

/** One page of a project's members by e-mail (then id), listed only to a member of the project. */
export async function listMembersPage({
  projectId,
  userId,
  limit,
  after,
}: {
  projectId: string;
  userId: string;
  limit: number;
  after?: PageAfter;
}): Promise<Page<MemberListItem>> {
  const rows = await db
    .select({ ...memberFields, pageKey: users.email })
    .from(projectMembers)
    .innerJoin(users, eq(users.id, projectMembers.userId))
    .where(
      and(eq(projectMembers.projectId, projectId), askerIsMember(projectId, userId), pastCursor(membersOrder, after)),
    )
    .orderBy(...pageOrderBy(membersOrder))
    .limit(limit + 1);
  return toPage(
    rows,
    limit,
    (r) => r.userId,
    ({ pageKey: _key, ...member }) => member,
  );
}
