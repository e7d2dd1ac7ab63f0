CREATE TYPE "public"."account_token_purpose" AS ENUM('password-reset', 'email-verification');--> statement-breakpoint
CREATE TYPE "public"."course_role" AS ENUM('instructor', 'student');--> statement-breakpoint
CREATE TYPE "public"."mail_status" AS ENUM('queued', 'sending', 'sent', 'failed');--> statement-breakpoint
CREATE TYPE "public"."review_decision" AS ENUM('returned', 'approved');--> statement-breakpoint
CREATE TYPE "public"."submission_status" AS ENUM('submitted', 'returned', 'approved');--> statement-breakpoint
CREATE TABLE "account_tokens" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"purpose" "account_token_purpose" NOT NULL,
	"token_hash" text NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"used_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "account_tokens_token_hash_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE TABLE "assignments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"course_id" uuid NOT NULL,
	"title" text NOT NULL,
	"instructions" text DEFAULT '' NOT NULL,
	"due_at" timestamp with time zone NOT NULL,
	"required_arm_revision_id" uuid NOT NULL,
	"required_start" jsonb,
	"required_goals" jsonb,
	"pose_tolerance" double precision DEFAULT 0.001 NOT NULL,
	"limits" jsonb,
	"created_by" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "assignments_title_length" CHECK (char_length("assignments"."title") between 1 and 120),
	CONSTRAINT "assignments_instructions_length" CHECK (char_length("assignments"."instructions") <= 5000),
	CONSTRAINT "assignments_pose_tolerance_positive" CHECK ("assignments"."pose_tolerance" > 0)
);
--> statement-breakpoint
CREATE TABLE "course_enrolments" (
	"course_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"role" "course_role" NOT NULL,
	"joined_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "course_enrolments_course_id_user_id_pk" PRIMARY KEY("course_id","user_id")
);
--> statement-breakpoint
CREATE TABLE "courses" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"title" text NOT NULL,
	"term" text NOT NULL,
	"join_code" text NOT NULL,
	"project_id" uuid,
	"required_arm_revision_id" uuid,
	"limits" jsonb,
	"created_by" uuid NOT NULL,
	"archived_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "courses_join_code_unique" UNIQUE("join_code"),
	CONSTRAINT "courses_title_length" CHECK (char_length("courses"."title") between 1 and 120),
	CONSTRAINT "courses_term_length" CHECK (char_length("courses"."term") between 1 and 60),
	CONSTRAINT "courses_join_code_shape" CHECK ("courses"."join_code" ~ '^[A-Z0-9]{8}$'),
	CONSTRAINT "courses_limits_object" CHECK ("courses"."limits" is null or jsonb_typeof("courses"."limits") = 'object')
);
--> statement-breakpoint
CREATE TABLE "mail_outbox" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" text NOT NULL,
	"dedupe_key" text NOT NULL,
	"to_address" text NOT NULL,
	"subject" text NOT NULL,
	"text" text NOT NULL,
	"html" text NOT NULL,
	"status" "mail_status" DEFAULT 'queued' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_error" text,
	"claimed_until" timestamp with time zone,
	"enqueued_at" timestamp with time zone,
	"message_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sent_at" timestamp with time zone,
	CONSTRAINT "mail_outbox_dedupe_key_unique" UNIQUE("dedupe_key"),
	CONSTRAINT "mail_outbox_attempts_nonnegative" CHECK ("mail_outbox"."attempts" >= 0)
);
--> statement-breakpoint
CREATE TABLE "review_comments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"submission_id" uuid NOT NULL,
	"author_id" uuid NOT NULL,
	"body" text NOT NULL,
	"move_index" integer,
	"joint_index" integer,
	"time_s" double precision,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "review_comments_body_length" CHECK (char_length("review_comments"."body") between 1 and 5000),
	CONSTRAINT "review_comments_move_nonnegative" CHECK ("review_comments"."move_index" is null or "review_comments"."move_index" >= 0),
	CONSTRAINT "review_comments_joint_nonnegative" CHECK ("review_comments"."joint_index" is null or "review_comments"."joint_index" >= 0),
	CONSTRAINT "review_comments_time_nonnegative" CHECK ("review_comments"."time_s" is null or "review_comments"."time_s" >= 0)
);
--> statement-breakpoint
CREATE TABLE "reviews" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"submission_id" uuid NOT NULL,
	"reviewer_id" uuid NOT NULL,
	"decision" "review_decision" NOT NULL,
	"summary" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "reviews_submission_id_unique" UNIQUE("submission_id"),
	CONSTRAINT "reviews_summary_length" CHECK (char_length("reviews"."summary") <= 5000)
);
--> statement-breakpoint
CREATE TABLE "submissions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"assignment_id" uuid NOT NULL,
	"student_id" uuid NOT NULL,
	"plan_id" uuid,
	"plan_version_id" uuid,
	"plan_version_number" integer NOT NULL,
	"document" jsonb NOT NULL,
	"arm_revision_id" uuid NOT NULL,
	"report" jsonb NOT NULL,
	"verdict" "verdict" NOT NULL,
	"rule_problems" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"late" boolean NOT NULL,
	"status" "submission_status" DEFAULT 'submitted' NOT NULL,
	"attempt" integer DEFAULT 1 NOT NULL,
	"previous_id" uuid,
	"submitted_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "submissions_attempt_positive" CHECK ("submissions"."attempt" > 0),
	CONSTRAINT "submissions_document_object" CHECK (jsonb_typeof("submissions"."document") = 'object')
);
--> statement-breakpoint
ALTER TABLE "account_tokens" ADD CONSTRAINT "account_tokens_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "assignments" ADD CONSTRAINT "assignments_course_id_courses_id_fk" FOREIGN KEY ("course_id") REFERENCES "public"."courses"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "assignments" ADD CONSTRAINT "assignments_required_arm_revision_id_arm_revisions_id_fk" FOREIGN KEY ("required_arm_revision_id") REFERENCES "public"."arm_revisions"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "assignments" ADD CONSTRAINT "assignments_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "course_enrolments" ADD CONSTRAINT "course_enrolments_course_id_courses_id_fk" FOREIGN KEY ("course_id") REFERENCES "public"."courses"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "course_enrolments" ADD CONSTRAINT "course_enrolments_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "courses" ADD CONSTRAINT "courses_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "courses" ADD CONSTRAINT "courses_required_arm_revision_id_arm_revisions_id_fk" FOREIGN KEY ("required_arm_revision_id") REFERENCES "public"."arm_revisions"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "courses" ADD CONSTRAINT "courses_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comments" ADD CONSTRAINT "review_comments_submission_id_submissions_id_fk" FOREIGN KEY ("submission_id") REFERENCES "public"."submissions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comments" ADD CONSTRAINT "review_comments_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reviews" ADD CONSTRAINT "reviews_submission_id_submissions_id_fk" FOREIGN KEY ("submission_id") REFERENCES "public"."submissions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reviews" ADD CONSTRAINT "reviews_reviewer_id_users_id_fk" FOREIGN KEY ("reviewer_id") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "submissions" ADD CONSTRAINT "submissions_assignment_id_assignments_id_fk" FOREIGN KEY ("assignment_id") REFERENCES "public"."assignments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "submissions" ADD CONSTRAINT "submissions_student_id_users_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "submissions" ADD CONSTRAINT "submissions_plan_id_plans_id_fk" FOREIGN KEY ("plan_id") REFERENCES "public"."plans"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "submissions" ADD CONSTRAINT "submissions_plan_version_id_plan_versions_id_fk" FOREIGN KEY ("plan_version_id") REFERENCES "public"."plan_versions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "submissions" ADD CONSTRAINT "submissions_arm_revision_id_arm_revisions_id_fk" FOREIGN KEY ("arm_revision_id") REFERENCES "public"."arm_revisions"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "account_tokens_user_purpose" ON "account_tokens" USING btree ("user_id","purpose");--> statement-breakpoint
CREATE INDEX "assignments_course_due" ON "assignments" USING btree ("course_id","due_at");--> statement-breakpoint
CREATE INDEX "course_enrolments_user" ON "course_enrolments" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "mail_outbox_status_time" ON "mail_outbox" USING btree ("status","created_at");--> statement-breakpoint
CREATE INDEX "review_comments_submission" ON "review_comments" USING btree ("submission_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "submissions_previous_once" ON "submissions" USING btree ("previous_id");--> statement-breakpoint
CREATE UNIQUE INDEX "submissions_one_open" ON "submissions" USING btree ("assignment_id","student_id") WHERE "submissions"."status" = 'submitted';--> statement-breakpoint
CREATE INDEX "submissions_assignment_time" ON "submissions" USING btree ("assignment_id","submitted_at");--> statement-breakpoint
CREATE INDEX "submissions_student" ON "submissions" USING btree ("student_id");