import type { HTMLAttributes, TdHTMLAttributes, ThHTMLAttributes } from "react";
import { cn } from "./cn";

/** A data table: header in small caps, numbers in tabular monospace (`numeric` cells). */
export function Table({ className, ...rest }: HTMLAttributes<HTMLTableElement>) {
  return <table className={cn("w-full border-collapse text-sm", className)} {...rest} />;
}

export function Th({ className, numeric, ...rest }: ThHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return (
    <th
      scope="col"
      className={cn(
        "border-b border-line px-2 py-1.5 text-left text-[11px] font-semibold tracking-wide text-ink-faint uppercase",
        numeric && "text-right",
        className,
      )}
      {...rest}
    />
  );
}

export function Td({ className, numeric, ...rest }: TdHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return (
    <td
      className={cn(
        "border-b border-line/70 px-2 py-1.5 align-middle",
        numeric && "tabular text-right font-mono text-[13px]",
        className,
      )}
      {...rest}
    />
  );
}
