import { sql } from "drizzle-orm";
import { check, index, integer, jsonb, pgEnum, pgTable, text, timestamp, unique, uuid } from "drizzle-orm/pg-core";
import { armRevisions, arms } from "./arms";
import { projects } from "./projects";
import { users } from "./users";

/** The engine's verdict on a plan version. */
export const verdict = pgEnum("verdict", ["pass", "caution", "fault"]);

export const plans = pgTable(
  "plans",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    armId: uuid("arm_id")
      .notNull()
      .references(() => arms.id, { onDelete: "restrict" }),
    name: text("name").notNull(),
    /**
     * Number of the newest version (0 before the first save). Saving compares and
     * increments it in one UPDATE, which is what turns a stale save into a 409.
     */
    latestVersion: integer("latest_version").notNull().default(0),
    createdBy: uuid("created_by")
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("plans_name_length", sql`char_length(${t.name}) between 1 and 120`),
    check("plans_latest_version_nonnegative", sql`${t.latestVersion} >= 0`),
    // A project's plan list, newest first.
    index("plans_project_updated").on(t.projectId, t.updatedAt),
  ],
);

/** A saved plan document with its check result. Never edited: a new save adds a version. */
export const planVersions = pgTable(
  "plan_versions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    planId: uuid("plan_id")
      .notNull()
      .references(() => plans.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    document: jsonb("document").notNull(),
    armRevisionId: uuid("arm_revision_id")
      .notNull()
      .references(() => armRevisions.id, { onDelete: "restrict" }),
    verdict: verdict("verdict").notNull(),
    /** Counts and the worst finding of the engine's report (the full report is recomputed on export). */
    summary: jsonb("summary").notNull(),
    note: text("note"),
    authorId: uuid("author_id")
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("plan_versions_number_positive", sql`${t.number} > 0`),
    check("plan_versions_document_object", sql`jsonb_typeof(${t.document}) = 'object'`),
    check("plan_versions_note_length", sql`${t.note} is null or char_length(${t.note}) <= 500`),
    unique("plan_versions_plan_number").on(t.planId, t.number),
  ],
);

export type Plan = typeof plans.$inferSelect;
export type PlanVersion = typeof planVersions.$inferSelect;
export type Verdict = (typeof verdict.enumValues)[number];
