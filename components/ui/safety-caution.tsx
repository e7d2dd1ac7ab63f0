"use client";
import { CautionIcon } from "@/components/ui/icons";
import { SAFETY_POINTS, SAFETY_SHORT } from "@/lib/shared/safety";

/** The safety caution, shown before anything leaves Jointproof. */
export function SafetyCaution() {
  return (
    <section
      aria-label="Safety caution"
      className="rounded-md border border-caution/40 bg-caution-tint p-3 text-caution"
    >
      <p className="flex items-start gap-2 font-semibold">
        <CautionIcon size={16} className="mt-0.5 shrink-0" /> {SAFETY_SHORT}
      </p>
      <ul className="mt-2 list-disc space-y-0.5 pl-6 text-xs leading-relaxed text-ink">
        {SAFETY_POINTS.map((p) => (
          <li key={p}>{p}</li>
        ))}
      </ul>
    </section>
  );
}

/** The box a user ticks to say they read the caution before a download link works; `what` names the file. */
export function CautionAcknowledgement({
  checked,
  onChange,
  what,
}: {
  checked: boolean;
  onChange: (checked: boolean) => void;
  what: string;
}) {
  return (
    <label className="flex items-start gap-2 text-sm">
      <input
        type="checkbox"
        checked={checked}
        onChange={(e) => onChange(e.target.checked)}
        className="mt-1 accent-brand-600"
      />
      <span>I have read the caution; {what} is a prediction to verify on the arm at reduced speed.</span>
    </label>
  );
}
