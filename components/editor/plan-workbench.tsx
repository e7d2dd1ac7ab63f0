"use client";
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { Button } from "@/components/ui/button";
import { DateTime } from "@/components/ui/date-time";
import { Dialog } from "@/components/ui/dialog";
import { AssignmentRulesPanel, assignmentArm, type BenchAssignment } from "./assignment-rules";
import { Bench } from "./bench";
import { dropDraft, keepDraft, readDraft, type Draft } from "./draft";
import type { BenchPlan } from "./plan-state";
import { PlanActions } from "./plan-actions";
import { useLeaveGuard } from "./use-leave-guard";

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
  /** The assignment the plan is worked on for: the bench checks against its limits and lists its poses. */
  assignment?: BenchAssignment;
}

/** How long edits wait before the draft is written, ms. */
const DRAFT_DELAY_MS = 400;

/**
 * The bench for a saved plan, with save, versions, import and export wired to the API; unsaved edits
 * are kept as a local draft of the version they started from, offered back when the plan is reopened,
 * and leaving with unsaved edits asks first.
 */
export function PlanWorkbench(props: PlanWorkbenchProps) {
  const { planId, initialPlan } = props;
  const [version, setVersion] = useState(props.version);
  const [dirty, setDirty] = useState(false);
  const [offered, setOffered] = useState<Draft | null>(null);
  const current = useRef<BenchPlan>(initialPlan);
  const baseVersion = useRef(props.version);
  const guard = useLeaveGuard(dirty);
  const { assignment } = props;
  const checkArm = useMemo(() => (assignment ? assignmentArm(assignment) : undefined), [assignment]);

  // a draft of the version this page loaded, from an earlier visit
  useEffect(() => {
    // after the first paint: the server render knows no drafts, so the offer must not change hydration
    const timer = setTimeout(() => setOffered(readDraft(window.localStorage, planId, props.version, initialPlan)), 0);
    return () => clearTimeout(timer);
  }, [planId, props.version, initialPlan]);

  // keep the draft while there are unsaved edits; drop it once they are saved or undone (not on
  // arrival, when the draft of an earlier visit is still on offer)
  const wasDirty = useRef(false);
  useEffect(() => {
    const store = window.localStorage;
    if (!dirty) {
      if (wasDirty.current) dropDraft(store, planId, baseVersion.current);
      wasDirty.current = false;
      return;
    }
    wasDirty.current = true;
    const timer = setInterval(() => keepDraft(store, planId, baseVersion.current, current.current), DRAFT_DELAY_MS);
    keepDraft(store, planId, baseVersion.current, current.current);
    return () => clearInterval(timer);
  }, [dirty, planId]);

  const onPlanChange = useCallback((plan: BenchPlan) => {
    current.current = plan;
  }, []);

  const onSaved = useCallback(
    (saved: number) => {
      dropDraft(window.localStorage, planId, baseVersion.current);
      baseVersion.current = saved;
      setVersion(saved);
    },
    [planId],
  );

  return (
    <>
      <Bench
        initialPlan={initialPlan}
        planId={planId}
        onPlanChange={onPlanChange}
        checkArm={checkArm}
        aside={
          assignment
            ? ({ plan, unit }) => <AssignmentRulesPanel assignment={assignment} plan={plan} unit={unit} />
            : undefined
        }
        meta={{ planName: props.planName, armName: props.armName, armRevision: props.armRevision, version }}
        actions={({ plan, report, replace }) => (
          <PlanActions
            plan={plan}
            report={report}
            replace={replace}
            planId={planId}
            planName={props.planName}
            armRevision={props.armRevision}
            version={version}
            onSaved={onSaved}
            onDirtyChange={setDirty}
            canEdit={props.canEdit}
            initialPlan={initialPlan}
          />
        )}
        banner={({ replace }) =>
          offered ? (
            <div
              role="status"
              data-testid="draft-offer"
              className="flex flex-wrap items-center gap-2 border-b border-line bg-caution-tint px-4 py-1.5 text-xs text-ink"
            >
              <span>
                Unsaved edits to version {props.version || "0 (never saved)"} from <DateTime value={offered.savedAt} />{" "}
                are kept in this browser.
              </span>
              <Button
                size="sm"
                variant="primary"
                onClick={() => {
                  replace(offered.plan);
                  setOffered(null);
                }}
              >
                Restore the edits
              </Button>
              <Button
                size="sm"
                variant="ghost"
                onClick={() => {
                  dropDraft(window.localStorage, planId, props.version);
                  setOffered(null);
                }}
              >
                Discard them
              </Button>
            </div>
          ) : null
        }
      />
      <Dialog
        open={guard.pending !== null}
        title="Leave with unsaved changes?"
        onClose={guard.stay}
        actions={
          <>
            <Button variant="primary" onClick={guard.stay}>
              Stay on the bench
            </Button>
            <Button onClick={guard.leave}>Leave</Button>
          </>
        }
      >
        <p>
          Your edits since {version > 0 ? `version ${version}` : "the plan was created"} are not saved. A draft stays in
          this browser and is offered back when you open this plan again.
        </p>
      </Dialog>
    </>
  );
}
