import type { Metadata } from "next";
import Link from "next/link";
import { RESET_VALID_MINUTES } from "@/lib/server/mail/account-mail";
import { ForgotPasswordForm } from "./forgot-password-form";

export const metadata: Metadata = { title: "Forgot your password?" };

export default function ForgotPasswordPage() {
  return (
    <section className="mx-auto max-w-sm px-6 py-16">
      <h1 className="text-2xl font-semibold tracking-tight text-ink">Forgot your password?</h1>
      <p className="mt-2 text-sm text-ink-soft">
        Enter the e-mail address of your account. We send a link that lets you choose a new password; it works once, for{" "}
        {RESET_VALID_MINUTES} minutes.
      </p>
      <ForgotPasswordForm validMinutes={RESET_VALID_MINUTES} />
      <p className="mt-6 text-sm text-ink-soft">
        Remembered it?{" "}
        <Link href="/sign-in" className="font-medium text-brand-600 underline underline-offset-2 hover:text-brand-700">
          Sign in
        </Link>
      </p>
    </section>
  );
}
