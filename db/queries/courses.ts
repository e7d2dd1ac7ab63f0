import "server-only";
import { randomInt } from "node:crypto";
import { and, asc, desc, eq, exists, gte, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { planVersions, users, type Verdict } from "@/db/schema";
import {
  assignments,
  courseEnrolments,
  courses,
  submissions,
  type Assignment,
  type Course,
  type CourseRole,
  type Submission,
  type SubmissionStatus,
} from "@/db/schema/courses";
import { insertOutbox, type OutboxInput } from "./mail";
import { toPage, type Page, type PageAfter } from "@/lib/server/paging";
import { newestFirst, pageOrderBy, pastCursor, timestampPageKey } from "./paging";

/** Letters and digits without look-alikes (no 0/O, 1/I/L). */
const JOIN_ALPHABET = "ABCDEFGHJKMNPQRSTUVWXYZ23456789";

/** A new random join code: 8 characters, about 40 bits. */
export function newJoinCode(): string {
  let out = "";
  for (let i = 0; i < 8; i++) out += JOIN_ALPHABET[randomInt(JOIN_ALPHABET.length)];
  return out;
}

/** SQL condition: the user is enrolled in the course (optionally with this role). */
function enrolled(courseId: string, userId: string, role?: CourseRole) {
  return exists(
    db
      .select({ one: courseEnrolments.userId })
      .from(courseEnrolments)
      .where(
        and(
          eq(courseEnrolments.courseId, courseId),
          eq(courseEnrolments.userId, userId),
          role ? eq(courseEnrolments.role, role) : undefined,
        ),
      ),
  );
}

export type CourseForUser = Course & { role: CourseRole };

const courseWithRole = {
  id: courses.id,
  title: courses.title,
  term: courses.term,
  joinCode: courses.joinCode,
  projectId: courses.projectId,
  requiredArmRevisionId: courses.requiredArmRevisionId,
  limits: courses.limits,
  createdBy: courses.createdBy,
  archivedAt: courses.archivedAt,
  createdAt: courses.createdAt,
  role: courseEnrolments.role,
};

/** Creates a course with its creator as instructor; a join-code collision retries with a new code. */
export async function createCourse(input: {
  userId: string;
  title: string;
  term: string;
  projectId?: string;
  requiredArmRevisionId?: string;
  limits?: unknown;
}): Promise<CourseForUser> {
  for (let attempt = 0; ; attempt++) {
    try {
      return await db.transaction(async (tx) => {
        const [course] = await tx
          .insert(courses)
          .values({
            title: input.title,
            term: input.term,
            joinCode: newJoinCode(),
            projectId: input.projectId ?? null,
            requiredArmRevisionId: input.requiredArmRevisionId ?? null,
            limits: input.limits ?? null,
            createdBy: input.userId,
          })
          .returning();
        await tx.insert(courseEnrolments).values({ courseId: course.id, userId: input.userId, role: "instructor" });
        return { ...course, role: "instructor" as const };
      });
    } catch (err) {
      const code = (err as { cause?: { code?: string; constraint?: string } }).cause;
      if (attempt < 3 && code?.code === "23505" && code.constraint === "courses_join_code_unique") continue;
      throw err;
    }
  }
}

/** The courses the user is enrolled in, newest first. */
export async function listCoursesForUser({ userId }: { userId: string }): Promise<CourseForUser[]> {
  return db
    .select(courseWithRole)
    .from(courses)
    .innerJoin(courseEnrolments, and(eq(courseEnrolments.courseId, courses.id), eq(courseEnrolments.userId, userId)))
    .orderBy(desc(courses.createdAt));
}

/** One course, only if the user is enrolled in it. */
export async function getCourseForUser({
  courseId,
  userId,
}: {
  courseId: string;
  userId: string;
}): Promise<CourseForUser | undefined> {
  const [row] = await db
    .select(courseWithRole)
    .from(courses)
    .innerJoin(courseEnrolments, and(eq(courseEnrolments.courseId, courses.id), eq(courseEnrolments.userId, userId)))
    .where(eq(courses.id, courseId));
  return row;
}

/** The course a join code opens (the code is the credential, so no user scope). */
export async function getCourseByJoinCode({
  code,
}: {
  code: string;
}): Promise<Pick<Course, "id" | "title" | "term" | "archivedAt"> | undefined> {
  const [row] = await db
    .select({ id: courses.id, title: courses.title, term: courses.term, archivedAt: courses.archivedAt })
    .from(courses)
    .where(eq(courses.joinCode, code));
  return row;
}

/** Enrols the user as a student; someone already enrolled keeps their role. Returns the role they hold. */
export async function enrolStudent({ courseId, userId }: { courseId: string; userId: string }): Promise<CourseRole> {
  await db.insert(courseEnrolments).values({ courseId, userId, role: "student" }).onConflictDoNothing();
  const [row] = await db
    .select({ role: courseEnrolments.role })
    .from(courseEnrolments)
    .where(and(eq(courseEnrolments.courseId, courseId), eq(courseEnrolments.userId, userId)));
  return row.role;
}

export type RosterEntry = { userId: string; name: string; email: string; role: CourseRole; joinedAt: Date };

/** Everyone in the course, listed only to someone enrolled in it (the handler allows instructors only). */
export async function listRoster({ courseId, userId }: { courseId: string; userId: string }): Promise<RosterEntry[]> {
  return db
    .select({
      userId: users.id,
      name: users.name,
      email: users.email,
      role: courseEnrolments.role,
      joinedAt: courseEnrolments.joinedAt,
    })
    .from(courseEnrolments)
    .innerJoin(users, eq(users.id, courseEnrolments.userId))
    .where(and(eq(courseEnrolments.courseId, courseId), enrolled(courseId, userId, "instructor")))
    .orderBy(asc(courseEnrolments.role), asc(users.name));
}

/** Removes a student from a course the instructor teaches; their submissions stay for the record. */
export async function removeStudent({
  courseId,
  instructorId,
  userId,
}: {
  courseId: string;
  instructorId: string;
  userId: string;
}): Promise<boolean> {
  const removed = await db
    .delete(courseEnrolments)
    .where(
      and(
        eq(courseEnrolments.courseId, courseId),
        eq(courseEnrolments.userId, userId),
        eq(courseEnrolments.role, "student"),
        enrolled(courseId, instructorId, "instructor"),
      ),
    )
    .returning({ userId: courseEnrolments.userId });
  return removed.length > 0;
}

/** The instructors of a course (who receive "submission received"). */
export async function listCourseInstructors({
  courseId,
}: {
  courseId: string;
}): Promise<{ id: string; name: string; email: string }[]> {
  return db
    .select({ id: users.id, name: users.name, email: users.email })
    .from(courseEnrolments)
    .innerJoin(users, eq(users.id, courseEnrolments.userId))
    .where(and(eq(courseEnrolments.courseId, courseId), eq(courseEnrolments.role, "instructor")));
}

/** Adds an assignment to a course the user teaches; undefined when they do not. */
export async function createAssignment(input: {
  courseId: string;
  userId: string;
  title: string;
  instructions: string;
  dueAt: Date;
  requiredArmRevisionId: string;
  requiredStart?: number[];
  requiredGoals?: number[][];
  poseTolerance: number;
  limits?: unknown;
}): Promise<Assignment | undefined> {
  const [course] = await db
    .select({ id: courses.id })
    .from(courses)
    .where(and(eq(courses.id, input.courseId), enrolled(input.courseId, input.userId, "instructor")));
  if (!course) return undefined;
  const [row] = await db
    .insert(assignments)
    .values({
      courseId: input.courseId,
      title: input.title,
      instructions: input.instructions,
      dueAt: input.dueAt,
      requiredArmRevisionId: input.requiredArmRevisionId,
      requiredStart: input.requiredStart ?? null,
      requiredGoals: input.requiredGoals ?? null,
      poseTolerance: input.poseTolerance,
      limits: input.limits ?? null,
      createdBy: input.userId,
    })
    .returning();
  return row;
}

/** What a student sees per assignment. */
export type AssignmentStatus = "not-started" | "draft" | SubmissionStatus;
export type AssignmentListItem = Assignment & { status: AssignmentStatus; latestSubmissionId: string | null };

/** The assignments of a course the user is enrolled in, by due date, with the user's own status. */
export async function listAssignmentsForUser({
  courseId,
  userId,
}: {
  courseId: string;
  userId: string;
}): Promise<AssignmentListItem[]> {
  const rows = await db
    .select()
    .from(assignments)
    .where(and(eq(assignments.courseId, courseId), enrolled(courseId, userId)))
    .orderBy(asc(assignments.dueAt), asc(assignments.title));
  if (rows.length === 0) return [];
  const latest = await db
    .selectDistinctOn([submissions.assignmentId], {
      assignmentId: submissions.assignmentId,
      id: submissions.id,
      status: submissions.status,
    })
    .from(submissions)
    .where(
      and(
        eq(submissions.studentId, userId),
        inArray(
          submissions.assignmentId,
          rows.map((r) => r.id),
        ),
      ),
    )
    .orderBy(submissions.assignmentId, desc(submissions.attempt));
  const byAssignment = new Map(latest.map((l) => [l.assignmentId, l]));
  // "Draft": nothing submitted yet, but the user saved a plan version on the required arm revision
  // since the assignment was set — one query for all the open assignments.
  const open = rows.filter((a) => !byAssignment.has(a.id)).map((a) => a.id);
  const drafted =
    open.length === 0
      ? []
      : await db
          .select({ id: assignments.id })
          .from(assignments)
          .where(
            and(
              inArray(assignments.id, open),
              exists(
                db
                  .select({ one: planVersions.id })
                  .from(planVersions)
                  .where(
                    and(
                      eq(planVersions.authorId, userId),
                      eq(planVersions.armRevisionId, assignments.requiredArmRevisionId),
                      gte(planVersions.createdAt, assignments.createdAt),
                    ),
                  ),
              ),
            ),
          );
  const drafts = new Set(drafted.map((d) => d.id));
  return rows.map((a) => {
    const l = byAssignment.get(a.id);
    return {
      ...a,
      status: l?.status ?? (drafts.has(a.id) ? "draft" : "not-started"),
      latestSubmissionId: l?.id ?? null,
    };
  });
}

export type AssignmentForUser = Assignment & {
  role: CourseRole;
  courseTitle: string;
  courseArmRevisionId: string | null;
  courseLimits: unknown;
};

/** One assignment, only for someone enrolled in its course. */
export async function getAssignmentForUser({
  assignmentId,
  userId,
}: {
  assignmentId: string;
  userId: string;
}): Promise<AssignmentForUser | undefined> {
  const [row] = await db
    .select({
      assignment: assignments,
      role: courseEnrolments.role,
      courseTitle: courses.title,
      courseArmRevisionId: courses.requiredArmRevisionId,
      courseLimits: courses.limits,
    })
    .from(assignments)
    .innerJoin(courses, eq(courses.id, assignments.courseId))
    .innerJoin(courseEnrolments, and(eq(courseEnrolments.courseId, courses.id), eq(courseEnrolments.userId, userId)))
    .where(eq(assignments.id, assignmentId));
  if (!row) return undefined;
  return {
    ...row.assignment,
    role: row.role,
    courseTitle: row.courseTitle,
    courseArmRevisionId: row.courseArmRevisionId,
    courseLimits: row.courseLimits,
  };
}

export type NewSubmission = {
  assignmentId: string;
  studentId: string;
  planId: string;
  planVersionId: string | null;
  planVersionNumber: number;
  document: unknown;
  armRevisionId: string;
  report: unknown;
  verdict: Verdict;
  ruleProblems: unknown;
  late: boolean;
};

/**
 * Saves a submission and its e-mails in one transaction. The student must still be enrolled as a
 * student (checked in the same transaction). A new submission after a returned one is linked to it;
 * one waiting for review or approved refuses a new one (`{ conflict }`).
 */
export async function createSubmission(
  input: NewSubmission,
  mails: (submission: Submission) => OutboxInput[],
): Promise<{ submission: Submission; mailIds: string[] } | { conflict: "open" | "approved" } | { notEnrolled: true }> {
  return db.transaction(async (tx) => {
    const [assignment] = await tx
      .select({ courseId: assignments.courseId })
      .from(assignments)
      .innerJoin(
        courseEnrolments,
        and(
          eq(courseEnrolments.courseId, assignments.courseId),
          eq(courseEnrolments.userId, input.studentId),
          eq(courseEnrolments.role, "student"),
        ),
      )
      .where(eq(assignments.id, input.assignmentId));
    if (!assignment) return { notEnrolled: true as const };
    // Serialise submissions of one student to one assignment (two tabs submitting at once).
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${input.assignmentId + ":" + input.studentId}))`);
    const [previous] = await tx
      .select({ id: submissions.id, status: submissions.status, attempt: submissions.attempt })
      .from(submissions)
      .where(and(eq(submissions.assignmentId, input.assignmentId), eq(submissions.studentId, input.studentId)))
      .orderBy(desc(submissions.attempt))
      .limit(1);
    if (previous?.status === "submitted") return { conflict: "open" as const };
    if (previous?.status === "approved") return { conflict: "approved" as const };
    const [submission] = await tx
      .insert(submissions)
      .values({ ...input, attempt: (previous?.attempt ?? 0) + 1, previousId: previous?.id ?? null })
      .returning();
    const mailIds = await insertOutbox(tx, mails(submission));
    return { submission, mailIds };
  });
}

export type MySubmission = Omit<Submission, "document" | "report"> & {
  assignmentTitle: string;
  courseId: string;
  courseTitle: string;
};

/** The user's own submissions, newest first (optionally for one assignment). */
const ownSubmissionsOrder = newestFirst(submissions.submittedAt, submissions.id);

/** The user's own submissions (all, or of one assignment), newest first: every one, for the pages that show them all. */
export async function listOwnSubmissions({
  userId,
  assignmentId,
}: {
  userId: string;
  assignmentId?: string;
}): Promise<MySubmission[]> {
  const page = await listOwnSubmissionsPage({ userId, assignmentId, limit: Number.MAX_SAFE_INTEGER - 1 });
  return page.items;
}

/** One page of the user's own submissions (all, or of one assignment), newest first. */
export async function listOwnSubmissionsPage({
  userId,
  assignmentId,
  limit,
  after,
}: {
  userId: string;
  assignmentId?: string;
  limit: number;
  after?: PageAfter;
}): Promise<Page<MySubmission>> {
  const rows = await db
    .select({
      pageKey: timestampPageKey(submissions.submittedAt),
      id: submissions.id,
      assignmentId: submissions.assignmentId,
      studentId: submissions.studentId,
      planId: submissions.planId,
      planVersionId: submissions.planVersionId,
      planVersionNumber: submissions.planVersionNumber,
      armRevisionId: submissions.armRevisionId,
      verdict: submissions.verdict,
      ruleProblems: submissions.ruleProblems,
      late: submissions.late,
      status: submissions.status,
      attempt: submissions.attempt,
      previousId: submissions.previousId,
      submittedAt: submissions.submittedAt,
      assignmentTitle: assignments.title,
      courseId: courses.id,
      courseTitle: courses.title,
    })
    .from(submissions)
    .innerJoin(assignments, eq(assignments.id, submissions.assignmentId))
    .innerJoin(courses, eq(courses.id, assignments.courseId))
    .where(
      and(
        eq(submissions.studentId, userId),
        assignmentId ? eq(submissions.assignmentId, assignmentId) : undefined,
        pastCursor(ownSubmissionsOrder, after),
      ),
    )
    .orderBy(...pageOrderBy(ownSubmissionsOrder))
    .limit(limit + 1);
  return toPage(
    rows,
    limit,
    (r) => r.id,
    ({ pageKey: _key, ...submission }) => submission,
  );
}
