import "server-only";
import { and, desc, eq } from "drizzle-orm";
import { db } from "@/db";
import { projectMembers, recordings, type Recording } from "@/db/schema";

export type NewRecording = typeof recordings.$inferInsert;

export async function createRecording(input: NewRecording): Promise<Recording> {
  const [row] = await db.insert(recordings).values(input).returning();
  return row;
}

/** The recordings of a project the user is a member of, newest first. */
export async function listRecordings({
  projectId,
  userId,
}: {
  projectId: string;
  userId: string;
}): Promise<Recording[]> {
  const rows = await db
    .select({ recording: recordings })
    .from(recordings)
    .innerJoin(
      projectMembers,
      and(eq(projectMembers.projectId, recordings.projectId), eq(projectMembers.userId, userId)),
    )
    .where(eq(recordings.projectId, projectId))
    .orderBy(desc(recordings.createdAt));
  return rows.map((r) => r.recording);
}

/** One recording with the user's role in its project, if they are a member. */
export async function getRecordingForUser({ recordingId, userId }: { recordingId: string; userId: string }) {
  const [row] = await db
    .select({ recording: recordings, role: projectMembers.role })
    .from(recordings)
    .innerJoin(
      projectMembers,
      and(eq(projectMembers.projectId, recordings.projectId), eq(projectMembers.userId, userId)),
    )
    .where(eq(recordings.id, recordingId));
  return row;
}
