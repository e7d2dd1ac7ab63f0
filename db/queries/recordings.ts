import "server-only";
import { and, eq } from "drizzle-orm";
import { toPage, type Page, type PageAfter } from "@/lib/server/paging";
import { newestFirst, pageOrderBy, pastCursor, timestampPageKey } from "./paging";
import { db } from "@/db";
import { projectMembers, recordings, type Recording } from "@/db/schema";

export type NewRecording = typeof recordings.$inferInsert;

export async function createRecording(input: NewRecording): Promise<Recording> {
  const [row] = await db.insert(recordings).values(input).returning();
  return row;
}

/** The recordings of a project the user is a member of, newest first. */
const recordingsOrder = newestFirst(recordings.createdAt, recordings.id);

/** A project's recordings, newest first (the recordings page shows them all). */
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
    .orderBy(...pageOrderBy(recordingsOrder));
  return rows.map((r) => r.recording);
}

/** One page of a project's recordings, newest first. */
export async function listRecordingsPage({
  projectId,
  userId,
  limit,
  after,
}: {
  projectId: string;
  userId: string;
  limit: number;
  after?: PageAfter;
}): Promise<Page<Recording>> {
  const rows = await db
    .select({ recording: recordings, pageKey: timestampPageKey(recordings.createdAt) })
    .from(recordings)
    .innerJoin(
      projectMembers,
      and(eq(projectMembers.projectId, recordings.projectId), eq(projectMembers.userId, userId)),
    )
    .where(and(eq(recordings.projectId, projectId), pastCursor(recordingsOrder, after)))
    .orderBy(...pageOrderBy(recordingsOrder))
    .limit(limit + 1);
  return toPage(
    rows,
    limit,
    (r) => r.recording.id,
    (r) => r.recording,
  );
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
