CREATE TABLE "dataset_batches" (
	"dataset_id" uuid NOT NULL,
	"generation" integer NOT NULL,
	"batch" integer NOT NULL,
	"first_episode" integer NOT NULL,
	"episode_count" integer NOT NULL,
	"done" boolean DEFAULT false NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"done_at" timestamp with time zone,
	CONSTRAINT "dataset_batches_dataset_id_generation_batch_pk" PRIMARY KEY("dataset_id","generation","batch")
);
--> statement-breakpoint
CREATE TABLE "dataset_episodes" (
	"dataset_id" uuid NOT NULL,
	"index" integer NOT NULL,
	"episode" text NOT NULL,
	"generation" integer NOT NULL,
	"samples" integer NOT NULL,
	"duration_s" double precision NOT NULL,
	"verdict" text NOT NULL,
	"finding_count" integer NOT NULL,
	"fault_count" integer NOT NULL,
	"worst_kind" text,
	"worst_message" text,
	"findings" jsonb NOT NULL,
	"problems" jsonb NOT NULL,
	"repaired" "bytea",
	"repaired_verdict" text,
	"repaired_findings" jsonb,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "dataset_episodes_dataset_id_index_pk" PRIMARY KEY("dataset_id","index"),
	CONSTRAINT "dataset_episodes_verdict" CHECK ("dataset_episodes"."verdict" in ('pass', 'caution', 'fault', 'invalid'))
);
--> statement-breakpoint
CREATE TABLE "datasets" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"project_id" uuid NOT NULL,
	"name" text NOT NULL,
	"object_key" text NOT NULL,
	"file_kind" text NOT NULL,
	"size_bytes" bigint NOT NULL,
	"sha256" text NOT NULL,
	"arm_revision_id" uuid,
	"mapping" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"status" text DEFAULT 'uploaded' NOT NULL,
	"generation" integer DEFAULT 0 NOT NULL,
	"episode_count" integer DEFAULT 0 NOT NULL,
	"batch_count" integer DEFAULT 0 NOT NULL,
	"audit_started_at" timestamp with time zone,
	"audited_at" timestamp with time zone,
	"created_by" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "datasets_object_key_unique" UNIQUE("object_key"),
	CONSTRAINT "datasets_name_length" CHECK (char_length("datasets"."name") between 1 and 120),
	CONSTRAINT "datasets_status" CHECK ("datasets"."status" in ('uploaded', 'auditing', 'audited')),
	CONSTRAINT "datasets_file_kind" CHECK ("datasets"."file_kind" in ('parquet', 'csv', 'zip')),
	CONSTRAINT "datasets_size_nonnegative" CHECK ("datasets"."size_bytes" >= 0),
	CONSTRAINT "datasets_sha256_hex" CHECK ("datasets"."sha256" ~ '^[0-9a-f]{64}$'),
	CONSTRAINT "datasets_counts_nonnegative" CHECK ("datasets"."episode_count" >= 0 and "datasets"."batch_count" >= 0 and "datasets"."generation" >= 0)
);
--> statement-breakpoint
ALTER TABLE "dataset_batches" ADD CONSTRAINT "dataset_batches_dataset_id_datasets_id_fk" FOREIGN KEY ("dataset_id") REFERENCES "public"."datasets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dataset_episodes" ADD CONSTRAINT "dataset_episodes_dataset_id_datasets_id_fk" FOREIGN KEY ("dataset_id") REFERENCES "public"."datasets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_arm_revision_id_arm_revisions_id_fk" FOREIGN KEY ("arm_revision_id") REFERENCES "public"."arm_revisions"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "dataset_episodes_verdict_idx" ON "dataset_episodes" USING btree ("dataset_id","verdict");--> statement-breakpoint
CREATE INDEX "datasets_project_created" ON "datasets" USING btree ("project_id","created_at");