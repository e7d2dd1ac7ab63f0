"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { signInSchema } from "@/lib/shared/schemas/auth";

export function SignInForm({ next, initialError }: { next: string; initialError: string | null }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(initialError);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const parsed = signInSchema.safeParse({ email: form.get("email"), password: form.get("password") });
    if (!parsed.success) {
      setError("Enter your e-mail and password.");
      return;
    }
    setPending(true);
    setError(null);
    const result = await signIn("credentials", { ...parsed.data, redirect: false });
    setPending(false);
    if (!result || result.error) {
      // The server's message: wrong credentials, or the rate limit with how long to wait.
      setError(result?.error && result.error !== "CredentialsSignin" ? result.error : "E-mail or password is wrong.");
      return;
    }
    router.push(next);
    router.refresh();
  }

  return (
    <form onSubmit={onSubmit} className="mt-8 space-y-4" noValidate>
      <label className="block text-sm font-medium text-ink">
        E-mail
        <input
          name="email"
          type="email"
          autoComplete="email"
          required
          className="mt-1 block w-full rounded border border-line bg-panel px-3 py-2 text-ink focus:border-brand-500 focus:ring-2 focus:ring-brand-100 focus:outline-none"
        />
      </label>
      <label className="block text-sm font-medium text-ink">
        Password
        <input
          name="password"
          type="password"
          autoComplete="current-password"
          required
          className="mt-1 block w-full rounded border border-line bg-panel px-3 py-2 text-ink focus:border-brand-500 focus:ring-2 focus:ring-brand-100 focus:outline-none"
        />
      </label>
      {error ? (
        <p role="alert" className="rounded border border-fault/30 bg-fault-tint px-3 py-2 text-sm text-fault">
          {error}
        </p>
      ) : null}
      <button
        type="submit"
        disabled={pending}
        className="w-full rounded bg-brand-600 px-4 py-2 text-sm font-medium text-white hover:bg-brand-700 disabled:opacity-60"
      >
        {pending ? "Signing in…" : "Sign in"}
      </button>
    </form>
  );
}
