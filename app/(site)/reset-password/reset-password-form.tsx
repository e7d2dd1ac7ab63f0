"use client";

import Link from "next/link";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { ErrorNote } from "@/components/ui/panel";
import { fieldErrors, postAccount } from "@/lib/client/auth";
import { passwordResetConfirmSchema } from "@/lib/shared/schemas/auth";

const linkClass = "font-medium text-brand-600 underline underline-offset-2 hover:text-brand-700";

export function ResetPasswordForm({ token }: { token: string }) {
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [linkDead, setLinkDead] = useState(false);
  const [done, setDone] = useState(false);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const repeat = String(form.get("repeat") ?? "");
    const parsed = passwordResetConfirmSchema.safeParse({ token, password: form.get("password") });
    const next = parsed.success ? {} : fieldErrors(parsed.error);
    if (parsed.success && repeat !== parsed.data.password) next.repeat = "does not match the new password";
    if (!parsed.success || next.repeat) {
      setErrors(next);
      if (next.token) setLinkDead(true);
      return;
    }
    setPending(true);
    setErrors({});
    const result = await postAccount("/api/v1/accounts/password-reset/confirm", parsed.data);
    setPending(false);
    if (result.ok) {
      setDone(true);
      return;
    }
    if (result.code === "bad_request:token" || result.fields.token) {
      setLinkDead(true);
      return;
    }
    setErrors({ ...result.fields, form: result.message });
  }

  if (done) {
    return (
      <div role="status" className="mt-8 rounded-md border border-pass/30 bg-pass-tint px-4 py-3 text-sm text-pass">
        <p className="font-medium">Password changed</p>
        <p className="mt-1">
          Sign in with the new password.{" "}
          <Link href="/sign-in" className="font-medium underline underline-offset-2">
            Go to sign-in
          </Link>
        </p>
      </div>
    );
  }

  if (linkDead) {
    return (
      <div className="mt-8">
        <ErrorNote title="This link no longer works">
          It has expired or was already used; your password is unchanged.{" "}
          <Link href="/forgot-password" className="font-medium underline underline-offset-2">
            Ask for a new link
          </Link>
          .
        </ErrorNote>
      </div>
    );
  }

  return (
    <form onSubmit={onSubmit} className="mt-8 space-y-4" noValidate>
      <TextField
        label="New password"
        name="password"
        type="password"
        autoComplete="new-password"
        required
        minLength={10}
        hint="At least 10 characters."
        error={errors.password ? `The password ${errors.password}.` : undefined}
      />
      <TextField
        label="Repeat the new password"
        name="repeat"
        type="password"
        autoComplete="new-password"
        required
        error={errors.repeat ? `The repeated password ${errors.repeat}.` : undefined}
      />
      {errors.form ? <ErrorNote title="The password was not changed">{errors.form}</ErrorNote> : null}
      <Button type="submit" variant="primary" disabled={pending} className="w-full">
        {pending ? "Saving…" : "Set the new password"}
      </Button>
      <p className="text-sm text-ink-soft">
        Changed your mind? <Link href="/sign-in" className={linkClass}>Back to sign-in</Link>
      </p>
    </form>
  );
}
