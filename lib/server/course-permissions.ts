/**
 * Course permissions: one table (course role → actions) and the function that consults it, in the
 * same form as lib/server/permissions.ts (site and project tables). Kept in its own file until the
 * permission module's owner folds it in (see notes/for-lead-courses.md); nothing else decides
 * who may do what in a course. Creating a course is the site action `project:create-course`.
 */
import type { CourseRole } from "@/db/schema/courses";
import { AppError } from "./errors";

export type CourseAction =
  | "course:read"
  | "course:manage"
  | "roster:read"
  | "roster:manage"
  | "assignment:read"
  | "assignment:create"
  | "submission:create"
  | "submission:read-own"
  | "submission:read-all"
  | "review:comment"
  | "review:decide"
  | "grades:export";

export const coursePermissions: Record<CourseRole, ReadonlySet<CourseAction>> = {
  student: new Set(["course:read", "assignment:read", "submission:create", "submission:read-own"]),
  instructor: new Set([
    "course:read",
    "course:manage",
    "roster:read",
    "roster:manage",
    "assignment:read",
    "assignment:create",
    "submission:read-all",
    "review:comment",
    "review:decide",
    "grades:export",
  ]),
};

export function canCourse(role: CourseRole, action: CourseAction): boolean {
  return coursePermissions[role].has(action);
}

/** Throws `forbidden:<subject>` unless the course role allows the action. */
export function authorizeCourse(role: CourseRole, action: CourseAction): void {
  if (!canCourse(role, action)) {
    throw new AppError(`forbidden:${action.split(":")[0]}`, `Your course role (${role}) does not allow ${action}.`);
  }
}
