/** The row of joint buttons above a recording plot: one pressed, each with its count of findings. */
export function JointPicker({
  joints,
  selected,
  onSelect,
  findingsOf,
  className,
}: {
  joints: readonly { name: string }[];
  selected: number;
  onSelect: (joint: number) => void;
  /** How many findings name joint `j`. */
  findingsOf: (j: number) => number;
  className?: string;
}) {
  return (
    <div role="group" aria-label="Joint to plot" className={`flex flex-wrap gap-1 ${className ?? ""}`}>
      {joints.map((j, i) => {
        const count = findingsOf(i);
        return (
          <button
            key={j.name}
            type="button"
            aria-pressed={selected === i}
            onClick={() => onSelect(i)}
            className={
              selected === i
                ? "rounded-full bg-brand-600 px-2 py-0.5 text-xs text-white"
                : "rounded-full border border-line px-2 py-0.5 text-xs text-ink-soft hover:text-ink"
            }
          >
            {j.name}
            {count ? ` · ${count}` : ""}
          </button>
        );
      })}
    </div>
  );
}
