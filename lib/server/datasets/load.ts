/** Loaders for the dataset routes: scoped queries, "not there for this user" as 404. */
import "server-only";
import { getDatasetArmForUser, getDatasetForUser, type DatasetForUser } from "@/db/queries/datasets";
import { AppError } from "@/lib/server/errors";
import { membershipOf } from "@/lib/server/loaders";
import type { Actor } from "@/lib/server/permissions";

export async function loadDataset(actor: Actor, datasetId: string): Promise<DatasetForUser> {
  const found = await getDatasetForUser({ datasetId, userId: actor.userId });
  if (!found)
    throw new AppError(
      "not_found:dataset",
      "No dataset here in a project you are a member of; it may have been deleted. Check the link, or ask the project's owner to add you.",
    );
  return found;
}

/** The membership view for the permission table. */
export function datasetMembership(found: DatasetForUser) {
  return membershipOf({ role: found.role, archivedAt: found.archivedAt });
}

/** The arm revision chosen for the dataset; 422 when none is chosen yet. */
export async function loadDatasetArm(
  actor: Actor,
  found: DatasetForUser,
): Promise<{ id: string; description: unknown }> {
  const revision = await getDatasetArmForUser({ datasetId: found.dataset.id, userId: actor.userId });
  if (!revision)
    throw new AppError("unprocessable:mapping", "Choose the arm and the column mapping first (POST …/mapping).");
  return revision;
}
