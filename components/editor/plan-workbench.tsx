"use client";
import { useState } from "react";
import { Bench } from "./bench";
import type { BenchPlan } from "./plan-state";
import { PlanActions } from "./plan-actions";

export interface PlanWorkbenchProps {
  initialPlan: BenchPlan;
  planId: string;
  projectId: string;
  planName: string;
  armName: string;
  armRevision: number;
  /** The saved version the page loaded (0 before the first save). */
  version: number;
  canEdit: boolean;
}

/** The bench for a saved plan, with save, versions, import and export wired to the API. */
export function PlanWorkbench(props: PlanWorkbenchProps) {
  const [version, setVersion] = useState(props.version);
  return (
    <Bench
      initialPlan={props.initialPlan}
      planId={props.planId}
      meta={{ planName: props.planName, armName: props.armName, armRevision: props.armRevision, version }}
      actions={(state) => (
        <PlanActions
          {...state}
          planId={props.planId}
          planName={props.planName}
          armRevision={props.armRevision}
          version={version}
          onSaved={setVersion}
          canEdit={props.canEdit}
          initialPlan={props.initialPlan}
        />
      )}
    />
  );
}
