import "server-only";
import { and, asc, desc, eq, exists, isNull, max, or, sql } from "drizzle-orm";
import { db } from "@/db";
import { armRevisions, arms, projectMembers, projects, type ArmRevision, type MemberRole } from "@/db/schema";

/** SQL condition: the arm is built in, or belongs to a project the user is a member of. */
function armVisibleTo(userId: string) {
  return or(
    isNull(arms.projectId),
    exists(
      db
        .select({ one: projectMembers.userId })
        .from(projectMembers)
        .where(and(eq(projectMembers.projectId, arms.projectId), eq(projectMembers.userId, userId))),
    ),
  );
}

export type ArmListItem = {
  id: string;
  name: string;
  projectId: string | null;
  builtIn: boolean;
  latestRevision: number;
  createdAt: Date;
};

/** Built-in arms and the arms of the user's projects (or of one project), with their latest revision number. */
export async function listArmsForUser({
  userId,
  projectId,
}: {
  userId: string;
  projectId?: string;
}): Promise<ArmListItem[]> {
  return db
    .select({
      id: arms.id,
      name: arms.name,
      projectId: arms.projectId,
      builtIn: sql<boolean>`${arms.projectId} is null`,
      latestRevision: sql<number>`coalesce(max(${armRevisions.revision}), 0)::int`,
      createdAt: arms.createdAt,
    })
    .from(arms)
    .leftJoin(armRevisions, eq(armRevisions.armId, arms.id))
    .where(
      and(
        armVisibleTo(userId),
        projectId === undefined ? undefined : or(isNull(arms.projectId), eq(arms.projectId, projectId)),
      ),
    )
    .groupBy(arms.id)
    .orderBy(sql`${arms.projectId} is not null`, asc(arms.name));
}

export type ArmForUser = {
  id: string;
  name: string;
  projectId: string | null;
  /** The user's role in the arm's project; null for a built-in arm. */
  role: MemberRole | null;
  projectArchived: boolean;
};

/** One arm, if the user may see it. */
export async function getArmForUser({
  armId,
  userId,
}: {
  armId: string;
  userId: string;
}): Promise<ArmForUser | undefined> {
  const [row] = await db
    .select({
      id: arms.id,
      name: arms.name,
      projectId: arms.projectId,
      role: projectMembers.role,
      archivedAt: projects.archivedAt,
    })
    .from(arms)
    .leftJoin(projectMembers, and(eq(projectMembers.projectId, arms.projectId), eq(projectMembers.userId, userId)))
    .leftJoin(projects, eq(projects.id, arms.projectId))
    .where(and(eq(arms.id, armId), armVisibleTo(userId)));
  if (!row) return undefined;
  return {
    id: row.id,
    name: row.name,
    projectId: row.projectId,
    role: row.role,
    projectArchived: row.archivedAt !== null,
  };
}

/** An arm's revisions, newest first, if the user may see the arm. */
export async function listArmRevisions({ armId, userId }: { armId: string; userId: string }): Promise<ArmRevision[]> {
  return db
    .select({ revision: armRevisions })
    .from(armRevisions)
    .innerJoin(arms, eq(arms.id, armRevisions.armId))
    .where(and(eq(armRevisions.armId, armId), armVisibleTo(userId)))
    .orderBy(desc(armRevisions.revision))
    .then((rows) => rows.map((r) => r.revision));
}

/** One revision of an arm (the latest when `revision` is omitted), if the user may see the arm. */
export async function getArmRevisionForUser({
  armId,
  userId,
  revision,
}: {
  armId: string;
  userId: string;
  revision?: number;
}): Promise<ArmRevision | undefined> {
  const [row] = await db
    .select({ revision: armRevisions })
    .from(armRevisions)
    .innerJoin(arms, eq(arms.id, armRevisions.armId))
    .where(
      and(
        eq(armRevisions.armId, armId),
        armVisibleTo(userId),
        revision === undefined ? undefined : eq(armRevisions.revision, revision),
      ),
    )
    .orderBy(desc(armRevisions.revision))
    .limit(1);
  return row?.revision;
}

/** Creates a custom arm in a project with its first revision. Undefined when the name is taken. */
export async function createArm(input: {
  projectId: string;
  name: string;
  description: unknown;
  userId: string;
  urdfKey?: string | null;
  note?: string | null;
}): Promise<{ armId: string; revision: ArmRevision } | undefined> {
  return db.transaction(async (tx) => {
    const [arm] = await tx
      .insert(arms)
      .values({ projectId: input.projectId, name: input.name, createdBy: input.userId })
      .onConflictDoNothing()
      .returning();
    if (!arm) return undefined;
    const [revision] = await tx
      .insert(armRevisions)
      .values({
        armId: arm.id,
        revision: 1,
        description: input.description,
        urdfKey: input.urdfKey ?? null,
        note: input.note ?? null,
        createdBy: input.userId,
      })
      .returning();
    return { armId: arm.id, revision };
  });
}

/**
 * Adds the next revision of a custom arm. The row lock on the arm serialises concurrent edits,
 * so two saves can never take the same revision number.
 */
export async function createArmRevision(input: {
  armId: string;
  description: unknown;
  userId: string;
  note?: string | null;
  urdfKey?: string | null;
}): Promise<ArmRevision> {
  return db.transaction(async (tx) => {
    await tx.select({ id: arms.id }).from(arms).where(eq(arms.id, input.armId)).for("update");
    const [current] = await tx
      .select({ n: max(armRevisions.revision) })
      .from(armRevisions)
      .where(eq(armRevisions.armId, input.armId));
    const [revision] = await tx
      .insert(armRevisions)
      .values({
        armId: input.armId,
        revision: (current?.n ?? 0) + 1,
        description: input.description,
        note: input.note ?? null,
        urdfKey: input.urdfKey ?? null,
        createdBy: input.userId,
      })
      .returning();
    return revision;
  });
}

const revisionFields = {
  id: armRevisions.id,
  armId: armRevisions.armId,
  revision: armRevisions.revision,
  description: armRevisions.description,
};
type RevisionFields = { id: string; armId: string; revision: number; description: unknown };

/**
 * An arm revision by id, not scoped to a user: only for the server's own re-check of a submission
 * against the revision its assignment requires (the student need not be able to read that arm).
 */
export async function getArmRevisionById({ id }: { id: string }): Promise<RevisionFields | undefined> {
  const [row] = await db.select(revisionFields).from(armRevisions).where(eq(armRevisions.id, id));
  return row;
}

/** An arm revision by id, only if the user may read its arm (built in, or in a project they are a member of). */
export async function getReadableArmRevision({
  id,
  userId,
}: {
  id: string;
  userId: string;
}): Promise<RevisionFields | undefined> {
  const [row] = await db
    .select(revisionFields)
    .from(armRevisions)
    .innerJoin(arms, eq(arms.id, armRevisions.armId))
    .where(and(eq(armRevisions.id, id), armVisibleTo(userId)));
  return row;
}
