import type { HTMLAttributes, ReactNode } from "react";
import { cn } from "./cn";

/** A white card on the paper background. */
export function Panel({ className, ...rest }: HTMLAttributes<HTMLDivElement>) {
  return <div className={cn("rounded-card border border-line bg-panel", className)} {...rest} />;
}

/** A small section heading inside a rail or panel. */
export function RailHeading({ children, action, id }: { children: ReactNode; action?: ReactNode; id?: string }) {
  return (
    <div className="flex items-center justify-between gap-2 px-3 pt-3 pb-2">
      <h2 id={id} className="text-[11px] font-semibold tracking-widest text-ink-faint uppercase">
        {children}
      </h2>
      {action}
    </div>
  );
}

/** What a list shows when it has nothing in it: a sentence and, optionally, the action that fills it. */
export function EmptyState({ title, children, action }: { title: string; children?: ReactNode; action?: ReactNode }) {
  return (
    <div className="rounded-card border border-dashed border-line bg-panel/60 px-6 py-8 text-center">
      <p className="font-medium text-ink">{title}</p>
      {children ? <div className="mt-1 text-sm text-ink-soft">{children}</div> : null}
      {action ? <div className="mt-4 flex justify-center">{action}</div> : null}
    </div>
  );
}

/** An error from the API or the engine, shown where it happened. */
export function ErrorNote({ children, title = "Something went wrong" }: { children: ReactNode; title?: string }) {
  return (
    <div role="alert" className="rounded-md border border-fault/30 bg-fault-tint px-3 py-2 text-sm text-fault">
      <p className="font-medium">{title}</p>
      <div className="mt-0.5">{children}</div>
    </div>
  );
}
