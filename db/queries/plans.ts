import "server-only";
import { and, desc, eq, sql } from "drizzle-orm";
import { db } from "@/db";
import {
  armRevisions,
  arms,
  planVersions,
  plans,
  projectMembers,
  projects,
  users,
  type MemberRole,
  type Plan,
  type PlanVersion,
  type Verdict,
} from "@/db/schema";
import { toPage, type Page, type PageAfter } from "@/lib/server/paging";
import { newestFirst, pageOrderBy, pastCursor, timestampPageKey, type PageOrder } from "./paging";

/** Join condition: the user is a member of the plan's project. */
const memberOfPlanProject = (userId: string) =>
  and(eq(projectMembers.projectId, plans.projectId), eq(projectMembers.userId, userId));

export type PlanListItem = Plan & { armName: string; latestVerdict: Verdict | null };

/** The plans of a project the user is a member of, most recently changed first. */
export async function listPlansForProject({
  projectId,
  userId,
}: {
  projectId: string;
  userId: string;
}): Promise<PlanListItem[]> {
  const rows = await db
    .select({
      plan: plans,
      armName: arms.name,
      latestVerdict: planVersions.verdict,
    })
    .from(plans)
    .innerJoin(projectMembers, memberOfPlanProject(userId))
    .innerJoin(arms, eq(arms.id, plans.armId))
    .leftJoin(planVersions, and(eq(planVersions.planId, plans.id), eq(planVersions.number, plans.latestVersion)))
    .where(eq(plans.projectId, projectId))
    .orderBy(desc(plans.updatedAt));
  return rows.map((r) => ({ ...r.plan, armName: r.armName, latestVerdict: r.latestVerdict }));
}

const plansOrder: PageOrder = {
  key: plans.updatedAt,
  id: plans.id,
  direction: "newest first",
  keyType: "timestamptz",
  idType: "uuid",
};

/**
 * One page of a project's plans, most recently changed first, ties broken by id (the order
 * `listPlansForProject` uses, made total); `after` is the last row of the previous page.
 */
export async function listPlansPageForProject({
  projectId,
  userId,
  limit,
  after,
}: {
  projectId: string;
  userId: string;
  limit: number;
  after?: PageAfter;
}): Promise<Page<PlanListItem>> {
  const rows = await db
    .select({
      plan: plans,
      armName: arms.name,
      latestVerdict: planVersions.verdict,
      pageKey: timestampPageKey(plans.updatedAt),
    })
    .from(plans)
    .innerJoin(projectMembers, memberOfPlanProject(userId))
    .innerJoin(arms, eq(arms.id, plans.armId))
    .leftJoin(planVersions, and(eq(planVersions.planId, plans.id), eq(planVersions.number, plans.latestVersion)))
    .where(and(eq(plans.projectId, projectId), pastCursor(plansOrder, after)))
    .orderBy(...pageOrderBy(plansOrder))
    .limit(limit + 1);
  return toPage(
    rows,
    limit,
    (r) => r.plan.id,
    (r) => ({ ...r.plan, armName: r.armName, latestVerdict: r.latestVerdict }),
  );
}

export type PlanForUser = Plan & { role: MemberRole; projectArchived: boolean; armName: string };

/** One plan, if the user is a member of its project. */
export async function getPlanForUser({
  planId,
  userId,
}: {
  planId: string;
  userId: string;
}): Promise<PlanForUser | undefined> {
  const [row] = await db
    .select({ plan: plans, role: projectMembers.role, archivedAt: projects.archivedAt, armName: arms.name })
    .from(plans)
    .innerJoin(projectMembers, memberOfPlanProject(userId))
    .innerJoin(projects, eq(projects.id, plans.projectId))
    .innerJoin(arms, eq(arms.id, plans.armId))
    .where(eq(plans.id, planId));
  if (!row) return undefined;
  return { ...row.plan, role: row.role, projectArchived: row.archivedAt !== null, armName: row.armName };
}

export async function createPlan(input: {
  projectId: string;
  armId: string;
  name: string;
  userId: string;
}): Promise<Plan> {
  const [row] = await db
    .insert(plans)
    .values({ projectId: input.projectId, armId: input.armId, name: input.name, createdBy: input.userId })
    .returning();
  return row;
}

/** Deletes a plan (and its versions) in a project the user is a member of; lib/permissions decides which role may. */
export async function deletePlan({ planId, userId }: { planId: string; userId: string }): Promise<boolean> {
  const rows = await db
    .delete(plans)
    .where(
      and(
        eq(plans.id, planId),
        sql`exists (select 1 from ${projectMembers} where ${projectMembers.projectId} = ${plans.projectId}
                    and ${projectMembers.userId} = ${userId})`,
      ),
    )
    .returning({ id: plans.id });
  return rows.length > 0;
}

export type VersionListItem = Omit<PlanVersion, "document"> & { authorName: string; armRevision: number };

/** A plan's versions, newest first, for a member of its project (documents left out). */
const versionsOrder = newestFirst(planVersions.createdAt, planVersions.id);

/** One page of a plan's versions, newest first (a version is saved after the one before it). */
export async function listPlanVersionsPage({
  planId,
  userId,
  limit,
  after,
}: {
  planId: string;
  userId: string;
  limit: number;
  after?: PageAfter;
}): Promise<Page<VersionListItem>> {
  const rows = await db
    .select({
      pageKey: timestampPageKey(planVersions.createdAt),
      id: planVersions.id,
      planId: planVersions.planId,
      number: planVersions.number,
      armRevisionId: planVersions.armRevisionId,
      verdict: planVersions.verdict,
      summary: planVersions.summary,
      note: planVersions.note,
      authorId: planVersions.authorId,
      createdAt: planVersions.createdAt,
      authorName: users.name,
      armRevision: armRevisions.revision,
    })
    .from(planVersions)
    .innerJoin(plans, eq(plans.id, planVersions.planId))
    .innerJoin(projectMembers, memberOfPlanProject(userId))
    .innerJoin(users, eq(users.id, planVersions.authorId))
    .innerJoin(armRevisions, eq(armRevisions.id, planVersions.armRevisionId))
    .where(and(eq(planVersions.planId, planId), pastCursor(versionsOrder, after)))
    .orderBy(...pageOrderBy(versionsOrder))
    .limit(limit + 1);
  return toPage(
    rows,
    limit,
    (r) => r.id,
    ({ pageKey: _key, ...version }) => version,
  );
}

