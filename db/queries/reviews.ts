import "server-only";
import { aliasedTable, and, asc, desc, eq, exists, or, sql, type SQL } from "drizzle-orm";
import { db } from "@/db";
import { users, type Verdict } from "@/db/schema";
import {
  assignments,
  courseEnrolments,
  courses,
  reviewComments,
  reviews,
  submissions,
  type Assignment,
  type CourseRole,
  type Review,
  type ReviewComment,
  type ReviewDecision,
  type Submission,
  type SubmissionStatus,
} from "@/db/schema/courses";
import type { Page } from "@/lib/server/paging";
import { encodeQueueCursor, type QueueAfter, type QueueOrder } from "@/lib/server/review-queue-paging";
import { insertOutbox, type OutboxInput } from "./mail";
import { timestampPageKey } from "./paging";

/** SQL condition: `userId` teaches the course the submission's assignment belongs to. */
function teachesSubmission(userId: string) {
  return exists(
    db
      .select({ one: courseEnrolments.userId })
      .from(courseEnrolments)
      .where(
        and(
          eq(courseEnrolments.courseId, assignments.courseId),
          eq(courseEnrolments.userId, userId),
          eq(courseEnrolments.role, "instructor"),
        ),
      ),
  );
}

export type QueueItem = {
  id: string;
  studentId: string;
  studentName: string;
  studentEmail: string;
  assignmentId: string;
  assignmentTitle: string;
  courseId: string;
  courseTitle: string;
  submittedAt: Date;
  dueAt: Date;
  late: boolean;
  attempt: number;
  verdict: Verdict;
  status: SubmissionStatus;
};

export type QueueFilter = {
  courseId?: string;
  assignmentId?: string;
  status?: SubmissionStatus;
  verdict?: Verdict;
};

/** Waiting submissions first: false (waiting) sorts before true. */
const decided = sql<boolean>`(${submissions.status} <> 'submitted')`;

/** The column each sort orders by, and the type its cursor value is read back as. */
const sortColumns = {
  submittedAt: { column: submissions.submittedAt, cast: "timestamptz" },
  student: { column: users.name, cast: "text" },
  assignment: { column: assignments.title, cast: "text" },
  // enums compare in their declared order, as the table in the browser ranks them
  verdict: { column: submissions.verdict, cast: "verdict" },
  status: { column: submissions.status, cast: "submission_status" },
} as const;

/** The `where` condition of the rows after the cursor's row, in the queue's order. */
function pastQueueCursor(order: QueueOrder, after: QueueAfter | undefined): SQL | undefined {
  if (!after) return undefined;
  // the waiting order: waiting first, then the longest wait, then the id
  const waiting = sql`(${decided}, ${submissions.submittedAt}, ${submissions.id}) > (${after.status !== "submitted"}::boolean, ${after.submittedKey}::timestamptz, ${after.id}::uuid)`;
  if (!order) return waiting;
  const { column, cast } = sortColumns[order.sort];
  const value = sql`${order.sort === "submittedAt" ? after.submittedKey : after.value}::${sql.raw(cast)}`;
  const beyond = sql.raw(order.order === "desc" ? "<" : ">");
  // the chosen column in its direction; its ties in the waiting order, always ascending
  return sql`(${column} ${beyond} ${value} or (${column} = ${value} and ${waiting}))`;
}

/**
 * One page of the review queue: submissions to the courses the user teaches, filtered, in the
 * chosen column's order or (none chosen) waiting first, oldest first; ties always in the waiting
 * order and then by id, so paging gives every row once.
 */
