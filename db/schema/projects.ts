import { sql } from "drizzle-orm";
import { check, index, pgEnum, pgTable, primaryKey, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { users } from "./users";

/** A course project holds assignments and submissions; a research project is a team's shared space. */
export const projectKind = pgEnum("project_kind", ["course", "research", "personal"]);
/** A member's role inside one project. */
export const memberRole = pgEnum("member_role", ["owner", "editor", "viewer"]);

export const projects = pgTable(
  "projects",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    name: text("name").notNull(),
    kind: projectKind("kind").notNull().default("personal"),
    createdBy: uuid("created_by")
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    /** Archived projects are read-only and hidden from the default list. */
    archivedAt: timestamp("archived_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [check("projects_name_length", sql`char_length(${t.name}) between 1 and 120`)],
);

export const projectMembers = pgTable(
  "project_members",
  {
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    userId: uuid("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: memberRole("role").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.projectId, t.userId] }),
    // "My projects" is the list users open most: look memberships up by user.
    index("project_members_user").on(t.userId),
  ],
);

export type Project = typeof projects.$inferSelect;
export type ProjectMember = typeof projectMembers.$inferSelect;
export type MemberRole = (typeof memberRole.enumValues)[number];
export type ProjectKind = (typeof projectKind.enumValues)[number];
