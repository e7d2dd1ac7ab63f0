"use client";
import { useMemo } from "react";
import { CautionIcon, PassIcon } from "@/components/ui/icons";
import { RailHeading } from "@/components/ui/panel";
import type { Arm, Joint } from "@/kinematics";
import { requiredPoseStatus, ruleProblems, tightenArm, type AssignmentRules } from "@/lib/shared/courses/rules";
import type { Limits } from "@/lib/shared/schemas/courses";
import { formatJointValue, type AngleUnit } from "@/lib/shared/units";
import type { BenchPlan } from "./plan-state";

/** The assignment a plan is worked on for: what the bench checks against and lists. */
export interface BenchAssignment {
  title: string;
  courseTitle: string;
  /** The arm revision the plan is checked against (its saved version's, else the plan's arm). */
  armRevisionId: string;
  rules: AssignmentRules;
}

/** The arm as the assignment checks it: the plan's arm tightened by the course's and the assignment's limits. */
export function assignmentArm(assignment: BenchAssignment): (arm: Arm) => Arm {
  return (arm) => tightenArm(arm, assignment.rules.courseLimits, assignment.rules.limits);
}

/** One line per limit, in words: "course limit: 70% of maximum speed". */
export function limitLines(
  owner: "course" | "assignment",
  limits: Limits | null | undefined,
  joints: readonly Joint[],
  unit: AngleUnit,
): string[] {
  if (!limits) return [];
  const out: string[] = [];
  const percent = (p: number) => `${Number(p.toPrecision(4))}%`;
  if (limits.speedPercent !== undefined) out.push(`${owner} limit: ${percent(limits.speedPercent)} of maximum speed`);
  if (limits.accelPercent !== undefined)
    out.push(`${owner} limit: ${percent(limits.accelPercent)} of maximum acceleration`);
  for (const cap of limits.joints ?? []) {
    const joint = joints[cap.joint];
    if (!joint) continue;
    const parts: string[] = [];
    if (cap.min !== undefined || cap.max !== undefined) {
      const lo = cap.min === undefined ? "its minimum" : formatJointValue(cap.min, joint.type, unit);
      const hi = cap.max === undefined ? "its maximum" : formatJointValue(cap.max, joint.type, unit);
      parts.push(`travel ${lo} to ${hi}`);
    }
    if (cap.maxVelocity !== undefined)
      parts.push(`speed at most ${formatJointValue(cap.maxVelocity, joint.type, unit, "velocity")}`);
    if (cap.maxAcceleration !== undefined)
      parts.push(`acceleration at most ${formatJointValue(cap.maxAcceleration, joint.type, unit, "acceleration")}`);
    if (parts.length > 0) out.push(`${owner} limit for ${joint.name}: ${parts.join(", ")}`);
  }
  return out;
}

/** The pose tolerance with its units: radians and degrees for revolute joints, millimetres for prismatic ones. */
export function toleranceText(tolerance: number, joints: readonly Joint[]): string {
  const parts: string[] = [];
  if (joints.some((j) => j.type === "revolute"))
    parts.push(`±${Number(((tolerance * 180) / Math.PI).toPrecision(3))}° (${tolerance} rad) on revolute joints`);
  if (joints.some((j) => j.type === "prismatic"))
    parts.push(`±${Number((tolerance * 1000).toPrecision(3))} mm on prismatic joints`);
  return parts.join(", ");
}

/**
 * The assignment section of the bench's outline rail: the limits the live check uses (the same rule
 * code the server runs at submission), the required poses with their tolerance and which ones the
 * plan meets, and the other rules the plan breaks.
 */
export function AssignmentRulesPanel({
  assignment,
  plan,
  unit,
}: {
  assignment: BenchAssignment;
  plan: BenchPlan;
  unit: AngleUnit;
}) {
  const { rules } = assignment;
  const joints = plan.arm.joints;
  const lines = [
    ...limitLines("course", rules.courseLimits, joints, unit),
    ...limitLines("assignment", rules.limits, joints, unit),
  ];
  const status = useMemo(() => requiredPoseStatus(plan, rules), [plan, rules]);
  const problems = useMemo(
    () =>
      ruleProblems(plan, assignment.armRevisionId, rules).filter(
        (p) => p.rule !== "goal-pose" && p.rule !== "start-pose",
      ),
    [plan, assignment.armRevisionId, rules],
  );
  const poses: { label: string; met: boolean }[] = [
    ...(status.start === null ? [] : [{ label: "Start pose", met: status.start }]),
    ...status.goals.map((met, k) => ({ label: `Goal pose ${k + 1} (in order)`, met })),
  ];
  return (
    <section aria-label="Assignment rules" data-testid="assignment-rules" className="border-b border-line">
      <RailHeading>Assignment</RailHeading>
      <div className="flex flex-col gap-2 px-3 pb-3 text-xs">
        <p>
          <span className="font-semibold">{assignment.title}</span>{" "}
          <span className="text-ink-soft">· {assignment.courseTitle}</span>
        </p>
        <p className="text-ink-soft">
          This bench checks the plan against the course&apos;s limits, with the same rules as the check at submission.
        </p>
        {lines.length > 0 ? (
          <ul className="flex flex-col gap-0.5" aria-label="Limits the check uses">
            {lines.map((line) => (
              <li key={line} className="tabular font-mono text-[11px]">
                {line}
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-ink-soft">No limits beyond the arm&apos;s own.</p>
        )}
        {poses.length > 0 ? (
          <div>
            <p className="font-medium">Required poses, within {toleranceText(rules.poseTolerance, joints)}</p>
            <ul className="mt-1 flex flex-col gap-0.5" aria-label="Required poses">
              {poses.map((p) => (
                <li key={p.label} className="flex items-center gap-1.5" data-met={p.met}>
                  {p.met ? (
                    <PassIcon size={12} className="text-pass" />
                  ) : (
                    <CautionIcon size={12} className="text-caution" />
                  )}
                  <span>{p.label}:</span>
                  <span className={p.met ? "text-pass" : "text-caution"}>{p.met ? "met" : "not met yet"}</span>
                </li>
              ))}
            </ul>
          </div>
        ) : null}
        {problems.map((p) => (
          <p key={p.rule} role="alert" className="text-fault">
            {p.message}
          </p>
        ))}
      </div>
    </section>
  );
}
