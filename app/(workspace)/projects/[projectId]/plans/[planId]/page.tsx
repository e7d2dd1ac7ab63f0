import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getArmRevisionForUser } from "@/db/queries/arms";
import { getPlanForUser, getPlanVersion } from "@/db/queries/plans";
import { PlanWorkbench } from "@/components/editor/plan-workbench";
import type { BenchPlan } from "@/components/editor/plan-state";
import { homePose, planFormat, planSchema, planVersion } from "@/kinematics";
import { membershipOf } from "@/lib/server/loaders";
import { requirePageActor } from "@/lib/server/page-actor";
import { capabilities } from "@/lib/server/permissions";

export const metadata: Metadata = { title: "Plan" };
export const dynamic = "force-dynamic";

type Params = { projectId: string; planId: string };

/**
 * The bench for one saved plan: the server loads the latest version (or, before the first save, a
 * plan holding the arm's home pose) and the arm revision it is checked against.
 */
export default async function PlanPage({ params }: { params: Promise<Params> }) {
  const { projectId, planId } = await params;
  const actor = await requirePageActor(`/projects/${projectId}/plans/${planId}`);
  if (!/^[0-9a-f-]{36}$/i.test(planId)) notFound();
  const plan = await getPlanForUser({ planId, userId: actor.userId });
  if (!plan || plan.projectId !== projectId) notFound();

  const version = plan.latestVersion > 0 ? await getPlanVersion({ planId, number: plan.latestVersion, userId: actor.userId }) : undefined;
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
  if (!parsed.success) throw new Error(`plan ${planId} version ${plan.latestVersion} does not parse as a plan document`);

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
    />
  );
}
