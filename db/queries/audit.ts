import "server-only";
import { and, desc, eq } from "drizzle-orm";
import { db } from "@/db";
import { auditLog, projectMembers, type AuditEntry } from "@/db/schema";

/** Appends one entry to the audit log. */
export async function recordAudit(entry: AuditEntry): Promise<void> {
  await db.insert(auditLog).values(entry);
}

/** The newest audit entries of a project the user is a member of. */
export async function listProjectAudit({ projectId, userId, limit = 100 }: { projectId: string; userId: string; limit?: number }) {
  return db
    .select({
      id: auditLog.id,
      actorId: auditLog.actorId,
      action: auditLog.action,
      targetType: auditLog.targetType,
      targetId: auditLog.targetId,
      createdAt: auditLog.createdAt,
    })
    .from(auditLog)
    .innerJoin(projectMembers, and(eq(projectMembers.projectId, auditLog.projectId), eq(projectMembers.userId, userId)))
    .where(eq(auditLog.projectId, projectId))
    .orderBy(desc(auditLog.createdAt))
    .limit(limit);
}
