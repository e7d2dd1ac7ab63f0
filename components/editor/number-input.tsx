"use client";
import { useState, type InputHTMLAttributes } from "react";
import { cn } from "@/components/ui/cn";
import { inputClass } from "@/components/ui/field";

export interface NumberInputProps extends Omit<InputHTMLAttributes<HTMLInputElement>, "value" | "onChange" | "type"> {
  value: number;
  /** Decimal places shown when the field is not being edited. */
  digits: number;
  /** Called with a finite number when the user commits (Enter, blur) or types a complete number. */
  onValue: (value: number) => void;
}

/**
 * A number field that keeps what the user types while they type (so "-" or "1." are allowed on the
 * way to a number) and reports only finite numbers.
 */
export function NumberInput({ value, digits, onValue, className, onBlur, onKeyDown, ...rest }: NumberInputProps) {
  const shown = Number.isFinite(value) ? value.toFixed(digits) : "";
  const [draft, setDraft] = useState<string | null>(null);
  return (
    <input
      type="text"
      inputMode="decimal"
      autoComplete="off"
      spellCheck={false}
      value={draft ?? shown}
      onChange={(e) => {
        setDraft(e.target.value);
        const parsed = Number(e.target.value.replace(",", "."));
        if (e.target.value.trim() !== "" && Number.isFinite(parsed)) onValue(parsed);
      }}
      onBlur={(e) => {
        setDraft(null);
        onBlur?.(e);
      }}
      onKeyDown={(e) => {
        if (e.key === "Enter") setDraft(null);
        onKeyDown?.(e);
      }}
      className={cn(inputClass, "tabular h-8 text-right font-mono text-[13px]", className)}
      {...rest}
    />
  );
}
