import { cn } from "@/components/ui/cn";

/** A progress bar with its accessible name: `value` of `max` done (default max 1, a fraction), announced as a percentage. */
export function ProgressBar({
  label,
  value,
  max = 1,
  tone = "brand",
  thin = false,
}: {
  label: string;
  value: number;
  max?: number;
  tone?: "brand" | "copper";
  thin?: boolean;
}) {
  const percent = max > 0 ? Math.round((100 * value) / max) : 0;
  return (
    <div
      role="progressbar"
      aria-label={label}
      aria-valuemin={0}
      aria-valuemax={100}
      aria-valuenow={percent}
      className={cn("overflow-hidden rounded-full bg-line/60", thin ? "h-1.5" : "h-2")}
    >
      <div
        className={cn("h-full transition-[width]", tone === "copper" ? "bg-copper-500" : "bg-brand-500")}
        style={{ width: `${percent}%` }}
      />
    </div>
  );
}
