"use client";
import { useEffect, useId, useRef, type ReactNode } from "react";
import { cn } from "./cn";

export interface DialogProps {
  open: boolean;
  title: string;
  onClose: () => void;
  children: ReactNode;
  /** Buttons in the dialog's footer. */
  actions?: ReactNode;
  /** Width and other panel classes; the default width is `max-w-lg`. */
  className?: string;
}

/**
 * A modal dialog: focus moves into it on open and returns to the opener on close; Escape closes it.
 * Rendered as a fixed overlay (not the native element) so it behaves the same in tests and browsers.
 */
export function Dialog({ open, title, onClose, children, actions, className }: DialogProps) {
  const titleId = useId();
  const panel = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (!open) return;
    const opener = document.activeElement as HTMLElement | null;
    panel.current?.focus();
    const onKey = (e: KeyboardEvent) => {
      if (e.key === "Escape") onClose();
    };
    document.addEventListener("keydown", onKey);
    return () => {
      document.removeEventListener("keydown", onKey);
      opener?.focus?.();
    };
  }, [open, onClose]);
  if (!open) return null;
  return (
    <div
      className="fixed inset-0 z-50 flex items-center justify-center bg-brand-900/40 p-4"
      onMouseDown={(e) => e.target === e.currentTarget && onClose()}
    >
      <div
        ref={panel}
        role="dialog"
        aria-modal="true"
        aria-labelledby={titleId}
        tabIndex={-1}
        className={cn(
          "max-h-[90vh] w-full overflow-auto rounded-card border border-line bg-panel shadow-xl focus:outline-none",
          className ?? "max-w-lg",
        )}
      >
        <div className="flex items-center justify-between border-b border-line px-5 py-3">
          <h2 id={titleId} className="text-base font-semibold">
            {title}
          </h2>
          <button
            type="button"
            onClick={onClose}
            className="rounded p-1 text-ink-faint hover:text-ink"
            aria-label="Close"
          >
            <svg width="16" height="16" viewBox="0 0 16 16" aria-hidden="true">
              <path d="m4 4 8 8M12 4l-8 8" stroke="currentColor" strokeWidth="1.75" strokeLinecap="round" />
            </svg>
          </button>
        </div>
        <div className="px-5 py-4 text-sm">{children}</div>
        {actions ? <div className="flex justify-end gap-2 border-t border-line px-5 py-3">{actions}</div> : null}
      </div>
    </div>
  );
}
