import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getArmRevisionForUser } from "@/db/queries/arms";
import { getAssignmentForUser } from "@/db/queries/courses";
import { getPlanForUser, getPlanVersion } from "@/db/queries/plans";
import { PlanWorkbench } from "@/components/editor/plan-workbench";
import type { BenchPlan } from "@/components/editor/plan-state";
import type { BenchAssignment } from "@/components/editor/assignment-rules";
import { homePose, planFormat, planSchema, planVersion } from "@/kinematics";
import { membershipOf } from "@/lib/server/loaders";
import { requirePageActor } from "@/lib/server/page-actor";
import { capabilities } from "@/lib/server/permissions";
import { limitsSchema } from "@/lib/shared/schemas/courses";
import { z } from "zod";

export const metadata: Metadata = { title: "Plan" };
export const dynamic = "force-dynamic";

type Params = { projectId: string; planId: string };
type Search = { assignment?: string | string[] };

const uuidPattern = /^[0-9a-f-]{36}$/i;
// stored JSON read back through the same schemas the API wrote it with
const storedRules = z.object({
  requiredStart: z.array(z.number()).nullable(),
  requiredGoals: z.array(z.array(z.number())).nullable(),
  courseLimits: limitsSchema.nullable(),
  limits: limitsSchema.nullable(),
});

/**
 * The bench for one saved plan: the server loads the latest version (or, before the first save, a
 * plan holding the arm's home pose) and the arm revision it is checked against.
 */
export default async function PlanPage({
  params,
  searchParams,
}: {
  params: Promise<Params>;
  searchParams: Promise<Search>;
}) {
  const { projectId, planId } = await params;
  const { assignment: assignmentParam } = await searchParams;
  const actor = await requirePageActor(`/projects/${projectId}/plans/${planId}`);
  if (!/^[0-9a-f-]{36}$/i.test(planId)) notFound();
  const plan = await getPlanForUser({ planId, userId: actor.userId });
  if (!plan || plan.projectId !== projectId) notFound();

  const version =
    plan.latestVersion > 0
      ? await getPlanVersion({ planId, number: plan.latestVersion, userId: actor.userId })
      : undefined;
  const revision = version ? undefined : await getArmRevisionForUser({ armId: plan.armId, userId: actor.userId });
  const armDescription = version?.armDescription ?? revision?.description;
  if (!armDescription) notFound();

  let raw: unknown = version?.document;
  if (!raw) {
    const arm = armDescription as { joints: { min: number; max: number }[] };
    raw = {
      format: planFormat,
      version: planVersion,
      arm: armDescription,
      start: homePose(arm),
      moves: [],
    };
  }
  const parsed = planSchema.safeParse(raw);
  if (!parsed.success)
    throw new Error(`plan ${planId} version ${plan.latestVersion} does not parse as a plan document`);

  // ?assignment=<id>: the bench checks against that assignment's limits (only for someone enrolled in its course)
  const assignmentId =
    typeof assignmentParam === "string" && uuidPattern.test(assignmentParam) ? assignmentParam : null;
  const found = assignmentId ? await getAssignmentForUser({ assignmentId, userId: actor.userId }) : undefined;
  const armRevisionId = version?.armRevisionId ?? revision?.id;
  const stored = found
    ? storedRules.safeParse({
        requiredStart: found.requiredStart ?? null,
        requiredGoals: found.requiredGoals ?? null,
        courseLimits: found.courseLimits ?? null,
        limits: found.limits ?? null,
      })
    : undefined;
  // rules that do not read back are not silently dropped: the page refuses rather than check against looser limits
  if (stored && !stored.success) throw new Error(`assignment ${assignmentId} has stored rules that do not parse`);
  const assignment: BenchAssignment | undefined =
    found && stored?.success && armRevisionId
      ? {
          title: found.title,
          courseTitle: found.courseTitle,
          armRevisionId,
          rules: {
            requiredArmRevisionId: found.requiredArmRevisionId,
            courseArmRevisionId: found.courseArmRevisionId,
            poseTolerance: found.poseTolerance,
            ...stored.data,
          },
        }
      : undefined;

  return (
    <PlanWorkbench
      initialPlan={parsed.data as BenchPlan}
      planId={plan.id}
      projectId={plan.projectId}
      planName={plan.name}
      armName={plan.armName}
      armRevision={version?.armRevision ?? revision?.revision ?? 1}
      version={plan.latestVersion}
      canEdit={capabilities(actor, { kind: "project", ...membershipOf(plan) }).canEdit}
      assignment={assignment}
    />
  );
}
