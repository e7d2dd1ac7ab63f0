import {
  useId,
  type InputHTMLAttributes,
  type ReactNode,
  type SelectHTMLAttributes,
  type TextareaHTMLAttributes,
} from "react";
import { cn } from "./cn";

const control =
  "h-9 w-full rounded-md border border-line bg-panel px-2.5 text-sm text-ink placeholder:text-ink-faint focus:border-brand-500 focus:outline-none aria-[invalid=true]:border-fault";

export interface FieldProps {
  label: string;
  /** A short hint under the control. */
  hint?: ReactNode;
  /** An error under the control; marks the control invalid. */
  error?: string;
  /** Visually hide the label (it stays the accessible name). */
  hideLabel?: boolean;
  className?: string;
  children: (ids: { id: string; describedBy: string | undefined; invalid: boolean }) => ReactNode;
}

/** Label, control, hint and error wired together with ids, so every control has a name and its error is read out. */
export function Field({ label, hint, error, hideLabel, className, children }: FieldProps) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(" ") || undefined;
  return (
    <div className={cn("flex flex-col gap-1", className)}>
      <label htmlFor={id} className={cn("text-xs font-medium text-ink-soft", hideLabel && "sr-only")}>
        {label}
      </label>
      {children({ id, describedBy, invalid: Boolean(error) })}
      {hint ? (
        <p id={hintId} className="text-xs text-ink-faint">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="text-xs text-fault">
          {error}
        </p>
      ) : null}
    </div>
  );
}

type InputProps = Omit<InputHTMLAttributes<HTMLInputElement>, "id"> & {
  label: string;
  hint?: ReactNode;
  error?: string;
  hideLabel?: boolean;
  fieldClassName?: string;
};

/** A labelled text or number input. */
export function TextField({ label, hint, error, hideLabel, fieldClassName, className, ...rest }: InputProps) {
  return (
    <Field label={label} hint={hint} error={error} hideLabel={hideLabel} className={fieldClassName}>
      {({ id, describedBy, invalid }) => (
        <input
          id={id}
          aria-describedby={describedBy}
          aria-invalid={invalid}
          className={cn(control, className)}
          {...rest}
        />
      )}
    </Field>
  );
}

type SelectProps = Omit<SelectHTMLAttributes<HTMLSelectElement>, "id"> & {
  label: string;
  hint?: ReactNode;
  error?: string;
  hideLabel?: boolean;
  fieldClassName?: string;
};

/** A labelled select. */
export function SelectField({
  label,
  hint,
  error,
  hideLabel,
  fieldClassName,
  className,
  children,
  ...rest
}: SelectProps) {
  return (
    <Field label={label} hint={hint} error={error} hideLabel={hideLabel} className={fieldClassName}>
      {({ id, describedBy, invalid }) => (
        <select
          id={id}
          aria-describedby={describedBy}
          aria-invalid={invalid}
          className={cn(control, "pr-7", className)}
          {...rest}
        >
          {children}
        </select>
      )}
    </Field>
  );
}

type TextAreaProps = Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, "id"> & {
  label: string;
  hint?: ReactNode;
  error?: string;
  fieldClassName?: string;
};

/** A labelled multi-line text box. */
export function TextAreaField({ label, hint, error, fieldClassName, className, ...rest }: TextAreaProps) {
  return (
    <Field label={label} hint={hint} error={error} className={fieldClassName}>
      {({ id, describedBy, invalid }) => (
        <textarea
          id={id}
          aria-describedby={describedBy}
          aria-invalid={invalid}
          className={cn(control, "h-auto min-h-20 py-2", className)}
          {...rest}
        />
      )}
    </Field>
  );
}

/** The input class, for controls laid out by hand (e.g. inside table cells). */
export const inputClass = control;
