"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { applyApiIssues, apiIssues, fieldMessage, formFailure } from "@/components/ui/form";
import { ErrorNote } from "@/components/ui/panel";
import { ApiError, request } from "@/lib/client/api-client";
import { passwordResetConfirmSchema } from "@/lib/shared/schemas/auth";

const linkClass = "font-medium text-brand-600 underline underline-offset-2 hover:text-brand-700";

/** The API's body plus the repeated password, which only the form checks. */
const resetFormSchema = passwordResetConfirmSchema
  .extend({ repeat: z.string() })
  .refine((v) => v.repeat === v.password, { error: "does not match the new password", path: ["repeat"] });

export function ResetPasswordForm({ token }: { token: string }) {
  const [linkDead, setLinkDead] = useState(false);
  const [done, setDone] = useState(false);
  const [failure, setFailure] = useState<string | undefined>();
  const form = useForm({ resolver: zodResolver(resetFormSchema), defaultValues: { token, password: "", repeat: "" } });
  const { errors, isSubmitting } = form.formState;

  const onSubmit = form.handleSubmit(
    async ({ token: t, password }) => {
      setFailure(undefined);
      try {
        await request("/api/v1/accounts/password-reset/confirm", {
          method: "POST",
          body: JSON.stringify({ token: t, password }),
        });
        setDone(true);
      } catch (error) {
        const issues = apiIssues(error);
        if (
          (error instanceof ApiError && error.code === "bad_request:token") ||
          issues.some((i) => i.path === "token")
        ) {
          setLinkDead(true);
          return;
        }
        setFailure(formFailure(error, applyApiIssues(issues, form.setError, ["password", "repeat"])));
      }
    },
    (invalid) => {
      if (invalid.token) setLinkDead(true);
    },
  );

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
      <input type="hidden" {...form.register("token")} />
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        required
        hint="At least 10 characters."
        error={fieldMessage("The password", errors.password)}
        {...form.register("password")}
      />
      <TextField
        label="Repeat the new password"
        type="password"
        autoComplete="new-password"
        required
        error={fieldMessage("The repeated password", errors.repeat)}
        {...form.register("repeat")}
      />
      {failure ? <ErrorNote title="The password was not changed">{failure}</ErrorNote> : null}
      <Button type="submit" variant="primary" disabled={isSubmitting} className="w-full">
        {isSubmitting ? "Saving…" : "Set the new password"}
      </Button>
      <p className="text-sm text-ink-soft">
        Changed your mind?{" "}
        <Link href="/sign-in" className={linkClass}>
          Back to sign-in
        </Link>
      </p>
    </form>
  );
}
