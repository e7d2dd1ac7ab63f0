/**
 * Loaders for route handlers: each runs a scoped query and turns "not there for this user" into
 * a 404 (another user's private project simply does not exist for you).
 */
import { getArmForUser, type ArmForUser } from "@/db/queries/arms";
import { getPlanForUser, type PlanForUser } from "@/db/queries/plans";
import { getProjectForUser, type ProjectForUser } from "@/db/queries/projects";
import { AppError } from "./errors";
import type { Actor } from "./permissions";

export async function loadProject(actor: Actor, projectId: string): Promise<ProjectForUser> {
  const project = await getProjectForUser({ projectId, userId: actor.userId });
  if (!project)
    throw new AppError(
      "not_found:project",
      "No project here that you are a member of; check the link, or ask the project's owner to add you.",
    );
  return project;
}

export async function loadPlan(actor: Actor, planId: string): Promise<PlanForUser> {
  const plan = await getPlanForUser({ planId, userId: actor.userId });
  if (!plan)
    throw new AppError(
      "not_found:plan",
      "No plan here in a project you are a member of; it may have been deleted. Check the link, or ask the project's owner to add you.",
    );
  return plan;
}

export async function loadArm(actor: Actor, armId: string): Promise<ArmForUser> {
  const arm = await getArmForUser({ armId, userId: actor.userId });
  if (!arm)
    throw new AppError(
      "not_found:arm",
      "No arm here in a project you are a member of; check the link, or ask the project's owner to add you.",
    );
  return arm;
}

/** The membership view lib/permissions needs. */
export function membershipOf(resource: {
  role: ProjectForUser["role"];
  archivedAt?: Date | null;
  projectArchived?: boolean;
}) {
  return { role: resource.role, archived: resource.projectArchived ?? (resource.archivedAt ?? null) !== null };
}
