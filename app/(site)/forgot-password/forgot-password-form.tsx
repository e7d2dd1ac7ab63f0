"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { ErrorNote } from "@/components/ui/panel";
import { fieldErrors, postAccount } from "@/lib/client/auth";
import { passwordResetRequestSchema } from "@/lib/shared/schemas/auth";

export function ForgotPasswordForm({ validMinutes }: { validMinutes: number }) {
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const parsed = passwordResetRequestSchema.safeParse({ email: form.get("email") });
    if (!parsed.success) {
      setErrors(fieldErrors(parsed.error));
      return;
    }
    setPending(true);
    setErrors({});
    const result = await postAccount("/api/v1/accounts/password-reset", parsed.data);
    setPending(false);
    if (!result.ok) {
      setErrors({ ...result.fields, form: result.message });
      return;
    }
    setSentTo(parsed.data.email);
  }

  if (sentTo) {
    return (
      <div role="status" className="mt-8 rounded-md border border-line bg-panel px-4 py-3 text-sm text-ink">
        <p className="font-medium">Check your inbox</p>
        <p className="mt-1 text-ink-soft">
          If an account uses <span className="font-medium text-ink">{sentTo}</span>, a reset link is on its way. It works once, for {validMinutes} minutes.
          Nothing arrived after a few minutes? Look in the spam folder, or{" "}
          <button type="button" onClick={() => setSentTo(null)} className="font-medium text-brand-600 underline underline-offset-2 hover:text-brand-700">
            ask again
          </button>
          .
        </p>
      </div>
    );
  }

  return (
    <form onSubmit={onSubmit} className="mt-8 space-y-4" noValidate>
      <TextField label="E-mail" name="email" type="email" autoComplete="email" required error={errors.email ? `The address ${errors.email}.` : undefined} />
      {errors.form ? <ErrorNote title="The link could not be sent">{errors.form}</ErrorNote> : null}
      <Button type="submit" variant="primary" disabled={pending} className="w-full">
        {pending ? "Sending…" : "Send the reset link"}
      </Button>
    </form>
  );
}
