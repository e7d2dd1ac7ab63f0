import "server-only";
import { and, eq } from "drizzle-orm";
import { db } from "@/db";
import { auditLog, projectMembers, users, type AuditEntry } from "@/db/schema";
import { toPage, type Page, type PageAfter } from "@/lib/server/paging";
import { pageOrderBy, pastCursor, timestampPageKey, type PageOrder } from "./paging";

/** Appends one entry to the audit log. */
export async function recordAudit(entry: AuditEntry): Promise<void> {
  await db.insert(auditLog).values(entry);
}

export type AuditListItem = {
  id: number;
  actorId: string | null;
  actorName: string | null;
  action: string;
  targetType: string;
  targetId: string;
  createdAt: Date;
};

const auditOrder: PageOrder = {
  key: auditLog.createdAt,
  id: auditLog.id,
  direction: "newest first",
  keyType: "timestamptz",
  idType: "bigint",
};

/**
 * One page of a project's audit log, newest first, ties broken by id, for a member of the
 * project (lib/server/permissions decides which role may read it); `after` is the last row of
 * the previous page.
 */
export async function listProjectAuditPage({
  projectId,
  userId,
  limit,
  after,
}: {
  projectId: string;
  userId: string;
  limit: number;
  after?: PageAfter;
}): Promise<Page<AuditListItem>> {
  const rows = await db
    .select({
      id: auditLog.id,
      actorId: auditLog.actorId,
      actorName: users.name,
      action: auditLog.action,
      targetType: auditLog.targetType,
      targetId: auditLog.targetId,
      createdAt: auditLog.createdAt,
      pageKey: timestampPageKey(auditLog.createdAt),
    })
    .from(auditLog)
    .innerJoin(projectMembers, and(eq(projectMembers.projectId, auditLog.projectId), eq(projectMembers.userId, userId)))
    .leftJoin(users, eq(users.id, auditLog.actorId))
    .where(and(eq(auditLog.projectId, projectId), pastCursor(auditOrder, after)))
    .orderBy(...pageOrderBy(auditOrder))
    .limit(limit + 1);
  return toPage(
    rows,
    limit,
    (r) => String(r.id),
    ({ pageKey: _key, ...entry }) => entry,
  );
}
