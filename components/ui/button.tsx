import type { ButtonHTMLAttributes } from "react";
import { cn } from "./cn";

type Variant = "primary" | "secondary" | "ghost" | "danger";
type Size = "sm" | "md";

const variants: Record<Variant, string> = {
  primary: "bg-brand-600 text-white hover:bg-brand-700 disabled:bg-brand-100 disabled:text-ink-faint",
  secondary:
    "border border-line bg-panel text-ink hover:border-brand-500 disabled:text-ink-faint disabled:hover:border-line",
  ghost: "text-ink-soft hover:bg-brand-50 hover:text-ink disabled:text-ink-faint disabled:hover:bg-transparent",
  danger: "border border-fault/40 bg-panel text-fault hover:bg-fault-tint disabled:text-ink-faint",
};

const sizes: Record<Size, string> = {
  sm: "h-7 gap-1 px-2 text-xs",
  md: "h-9 gap-1.5 px-3.5 text-sm",
};

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: Variant;
  size?: Size;
}

/** The one button: four variants, two sizes; `type="button"` unless told otherwise. */
export function Button({ variant = "secondary", size = "md", className, type = "button", ...rest }: ButtonProps) {
  return (
    <button
      type={type}
      className={cn(
        "inline-flex shrink-0 items-center justify-center rounded-md font-medium whitespace-nowrap transition-colors disabled:cursor-not-allowed",
        variants[variant],
        sizes[size],
        className,
      )}
      {...rest}
    />
  );
}
