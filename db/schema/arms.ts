import { sql } from "drizzle-orm";
import { check, index, integer, jsonb, pgTable, text, timestamp, unique, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { projects } from "./projects";
import { users } from "./users";

/**
 * An arm profile. Built-in demo arms have no project; custom arms belong to one project.
 * The arm's limits live in its revisions: an edit never changes a revision, it adds one.
 */
export const arms = pgTable(
  "arms",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id").references(() => projects.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("arms_name_length", sql`char_length(${t.name}) between 1 and 120`),
    unique("arms_project_name").on(t.projectId, t.name),
    // NULL project ids are distinct in a plain unique constraint, so built-in names get their own index.
    uniqueIndex("arms_builtin_name")
      .on(t.name)
      .where(sql`${t.projectId} is null`),
    index("arms_project").on(t.projectId),
  ],
);

/** An immutable revision of an arm: the `arm` object of a plan document, as checked. */
export const armRevisions = pgTable(
  "arm_revisions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    armId: uuid("arm_id")
      .notNull()
      .references(() => arms.id, { onDelete: "cascade" }),
    revision: integer("revision").notNull(),
    /** The arm description (joints, limits, control rate), validated by the engine's schema before insert. */
    description: jsonb("description").notNull(),
    /** Object-storage key of the URDF file this revision was imported from, if any. */
    urdfKey: text("urdf_key"),
    note: text("note"),
    createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("arm_revisions_revision_positive", sql`${t.revision} > 0`),
    check("arm_revisions_description_object", sql`jsonb_typeof(${t.description}) = 'object'`),
    unique("arm_revisions_arm_revision").on(t.armId, t.revision),
  ],
);

export type Arm = typeof arms.$inferSelect;
export type ArmRevision = typeof armRevisions.$inferSelect;
