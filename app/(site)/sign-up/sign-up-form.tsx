"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { applyApiIssues, apiIssues, fieldMessage, formFailure } from "@/components/ui/form";
import { ErrorNote } from "@/components/ui/panel";
import { request } from "@/lib/client/api-client";
import { signUpSchema } from "@/lib/shared/schemas/auth";

const fields = ["email", "name", "password", "siteRole"] as const;

export function SignUpForm() {
  const router = useRouter();
  const [failure, setFailure] = useState<string | undefined>();
  const [notice, setNotice] = useState<string | null>(null);
  const form = useForm({
    resolver: zodResolver(signUpSchema),
    defaultValues: { email: "", name: "", password: "", siteRole: "student" as const },
  });
  const { errors, isSubmitting } = form.formState;

  const onSubmit = form.handleSubmit(async (body) => {
    setFailure(undefined);
    setNotice(null);
    try {
      await request("/api/v1/accounts", { method: "POST", body: JSON.stringify(body) });
    } catch (error) {
      setFailure(formFailure(error, applyApiIssues(apiIssues(error), form.setError, fields)));
      return;
    }
    // The answer is the same for a new and an existing address; signing in tells the owner of a new account apart.
    const signedIn = await signIn("credentials", { email: body.email, password: body.password, redirect: false });
    if (signedIn?.ok && !signedIn.error) {
      router.push("/projects");
      router.refresh();
      return;
    }
    setNotice(
      `We sent a message to ${body.email}. If this address already has an account, sign in or reset its password instead.`,
    );
  });

  return (
    <form onSubmit={onSubmit} className="mt-8 space-y-4" noValidate aria-label="Create an account">
      <TextField
        label="Name"
        autoComplete="name"
        required
        error={fieldMessage("Name", errors.name)}
        {...form.register("name")}
      />
      <TextField
        label="E-mail"
        type="email"
        autoComplete="email"
        required
        error={fieldMessage("E-mail", errors.email)}
        {...form.register("email")}
      />
      <TextField
        label="Password"
        type="password"
        autoComplete="new-password"
        required
        hint="At least 10 characters."
        error={fieldMessage("The password", errors.password)}
        {...form.register("password")}
      />
      <fieldset className="text-sm text-ink">
        <legend className="text-xs font-medium text-ink-soft">I am a</legend>
        <div className="mt-1 flex gap-5">
          <label className="flex items-center gap-2">
            <input type="radio" value="student" {...form.register("siteRole")} /> student
          </label>
          <label className="flex items-center gap-2">
            <input type="radio" value="researcher" {...form.register("siteRole")} /> researcher
          </label>
        </div>
        {errors.siteRole ? (
          <p className="mt-1 text-xs text-fault">{fieldMessage("The role", errors.siteRole)}</p>
        ) : null}
      </fieldset>
      {notice ? (
        <p role="status" className="rounded-md border border-line bg-panel px-3 py-2 text-sm text-ink">
          {notice}
        </p>
      ) : null}
      {failure ? <ErrorNote title="The account was not created">{failure}</ErrorNote> : null}
      <Button type="submit" variant="primary" disabled={isSubmitting} className="w-full">
        {isSubmitting ? "Creating…" : "Create account"}
      </Button>
    </form>
  );
}
