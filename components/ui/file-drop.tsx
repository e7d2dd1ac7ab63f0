"use client";

import { useId, useState, type DragEvent, type ReactNode } from "react";
import { cn } from "./cn";

export interface FileDropProps {
  /** The input's accessible name ("Recording CSV file"). */
  label: string;
  /** What to choose, shown in the box ("a recording CSV"). */
  what: string;
  accept?: string;
  hint?: ReactNode;
  disabled?: boolean;
  onFile: (file: File) => void;
  className?: string;
}

/**
 * A file input styled as a drop zone: click to choose, or drop a file on it. The native input stays
 * in the page (visually hidden, keyboard-focusable through its label) so screen readers and tests
 * reach it as a file input.
 */
export function FileDrop({ label, what, accept, hint, disabled, onFile, className }: FileDropProps) {
  const id = useId();
  const [over, setOver] = useState(false);
  const [chosen, setChosen] = useState<string | null>(null);

  const take = (file: File | undefined) => {
    if (!file || disabled) return;
    setChosen(file.name);
    onFile(file);
  };
  const onDrag = (e: DragEvent<HTMLDivElement>, entering: boolean) => {
    e.preventDefault();
    if (!disabled) setOver(entering);
  };

  return (
    <div
      onDragEnter={(e) => onDrag(e, true)}
      onDragOver={(e) => onDrag(e, true)}
      onDragLeave={(e) => onDrag(e, false)}
      onDrop={(e) => {
        e.preventDefault();
        setOver(false);
        take(e.dataTransfer.files?.[0]);
      }}
      data-testid="file-drop"
      className={cn(
        "relative rounded-md border border-dashed px-3 py-3 text-xs transition-colors focus-within:border-brand-500 focus-within:ring-2 focus-within:ring-brand-100",
        over ? "border-brand-500 bg-brand-50" : "border-line bg-paper",
        disabled && "opacity-60",
        className,
      )}
    >
      <input
        id={id}
        type="file"
        accept={accept}
        disabled={disabled}
        aria-label={label}
        className="sr-only"
        onChange={(e) => {
          take(e.target.files?.[0]);
          // The same file chosen again is a new read.
          e.target.value = "";
        }}
      />
      <p className="text-ink-soft">
        <label
          htmlFor={id}
          className={cn(
            "inline-flex h-7 cursor-pointer items-center rounded-md border border-line bg-panel px-2 font-medium text-ink hover:border-brand-500",
            disabled && "cursor-not-allowed hover:border-line",
          )}
        >
          Choose {what}
        </label>{" "}
        or drop it here.
      </p>
      {chosen ? (
        <p className="mt-1 truncate text-ink" title={chosen}>
          Chosen: <span className="font-medium">{chosen}</span>
        </p>
      ) : null}
      {hint ? <div className="mt-1 text-ink-faint">{hint}</div> : null}
    </div>
  );
}