export type VersionForUser = PlanVersion & {
  armId: string;
  armRevision: number;
  armDescription: unknown;
  authorName: string;
};

/** One version of a plan, with the arm revision it was checked against, for a member of its project. */
export async function getPlanVersion({
  planId,
  number,
  userId,
}: {
  planId: string;
  number: number;
  userId: string;
}): Promise<VersionForUser | undefined> {
  const [row] = await db
    .select({
      version: planVersions,
      armId: armRevisions.armId,
      armRevision: armRevisions.revision,
      armDescription: armRevisions.description,
      authorName: users.name,
    })
    .from(planVersions)
    .innerJoin(plans, eq(plans.id, planVersions.planId))
    .innerJoin(projectMembers, memberOfPlanProject(userId))
    .innerJoin(armRevisions, eq(armRevisions.id, planVersions.armRevisionId))
    .innerJoin(users, eq(users.id, planVersions.authorId))
    .where(and(eq(planVersions.planId, planId), eq(planVersions.number, number)));
  if (!row) return undefined;
  return {
    ...row.version,
    armId: row.armId,
    armRevision: row.armRevision,
    armDescription: row.armDescription,
    authorName: row.authorName,
  };
}

export type NewVersion = {
  planId: string;
  baseVersion: number;
  document: unknown;
  armRevisionId: string;
  verdict: Verdict;
  summary: unknown;
  note: string | null;
  authorId: string;
};

/**
 * Saves the next version of a plan, but only if `baseVersion` is still the newest: the compare
 * and the increment are one UPDATE, so of two saves based on the same version exactly one wins.
 * Returns `{ conflict: latest }` for the loser (the API's 409).
 */
export async function createPlanVersion(input: NewVersion): Promise<{ version: PlanVersion } | { conflict: number }> {
  return db.transaction(async (tx) => {
    const [bumped] = await tx
      .update(plans)
      .set({ latestVersion: sql`${plans.latestVersion} + 1`, updatedAt: new Date() })
      .where(and(eq(plans.id, input.planId), eq(plans.latestVersion, input.baseVersion)))
      .returning({ latestVersion: plans.latestVersion });
    if (!bumped) {
      const [current] = await tx
        .select({ latestVersion: plans.latestVersion })
        .from(plans)
        .where(eq(plans.id, input.planId));
      return { conflict: current?.latestVersion ?? 0 };
    }
    const [version] = await tx
      .insert(planVersions)
      .values({
        planId: input.planId,
        number: bumped.latestVersion,
        document: input.document,
        armRevisionId: input.armRevisionId,
        verdict: input.verdict,
        summary: input.summary,
        note: input.note,
        authorId: input.authorId,
      })
      .returning();
    return { version };
  });
}

export type VersionForSubmission = {
  id: string;
  planId: string;
  number: number;
  document: unknown;
  armRevisionId: string;
  planName: string;
  /** The user created the plan. */
  planCreatedByUser: boolean;
  /** The user saved this version. */
  versionSavedByUser: boolean;
};

/**
 * A plan version as its would-be submitter sees it: found only in a project they are a member of,
 * with whether they created the plan and saved the version (the submission rule asks both).
 */
export async function getVersionForSubmission({
  planId,
  number,
  userId,
}: {
  planId: string;
  number: number;
  userId: string;
}): Promise<VersionForSubmission | undefined> {
  const [row] = await db
    .select({
      id: planVersions.id,
      planId: planVersions.planId,
      number: planVersions.number,
      document: planVersions.document,
      armRevisionId: planVersions.armRevisionId,
      planName: plans.name,
      planCreatedByUser: sql<boolean>`${plans.createdBy} = ${userId}`,
      versionSavedByUser: sql<boolean>`${planVersions.authorId} = ${userId}`,
    })
    .from(planVersions)
    .innerJoin(plans, eq(plans.id, planVersions.planId))
    .innerJoin(projectMembers, memberOfPlanProject(userId))
    .where(and(eq(planVersions.planId, planId), eq(planVersions.number, number)));
  return row;
}

export type SubmittablePlan = {
  planId: string;
  projectId: string;
  planName: string;
  projectName: string;
  version: number;
  verdict: Verdict;
};

/**
 * In one query: every plan the user created, in a project they are still a member of, with its latest
 * version when they saved that version themselves — what a student may submit (newest first).
 */
export async function listSubmittablePlans({ userId }: { userId: string }): Promise<SubmittablePlan[]> {
  return db
    .select({
      planId: plans.id,
      projectId: plans.projectId,
      planName: plans.name,
      projectName: projects.name,
      version: planVersions.number,
      verdict: planVersions.verdict,
    })
    .from(plans)
    .innerJoin(projectMembers, memberOfPlanProject(userId))
    .innerJoin(projects, eq(projects.id, plans.projectId))
    .innerJoin(planVersions, and(eq(planVersions.planId, plans.id), eq(planVersions.number, plans.latestVersion)))
    .where(and(eq(plans.createdBy, userId), eq(planVersions.authorId, userId)))
    .orderBy(desc(plans.updatedAt));
}
