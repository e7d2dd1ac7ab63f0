"use client";
import { Button } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { CopyIcon, HomeIcon } from "@/components/ui/icons";
import type { Joint } from "@/kinematics";
import { displayDigits, fromDisplay, toDisplay, unitLabel, type AngleUnit } from "@/lib/shared/units";
import { NumberInput } from "./number-input";

export interface PoseEditorProps {
  /** Heading, e.g. "Start pose" or "Move 2 goal". */
  title: string;
  joints: readonly Joint[];
  /** The pose being edited (rad or m). */
  pose: readonly number[];
  unit: AngleUnit;
  onUnitChange: (unit: AngleUnit) => void;
  /** One joint changed (value in rad or m). */
  onJointChange: (joint: number, value: number) => void;
  /** "Copy current": set the whole pose to the pose on the stage at the playhead. */
  onCopyCurrent?: () => void;
  /** "Home": every joint at 0 (or mid-travel when 0 is outside it). */
  onHome?: () => void;
  /** Where "copy current" copies from, shown as a hint (e.g. "t = 1.250 s"). */
  currentLabel?: React.ReactNode;
  children?: React.ReactNode;
}

/** Fine slider steps: 0.1° / 0.001 rad / 0.1 mm. */
function stepFor(joint: Joint, unit: AngleUnit): number {
  return 1 / 10 ** displayDigits(joint.type, unit);
}

/**
 * One row per joint: a slider across the joint's travel and a number field, in display units
 * (degrees or radians for revolute joints, millimetres for prismatic ones); values are reported in
 * the document's units. A value outside the travel stays editable and is marked, so the range finding
 * and its fix can be read together.
 */
export function PoseEditor(props: PoseEditorProps) {
  const { title, joints, pose, unit, onUnitChange, onJointChange, onCopyCurrent, onHome, currentLabel, children } =
    props;
  return (
    <section aria-label={title} className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 className="text-sm font-semibold">{title}</h3>
        <div role="group" aria-label="Angle unit" className="inline-flex rounded-md border border-line p-0.5 text-xs">
          {(["deg", "rad"] as const).map((u) => (
            <button
              key={u}
              type="button"
              aria-pressed={unit === u}
              onClick={() => onUnitChange(u)}
              className={cn(
                "rounded px-2 py-0.5 font-medium",
                unit === u ? "bg-brand-600 text-white" : "text-ink-soft hover:text-ink",
              )}
            >
              {u === "deg" ? "Degrees" : "Radians"}
            </button>
          ))}
        </div>
      </div>
      <ul className="flex flex-col gap-2">
        {joints.map((joint, j) => {
          const value = pose[j] ?? 0;
          const label = unitLabel(joint.type, unit);
          const shown = toDisplay(value, joint.type, unit);
          const lo = toDisplay(joint.min, joint.type, unit);
          const hi = toDisplay(joint.max, joint.type, unit);
          const digits = displayDigits(joint.type, unit);
          const outside = value < joint.min || value > joint.max;
          const sliderId = `pose-${title}-${j}`.replace(/\s+/g, "-");
          return (
            <li key={joint.name} className="grid grid-cols-[5.5rem_1fr_5.5rem] items-center gap-x-2">
              <label htmlFor={sliderId} className="truncate text-xs font-medium text-ink-soft" title={joint.name}>
                {joint.name}
              </label>
              <div className="flex flex-col">
                <input
                  id={sliderId}
                  type="range"
                  min={lo}
                  max={hi}
                  step={stepFor(joint, unit)}
                  value={Math.min(hi, Math.max(lo, shown))}
                  onChange={(e) => onJointChange(j, fromDisplay(Number(e.target.value), joint.type, unit))}
                  aria-valuetext={`${shown.toFixed(digits)} ${label}`}
                  className="h-4 w-full accent-brand-600"
                />
                <div className="tabular flex justify-between font-mono text-[10px] text-ink-faint" aria-hidden="true">
                  <span>{lo.toFixed(digits)}</span>
                  <span>{hi.toFixed(digits)}</span>
                </div>
              </div>
              <div className="relative">
                <NumberInput
                  value={shown}
                  digits={digits}
                  aria-label={`${joint.name} (${label})`}
                  aria-invalid={outside}
                  onValue={(v) => onJointChange(j, fromDisplay(v, joint.type, unit))}
                  className={cn("pr-7", outside && "border-fault text-fault")}
                />
                <span className="pointer-events-none absolute top-1/2 right-2 -translate-y-1/2 text-[11px] text-ink-faint">
                  {label}
                </span>
              </div>
              {outside ? (
                <p className="col-span-3 col-start-1 text-[11px] text-fault">
                  Outside the travel {lo.toFixed(digits)}…{hi.toFixed(digits)} {label}
                </p>
              ) : null}
            </li>
          );
        })}
      </ul>
      <div className="flex flex-wrap items-center gap-2 pt-1">
        {onCopyCurrent ? (
          <Button size="sm" onClick={onCopyCurrent} title="Copy the pose on the stage at the playhead">
            <CopyIcon size={13} /> Copy current
          </Button>
        ) : null}
        {onHome ? (
          <Button size="sm" onClick={onHome}>
            <HomeIcon size={13} /> Home
          </Button>
        ) : null}
        {currentLabel && onCopyCurrent ? (
          <span className="text-[11px] text-ink-faint">current: {currentLabel}</span>
        ) : null}
      </div>
      {children}
    </section>
  );
}
