import { sql } from "drizzle-orm";
import {
  boolean,
  check,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
import { armRevisions } from "./arms";
import { planVersions, plans, verdict } from "./plans";
import { projects } from "./projects";
import { users } from "./users";

/** A person's role inside one course (independent of their site role). */
export const courseRole = pgEnum("course_role", ["instructor", "student"]);
/** Where a submission stands: waiting for review, returned with comments, or approved. */
export const submissionStatus = pgEnum("submission_status", ["submitted", "returned", "approved"]);
/** An instructor's decision on a submission. */
export const reviewDecision = pgEnum("review_decision", ["returned", "approved"]);

/**
 * A course: a title and term, a join code students type or follow as a link, and optionally a
 * required arm revision and limits stricter than the arm's own that every submission is checked
 * against. `projectId` links the course's shared project when there is one (the demo seed has one).
 */
export const courses = pgTable(
  "courses",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    title: text("title").notNull(),
    term: text("term").notNull(),
    /** Eight upper-case letters and digits without look-alikes (made by `newJoinCode` in db/queries/courses.ts). */
    joinCode: text("join_code").notNull().unique(),
    projectId: uuid("project_id").references(() => projects.id, { onDelete: "set null" }),
    requiredArmRevisionId: uuid("required_arm_revision_id").references(() => armRevisions.id, { onDelete: "restrict" }),
    /** `limitsSchema` (lib/shared/schemas/courses.ts): scale factors and per-joint caps, only ever tightening. */
    limits: jsonb("limits"),
    createdBy: uuid("created_by")
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    archivedAt: timestamp("archived_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("courses_title_length", sql`char_length(${t.title}) between 1 and 120`),
    check("courses_term_length", sql`char_length(${t.term}) between 1 and 60`),
    check("courses_join_code_shape", sql`${t.joinCode} ~ '^[A-Z0-9]{8}$'`),
    check("courses_limits_object", sql`${t.limits} is null or jsonb_typeof(${t.limits}) = 'object'`),
  ],
);

/** Who is in a course, and as what. Removing a student deletes the row; their submissions stay. */
export const courseEnrolments = pgTable(
  "course_enrolments",
  {
    courseId: uuid("course_id")
      .notNull()
      .references(() => courses.id, { onDelete: "cascade" }),
    userId: uuid("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: courseRole("role").notNull(),
    joinedAt: timestamp("joined_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.courseId, t.userId] }), index("course_enrolments_user").on(t.userId)],
);

/** An assignment: what to reach, on which arm, under which (stricter) limits, by when. */
export const assignments = pgTable(
  "assignments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    courseId: uuid("course_id")
      .notNull()
      .references(() => courses.id, { onDelete: "cascade" }),
    title: text("title").notNull(),
    instructions: text("instructions").notNull().default(""),
    dueAt: timestamp("due_at", { withTimezone: true }).notNull(),
    requiredArmRevisionId: uuid("required_arm_revision_id")
      .notNull()
      .references(() => armRevisions.id, { onDelete: "restrict" }),
    /** A pose (rad or m per joint) the plan must start from, or null. */
    requiredStart: jsonb("required_start"),
    /** Poses the plan must pass through in order as move goals, or null. */
    requiredGoals: jsonb("required_goals"),
    /** How close (rad or m, per joint) a pose counts as reached. */
    poseTolerance: doublePrecision("pose_tolerance").notNull().default(0.001),
    limits: jsonb("limits"),
    createdBy: uuid("created_by")
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("assignments_title_length", sql`char_length(${t.title}) between 1 and 120`),
    check("assignments_instructions_length", sql`char_length(${t.instructions}) <= 5000`),
    check("assignments_pose_tolerance_positive", sql`${t.poseTolerance} > 0`),
    index("assignments_course_due").on(t.courseId, t.dueAt),
  ],
);

/**
 * One submitted plan version, frozen: the document, the arm revision and the report of the
 * server-side re-check are copied in, so nothing the student does later changes it. A resubmission
 * is a new row pointing at the one it replaces (`previousId`); each row is replaced at most once.
 */
export const submissions = pgTable(
  "submissions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    assignmentId: uuid("assignment_id")
      .notNull()
      .references(() => assignments.id, { onDelete: "cascade" }),
    studentId: uuid("student_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    planId: uuid("plan_id").references(() => plans.id, { onDelete: "set null" }),
    planVersionId: uuid("plan_version_id").references(() => planVersions.id, { onDelete: "set null" }),
    planVersionNumber: integer("plan_version_number").notNull(),
    document: jsonb("document").notNull(),
    armRevisionId: uuid("arm_revision_id")
      .notNull()
      .references(() => armRevisions.id, { onDelete: "restrict" }),
    /** The engine's report against the tightened limits. */
    report: jsonb("report").notNull(),
    verdict: verdict("verdict").notNull(),
    /** Assignment rules the plan does not meet (required start, goals, arm revision). */
    ruleProblems: jsonb("rule_problems")
      .notNull()
      .default(sql`'[]'::jsonb`),
    late: boolean("late").notNull(),
    status: submissionStatus("status").notNull().default("submitted"),
    attempt: integer("attempt").notNull().default(1),
    previousId: uuid("previous_id"),
    submittedAt: timestamp("submitted_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("submissions_attempt_positive", sql`${t.attempt} > 0`),
    check("submissions_document_object", sql`jsonb_typeof(${t.document}) = 'object'`),
    uniqueIndex("submissions_previous_once").on(t.previousId),
    // At most one submission waiting for review per student and assignment.
    uniqueIndex("submissions_one_open")
      .on(t.assignmentId, t.studentId)
      .where(sql`${t.status} = 'submitted'`),
    index("submissions_assignment_time").on(t.assignmentId, t.submittedAt),
    index("submissions_student").on(t.studentId),
  ],
);

/** The decision that closed a submission: returned (with a summary) or approved. One per submission. */
export const reviews = pgTable(
  "reviews",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    submissionId: uuid("submission_id")
      .notNull()
      .unique()
      .references(() => submissions.id, { onDelete: "cascade" }),
    reviewerId: uuid("reviewer_id")
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    decision: reviewDecision("decision").notNull(),
    summary: text("summary").notNull().default(""),
    /**
     * Why the reviewer approved although the server's check found a fault: typed in the approval
     * dialog that lists the faults, shown to the student. Null for every other decision.
     */
    faultApprovalReason: text("fault_approval_reason"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("reviews_summary_length", sql`char_length(${t.summary}) <= 5000`),
    check(
      "reviews_fault_approval_reason_length",
      sql`${t.faultApprovalReason} is null or char_length(${t.faultApprovalReason}) between 1 and 1000`,
    ),
    check(
      "reviews_fault_approval_reason_approved_only",
      sql`${t.faultApprovalReason} is null or ${t.decision} = 'approved'`,
    ),
  ],
);

/** A reviewer's comment, optionally pinned to a move, a joint and a time (s from the plan's start). */
export const reviewComments = pgTable(
  "review_comments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    submissionId: uuid("submission_id")
      .notNull()
      .references(() => submissions.id, { onDelete: "cascade" }),
    authorId: uuid("author_id")
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    body: text("body").notNull(),
    moveIndex: integer("move_index"),
    jointIndex: integer("joint_index"),
    timeS: doublePrecision("time_s"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("review_comments_body_length", sql`char_length(${t.body}) between 1 and 5000`),
    check("review_comments_move_nonnegative", sql`${t.moveIndex} is null or ${t.moveIndex} >= 0`),
    check("review_comments_joint_nonnegative", sql`${t.jointIndex} is null or ${t.jointIndex} >= 0`),
    check("review_comments_time_nonnegative", sql`${t.timeS} is null or ${t.timeS} >= 0`),
    index("review_comments_submission").on(t.submissionId, t.createdAt),
  ],
);

export type Course = typeof courses.$inferSelect;
export type CourseEnrolment = typeof courseEnrolments.$inferSelect;
export type CourseRole = (typeof courseRole.enumValues)[number];
export type Assignment = typeof assignments.$inferSelect;
export type Submission = typeof submissions.$inferSelect;
export type SubmissionStatus = (typeof submissionStatus.enumValues)[number];
export type Review = typeof reviews.$inferSelect;
export type ReviewDecision = (typeof reviewDecision.enumValues)[number];
export type ReviewComment = typeof reviewComments.$inferSelect;