export async function listReviewQueuePage({
  userId,
  filter,
  order,
  limit,
  after,
}: {
  userId: string;
  filter: QueueFilter;
  order: QueueOrder;
  limit: number;
  after?: QueueAfter;
}): Promise<Page<QueueItem>> {
  const where: (SQL | undefined)[] = [
    teachesSubmission(userId),
    filter.courseId ? eq(assignments.courseId, filter.courseId) : undefined,
    filter.assignmentId ? eq(submissions.assignmentId, filter.assignmentId) : undefined,
    filter.status ? eq(submissions.status, filter.status) : undefined,
    filter.verdict ? eq(submissions.verdict, filter.verdict) : undefined,
    pastQueueCursor(order, after),
  ];
  const waitingOrder = [asc(decided), asc(submissions.submittedAt), asc(submissions.id)];
  const orderBy = order
    ? [(order.order === "desc" ? desc : asc)(sortColumns[order.sort].column), ...waitingOrder]
    : waitingOrder;
  const rows = await db
    .select({
      id: submissions.id,
      studentId: submissions.studentId,
      studentName: users.name,
      studentEmail: users.email,
      assignmentId: submissions.assignmentId,
      assignmentTitle: assignments.title,
      courseId: courses.id,
      courseTitle: courses.title,
      submittedAt: submissions.submittedAt,
      dueAt: assignments.dueAt,
      late: submissions.late,
      attempt: submissions.attempt,
      verdict: submissions.verdict,
      status: submissions.status,
      submittedKey: timestampPageKey(submissions.submittedAt),
    })
    .from(submissions)
    .innerJoin(assignments, eq(assignments.id, submissions.assignmentId))
    .innerJoin(courses, eq(courses.id, assignments.courseId))
    .innerJoin(users, eq(users.id, submissions.studentId))
    .where(and(...where))
    .orderBy(...orderBy)
    .limit(limit + 1);
  const valueOf = (r: (typeof rows)[number]): string =>
    !order || order.sort === "submittedAt"
      ? ""
      : { student: r.studentName, assignment: r.assignmentTitle, verdict: r.verdict, status: r.status }[order.sort];
  const more = rows.length > limit;
  const shown = more ? rows.slice(0, limit) : rows;
  const last = shown.at(-1);
  return {
    items: shown.map(({ submittedKey: _key, ...item }) => item),
    nextCursor:
      more && last
        ? encodeQueueCursor(order, {
            submittedKey: last.submittedKey,
            status: last.status,
            value: valueOf(last),
            id: last.id,
          })
        : null,
  };
}

export type SubmissionForUser = Submission & {
  /** How the user relates to it: the course's instructor, or the student who submitted it. */
  viewerRole: CourseRole;
  assignment: Assignment;
  courseTitle: string;
  /** The course's own stricter limits (the assignment's are in `assignment.limits`). */
  courseLimits: unknown;
  studentName: string;
  studentEmail: string;
  review: Review | null;
};

/** One submission, only for its student or an instructor of its course. */
export async function getSubmissionForUser({
  submissionId,
  userId,
}: {
  submissionId: string;
  userId: string;
}): Promise<SubmissionForUser | undefined> {
  const student = aliasedTable(users, "student");
  const [row] = await db
    .select({
      submission: submissions,
      assignment: assignments,
      courseTitle: courses.title,
      courseLimits: courses.limits,
      studentName: student.name,
      studentEmail: student.email,
      review: reviews,
      teaches: sql<boolean>`${teachesSubmission(userId)}`,
    })
    .from(submissions)
    .innerJoin(assignments, eq(assignments.id, submissions.assignmentId))
    .innerJoin(courses, eq(courses.id, assignments.courseId))
    .innerJoin(student, eq(student.id, submissions.studentId))
    .leftJoin(reviews, eq(reviews.submissionId, submissions.id))
    .where(and(eq(submissions.id, submissionId), or(eq(submissions.studentId, userId), teachesSubmission(userId))));
  if (!row) return undefined;
  return {
    ...row.submission,
    viewerRole: row.teaches ? "instructor" : "student",
    assignment: row.assignment,
    courseTitle: row.courseTitle,
    courseLimits: row.courseLimits,
    studentName: row.studentName,
    studentEmail: row.studentEmail,
    review: row.review,
  };
}

export type CommentItem = ReviewComment & { authorName: string };

/** A submission's comments, oldest first, for its student or an instructor of its course. */
export async function listComments({
  submissionId,
  userId,
}: {
  submissionId: string;
  userId: string;
}): Promise<CommentItem[]> {
  const rows = await db
    .select({ comment: reviewComments, authorName: users.name })
    .from(reviewComments)
    .innerJoin(submissions, eq(submissions.id, reviewComments.submissionId))
    .innerJoin(assignments, eq(assignments.id, submissions.assignmentId))
    .innerJoin(users, eq(users.id, reviewComments.authorId))
    .where(
      and(
        eq(reviewComments.submissionId, submissionId),
        or(eq(submissions.studentId, userId), teachesSubmission(userId)),
      ),
    )
    .orderBy(asc(reviewComments.createdAt), asc(reviewComments.id));
  return rows.map((r) => ({ ...r.comment, authorName: r.authorName }));
}

