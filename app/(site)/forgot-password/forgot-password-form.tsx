"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { applyApiIssues, apiIssues, fieldMessage, formFailure } from "@/components/ui/form";
import { ErrorNote } from "@/components/ui/panel";
import { request } from "@/lib/client/api-client";
import { passwordResetRequestSchema } from "@/lib/shared/schemas/auth";

export function ForgotPasswordForm({ validMinutes }: { validMinutes: number }) {
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [failure, setFailure] = useState<string | undefined>();
  const form = useForm({ resolver: zodResolver(passwordResetRequestSchema), defaultValues: { email: "" } });
  const { errors, isSubmitting } = form.formState;

  const onSubmit = form.handleSubmit(async (body) => {
    setFailure(undefined);
    try {
      await request("/api/v1/accounts/password-reset", { method: "POST", body: JSON.stringify(body) });
      setSentTo(body.email);
    } catch (error) {
      setFailure(formFailure(error, applyApiIssues(apiIssues(error), form.setError, ["email"])));
    }
  });

  if (sentTo) {
    return (
      <div role="status" className="mt-8 rounded-md border border-line bg-panel px-4 py-3 text-sm text-ink">
        <p className="font-medium">Check your inbox</p>
        <p className="mt-1 text-ink-soft">
          If an account uses <span className="font-medium text-ink">{sentTo}</span>, a reset link is on its way. It
          works once, for {validMinutes} minutes. Nothing arrived after a few minutes? Look in the spam folder, or{" "}
          <button
            type="button"
            onClick={() => setSentTo(null)}
            className="font-medium text-brand-600 underline underline-offset-2 hover:text-brand-700"
          >
            ask again
          </button>
          .
        </p>
      </div>
    );
  }

  return (
    <form onSubmit={onSubmit} className="mt-8 space-y-4" noValidate>
      <TextField
        label="E-mail"
        type="email"
        autoComplete="email"
        required
        error={fieldMessage("E-mail", errors.email)}
        {...form.register("email")}
      />
      {failure ? <ErrorNote title="The link could not be sent">{failure}</ErrorNote> : null}
      <Button type="submit" variant="primary" disabled={isSubmitting} className="w-full">
        {isSubmitting ? "Sending…" : "Send the reset link"}
      </Button>
    </form>
  );
}
