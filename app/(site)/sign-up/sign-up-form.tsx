"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { signUpSchema } from "@/lib/shared/schemas/auth";

type FieldErrors = Partial<Record<"email" | "name" | "password" | "siteRole" | "form", string>>;

const inputClass =
  "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 text-ink focus:border-brand-500 focus:outline-none focus:ring-2 focus:ring-brand-100";

export function SignUpForm() {
  const router = useRouter();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [pending, setPending] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const input = {
      email: form.get("email"),
      name: form.get("name"),
      password: form.get("password"),
      siteRole: form.get("siteRole"),
    };
    const parsed = signUpSchema.safeParse(input);
    if (!parsed.success) {
      const next: FieldErrors = {};
      for (const issue of parsed.error.issues)
        next[(issue.path[0] as keyof FieldErrors) ?? "form"] ??= `${String(issue.path[0])} ${issue.message}`;
      setErrors(next);
      return;
    }
    setPending(true);
    setErrors({});
    const res = await fetch("/api/v1/accounts", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(parsed.data),
    });
    if (!res.ok) {
      const body = (await res.json().catch(() => null)) as {
        error?: { message?: string; issues?: { path: string; message: string }[] };
      } | null;
      const next: FieldErrors = { form: body?.error?.message ?? "The account could not be created." };
      for (const issue of body?.error?.issues ?? [])
        next[issue.path as keyof FieldErrors] = `${issue.path} ${issue.message}`;
      setErrors(next);
      setPending(false);
      return;
    }
    // The answer is the same for a new and an existing address; signing in tells the owner of a new account apart.
    const signedIn = await signIn("credentials", {
      email: parsed.data.email,
      password: parsed.data.password,
      redirect: false,
    });
    if (signedIn?.ok && !signedIn.error) {
      router.push("/projects");
      router.refresh();
      return;
    }
    setNotice(
      `We sent a message to ${parsed.data.email}. If this address already has an account, sign in or reset its password instead.`,
    );
    setPending(false);
  }

  const fieldError = (key: keyof FieldErrors) =>
    errors[key] ? (
      <span className="mt-1 block text-xs font-normal text-fault" id={`${key}-error`}>
        {errors[key]}
      </span>
    ) : null;

  return (
    <form onSubmit={onSubmit} className="mt-8 space-y-4" noValidate>
      <label className="block text-sm font-medium text-ink">
        Name
        <input name="name" autoComplete="name" required className={inputClass} aria-describedby="name-error" />
        {fieldError("name")}
      </label>
      <label className="block text-sm font-medium text-ink">
        E-mail
        <input
          name="email"
          type="email"
          autoComplete="email"
          required
          className={inputClass}
          aria-describedby="email-error"
        />
        {fieldError("email")}
      </label>
      <label className="block text-sm font-medium text-ink">
        Password <span className="font-normal text-ink-faint">(at least 10 characters)</span>
        <input
          name="password"
          type="password"
          autoComplete="new-password"
          required
          minLength={10}
          className={inputClass}
          aria-describedby="password-error"
        />
        {fieldError("password")}
      </label>
      <fieldset className="text-sm text-ink">
        <legend className="font-medium">I am a</legend>
        <div className="mt-1 flex gap-5">
          <label className="flex items-center gap-2">
            <input type="radio" name="siteRole" value="student" defaultChecked /> student
          </label>
          <label className="flex items-center gap-2">
            <input type="radio" name="siteRole" value="researcher" /> researcher
          </label>
        </div>
      </fieldset>
      {notice ? (
        <p role="status" className="rounded border border-line bg-panel px-3 py-2 text-sm text-ink">
          {notice}
        </p>
      ) : null}
      {errors.form ? (
        <p role="alert" className="rounded border border-fault/30 bg-fault-tint px-3 py-2 text-sm text-fault">
          {errors.form}
        </p>
      ) : null}
      <button
        type="submit"
        disabled={pending}
        className="w-full rounded bg-brand-600 px-4 py-2 text-sm font-medium text-white hover:bg-brand-700 disabled:opacity-60"
      >
        {pending ? "Creating…" : "Create account"}
      </button>
    </form>
  );
}