/** Adds a comment to a submission the user teaches and that is still waiting for review. */
export async function addComment(input: {
  submissionId: string;
  authorId: string;
  body: string;
  moveIndex?: number;
  jointIndex?: number;
  timeS?: number;
}): Promise<ReviewComment | undefined> {
  const [open] = await db
    .select({ id: submissions.id })
    .from(submissions)
    .innerJoin(assignments, eq(assignments.id, submissions.assignmentId))
    .where(
      and(
        eq(submissions.id, input.submissionId),
        eq(submissions.status, "submitted"),
        teachesSubmission(input.authorId),
      ),
    );
  if (!open) return undefined;
  const [row] = await db
    .insert(reviewComments)
    .values({
      submissionId: input.submissionId,
      authorId: input.authorId,
      body: input.body,
      moveIndex: input.moveIndex ?? null,
      jointIndex: input.jointIndex ?? null,
      timeS: input.timeS ?? null,
    })
    .returning();
  return row;
}

/**
 * Approves or returns a submission waiting for review, with its e-mail, in one transaction. Of two
 * decisions at once exactly one wins: the status change is a compare-and-set in one UPDATE.
 */
export async function decideSubmission(
  input: {
    submissionId: string;
    reviewerId: string;
    decision: ReviewDecision;
    summary: string;
    faultApprovalReason?: string | null;
  },
  mails: (review: Review) => OutboxInput[],
): Promise<{ review: Review; mailIds: string[] } | undefined> {
  return db.transaction(async (tx) => {
    const [changed] = await tx
      .update(submissions)
      .set({ status: input.decision })
      .where(
        and(
          eq(submissions.id, input.submissionId),
          eq(submissions.status, "submitted"),
          exists(
            tx
              .select({ one: assignments.id })
              .from(assignments)
              .innerJoin(courseEnrolments, eq(courseEnrolments.courseId, assignments.courseId))
              .where(
                and(
                  eq(assignments.id, submissions.assignmentId),
                  eq(courseEnrolments.userId, input.reviewerId),
                  eq(courseEnrolments.role, "instructor"),
                ),
              ),
          ),
        ),
      )
      .returning({ id: submissions.id });
    if (!changed) return undefined;
    const [review] = await tx
      .insert(reviews)
      .values({
        submissionId: input.submissionId,
        reviewerId: input.reviewerId,
        decision: input.decision,
        summary: input.summary,
        faultApprovalReason: input.faultApprovalReason ?? null,
      })
      .returning();
    const mailIds = await insertOutbox(tx, mails(review));
    return { review, mailIds };
  });
}

export type GradeRow = {
  studentName: string;
  studentEmail: string;
  assignmentTitle: string;
  dueAt: Date;
  attempt: number;
  submittedAt: Date;
  late: boolean;
  verdict: Verdict;
  status: SubmissionStatus;
  summary: string | null;
};

/** The latest submission of every student to every assignment of a course the user teaches. */
export async function listGrades({ courseId, userId }: { courseId: string; userId: string }): Promise<GradeRow[]> {
  return db
    .selectDistinctOn([submissions.studentId, submissions.assignmentId], {
      studentName: users.name,
      studentEmail: users.email,
      assignmentTitle: assignments.title,
      dueAt: assignments.dueAt,
      attempt: submissions.attempt,
      submittedAt: submissions.submittedAt,
      late: submissions.late,
      verdict: submissions.verdict,
      status: submissions.status,
      summary: reviews.summary,
    })
    .from(submissions)
    .innerJoin(assignments, eq(assignments.id, submissions.assignmentId))
    .innerJoin(users, eq(users.id, submissions.studentId))
    .leftJoin(reviews, eq(reviews.submissionId, submissions.id))
    .where(and(eq(assignments.courseId, courseId), teachesSubmission(userId)))
    .orderBy(submissions.studentId, submissions.assignmentId, desc(submissions.attempt));
}
