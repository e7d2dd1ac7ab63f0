import type { ReactNode } from "react";
import { cn } from "./cn";
import { CautionIcon, FaultIcon, PassIcon } from "./icons";

export type VerdictName = "pass" | "caution" | "fault";

/** One look per verdict, the same everywhere: icon, word and colour together (never colour alone). */
export const verdictLook: Record<
  VerdictName,
  { word: string; text: string; tint: string; border: string; stroke: string; Icon: typeof PassIcon }
> = {
  pass: {
    word: "Pass",
    text: "text-pass",
    tint: "bg-pass-tint",
    border: "border-pass/30",
    stroke: "#1b6b3a",
    Icon: PassIcon,
  },
  caution: {
    word: "Caution",
    text: "text-caution",
    tint: "bg-caution-tint",
    border: "border-caution/30",
    stroke: "#8a5300",
    Icon: CautionIcon,
  },
  fault: {
    word: "Fault",
    text: "text-fault",
    tint: "bg-fault-tint",
    border: "border-fault/30",
    stroke: "#b3261e",
    Icon: FaultIcon,
  },
};

export interface VerdictChipProps {
  verdict: VerdictName;
  size?: "sm" | "md";
  /** Extra words after the verdict, e.g. a count: "Fault · 2". */
  detail?: string;
  className?: string;
}

/** A verdict as a chip: icon + word + colour, readable by screen readers as "Verdict: fault". */
export function VerdictChip({ verdict, size = "md", detail, className }: VerdictChipProps) {
  const look = verdictLook[verdict];
  const { Icon } = look;
  return (
    <span
      data-verdict={verdict}
      className={cn(
        // relative: the chip holds its own screen-reader text, which would otherwise be placed against the
        // page and, inside a scrolling list, stretch the page below the footer.
        "relative inline-flex items-center gap-1 rounded-full border font-medium whitespace-nowrap",
        size === "sm" ? "px-1.5 py-px text-[11px]" : "px-2 py-0.5 text-xs",
        look.text,
        look.tint,
        look.border,
        className,
      )}
    >
      <Icon size={size === "sm" ? 12 : 14} />
      <span className="sr-only">Verdict: </span>
      {look.word}
      {detail ? <span className="tabular font-normal">· {detail}</span> : null}
    </span>
  );
}

/** A chip for "no verdict yet" (a check still running, or one that could not run): never green, never a verdict word. */
export function PendingChip({ children, className }: { children: ReactNode; className?: string }) {
  return (
    <span
      data-verdict="none"
      className={cn(
        "inline-flex items-center gap-1 rounded-full border border-line bg-paper px-2 py-0.5 text-xs font-medium whitespace-nowrap text-ink-soft",
        className,
      )}
    >
      {children}
    </span>
  );
}
