import type { Metadata } from "next";
import Link from "next/link";
import { WRONG_CREDENTIALS } from "./messages";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<{ callbackUrl?: string; error?: string }>;
}) {
  const { callbackUrl, error } = await searchParams;
  // Only same-site paths are followed after sign-in.
  const next = callbackUrl && callbackUrl.startsWith("/") && !callbackUrl.startsWith("//") ? callbackUrl : "/projects";
  return (
    <section className="mx-auto max-w-sm px-6 py-16">
      <h1 className="text-2xl font-semibold tracking-tight text-ink">Sign in</h1>
      <p className="mt-2 text-sm text-ink-soft">Use the e-mail and password of your Jointproof account.</p>
      <SignInForm
        next={next}
        initialError={error && error !== "CredentialsSignin" ? error : error ? WRONG_CREDENTIALS : null}
      />
      <p className="mt-4 text-sm">
        <Link
          href="/forgot-password"
          className="font-medium text-brand-600 underline underline-offset-2 hover:text-brand-700"
        >
          Forgot your password?
        </Link>
      </p>
      <p className="mt-6 text-sm text-ink-soft">
        No account yet?{" "}
        <Link href="/sign-up" className="font-medium text-brand-600 underline underline-offset-2 hover:text-brand-700">
          Create one
        </Link>
      </p>
    </section>
  );
}
