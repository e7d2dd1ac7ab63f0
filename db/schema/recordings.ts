import { sql } from "drizzle-orm";
import { bigint, check, index, integer, pgTable, text, timestamp, uuid, doublePrecision } from "drizzle-orm/pg-core";
import { arms } from "./arms";
import { projects } from "./projects";
import { users } from "./users";

/** A sampled joint log. The file itself is in object storage under `objectKey`. */
export const recordings = pgTable(
  "recordings",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    armId: uuid("arm_id").references(() => arms.id, { onDelete: "set null" }),
    name: text("name").notNull(),
    objectKey: text("object_key").notNull().unique(),
    contentType: text("content_type").notNull(),
    sizeBytes: bigint("size_bytes", { mode: "number" }).notNull(),
    /** SHA-256 of the stored file, hex. */
    sha256: text("sha256").notNull(),
    sampleCount: integer("sample_count").notNull(),
    jointCount: integer("joint_count").notNull(),
    durationS: doublePrecision("duration_s").notNull(),
    createdBy: uuid("created_by")
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("recordings_name_length", sql`char_length(${t.name}) between 1 and 120`),
    check("recordings_size_nonnegative", sql`${t.sizeBytes} >= 0`),
    check("recordings_samples_positive", sql`${t.sampleCount} > 0 and ${t.jointCount} > 0`),
    check("recordings_duration_nonnegative", sql`${t.durationS} >= 0`),
    check("recordings_sha256_hex", sql`${t.sha256} ~ '^[0-9a-f]{64}$'`),
    index("recordings_project_created").on(t.projectId, t.createdAt),
  ],
);

export type Recording = typeof recordings.$inferSelect;
