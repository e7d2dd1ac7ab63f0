import { sql } from "drizzle-orm";
import {
  bigint,
  boolean,
  check,
  customType,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uuid,
} from "drizzle-orm/pg-core";
import { armRevisions } from "./arms";
import { projects } from "./projects";
import { users } from "./users";

/** Raw bytes (PostgreSQL bytea) as a Node Buffer. */
const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => "bytea" });

/** Where a dataset is in its life: uploaded, audit running, audited. */
export const datasetStatuses = ["uploaded", "auditing", "audited"] as const;
export type DatasetStatus = (typeof datasetStatuses)[number];

/**
 * A dataset: many recorded episodes uploaded together. The file (Parquet, zip of Parquet or CSV)
 * is in object storage under `objectKey`; the column mapping and the arm revision say how to read
 * and audit it. `generation` counts audits started: a batch job of an older generation does nothing.
 */
export const datasets = pgTable(
  "datasets",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    objectKey: text("object_key").notNull().unique(),
    /** `parquet`, `csv` or `zip`, from the file's content. */
    fileKind: text("file_kind").notNull(),
    sizeBytes: bigint("size_bytes", { mode: "number" }).notNull(),
    sha256: text("sha256").notNull(),
    /** The arm revision the audit uses (null until chosen). */
    armRevisionId: uuid("arm_revision_id").references(() => armRevisions.id, { onDelete: "restrict" }),
    /** The column mapping (kinematics ColumnMapping), `{}` for the defaults. */
    mapping: jsonb("mapping").notNull().default({}),
    status: text("status").$type<DatasetStatus>().notNull().default("uploaded"),
    generation: integer("generation").notNull().default(0),
    episodeCount: integer("episode_count").notNull().default(0),
    batchCount: integer("batch_count").notNull().default(0),
    auditStartedAt: timestamp("audit_started_at", { withTimezone: true }),
    auditedAt: timestamp("audited_at", { withTimezone: true }),
    createdBy: uuid("created_by")
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("datasets_name_length", sql`char_length(${t.name}) between 1 and 120`),
    check("datasets_status", sql`${t.status} in ('uploaded', 'auditing', 'audited')`),
    check("datasets_file_kind", sql`${t.fileKind} in ('parquet', 'csv', 'zip')`),
    check("datasets_size_nonnegative", sql`${t.sizeBytes} >= 0`),
    check("datasets_sha256_hex", sql`${t.sha256} ~ '^[0-9a-f]{64}$'`),
    check("datasets_counts_nonnegative", sql`${t.episodeCount} >= 0 and ${t.batchCount} >= 0 and ${t.generation} >= 0`),
    index("datasets_project_created").on(t.projectId, t.createdAt),
  ],
);

/** One batch of a dataset's audit: done once its episodes' results are stored (in the same transaction). */
export const datasetBatches = pgTable(
  "dataset_batches",
  {
    datasetId: uuid("dataset_id")
      .notNull()
      .references(() => datasets.id, { onDelete: "cascade" }),
    generation: integer("generation").notNull(),
    batch: integer("batch").notNull(),
    firstEpisode: integer("first_episode").notNull(),
    episodeCount: integer("episode_count").notNull(),
    done: boolean("done").notNull().default(false),
    attempts: integer("attempts").notNull().default(0),
    doneAt: timestamp("done_at", { withTimezone: true }),
  },
  (t) => [primaryKey({ columns: [t.datasetId, t.generation, t.batch] })],
);

/**
 * The audit result of one episode, keyed by its place in the dataset (0-based): written by an
 * upsert, so a retried batch overwrites its own rows and never adds any. `repaired` holds the
 * repaired episode when one was made (see lib/server/datasets/episode-codec.ts).
 */
export const datasetEpisodes = pgTable(
  "dataset_episodes",
  {
    datasetId: uuid("dataset_id")
      .notNull()
      .references(() => datasets.id, { onDelete: "cascade" }),
    index: integer("index").notNull(),
    episode: text("episode").notNull(),
    generation: integer("generation").notNull(),
    samples: integer("samples").notNull(),
    durationS: doublePrecision("duration_s").notNull(),
    verdict: text("verdict").notNull(),
    findingCount: integer("finding_count").notNull(),
    faultCount: integer("fault_count").notNull(),
    /** The first fault (else the first finding): kind and message, for the table. */
    worstKind: text("worst_kind"),
    worstMessage: text("worst_message"),
    findings: jsonb("findings").notNull(),
    problems: jsonb("problems").notNull(),
    repaired: bytea("repaired"),
    repairedVerdict: text("repaired_verdict"),
    repairedFindings: jsonb("repaired_findings"),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.datasetId, t.index] }),
    check("dataset_episodes_verdict", sql`${t.verdict} in ('pass', 'caution', 'fault', 'invalid')`),
    index("dataset_episodes_verdict_idx").on(t.datasetId, t.verdict),
  ],
);

export type Dataset = typeof datasets.$inferSelect;
export type DatasetBatch = typeof datasetBatches.$inferSelect;
export type DatasetEpisode = typeof datasetEpisodes.$inferSelect;
