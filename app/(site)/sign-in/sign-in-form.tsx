"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { fieldMessage } from "@/components/ui/form";
import { ErrorNote } from "@/components/ui/panel";
import { signInSchema } from "@/lib/shared/schemas/auth";
import { WRONG_CREDENTIALS } from "./messages";

export function SignInForm({ next, initialError }: { next: string; initialError: string | null }) {
  const router = useRouter();
  const [failure, setFailure] = useState<string | null>(initialError);
  const form = useForm({ resolver: zodResolver(signInSchema), defaultValues: { email: "", password: "" } });
  const { errors, isSubmitting } = form.formState;

  const onSubmit = form.handleSubmit(async (body) => {
    setFailure(null);
    const result = await signIn("credentials", { ...body, redirect: false });
    if (!result || result.error) {
      // The server's message: wrong credentials, or the rate limit with how long to wait.
      setFailure(result?.error && result.error !== "CredentialsSignin" ? result.error : WRONG_CREDENTIALS);
      return;
    }
    router.push(next);
    router.refresh();
  });

  return (
    <form onSubmit={onSubmit} className="mt-8 space-y-4" noValidate aria-label="Sign in">
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
        autoComplete="current-password"
        required
        error={fieldMessage("Password", errors.password)}
        {...form.register("password")}
      />
      {failure ? <ErrorNote title="Not signed in">{failure}</ErrorNote> : null}
      <Button type="submit" variant="primary" disabled={isSubmitting} className="w-full">
        {isSubmitting ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}
