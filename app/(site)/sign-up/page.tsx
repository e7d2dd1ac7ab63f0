import type { Metadata } from "next";
import Link from "next/link";
import { SignUpForm } from "./sign-up-form";

export const metadata: Metadata = { title: "Create an account" };

export default function SignUpPage() {
  return (
    <section className="mx-auto max-w-sm px-6 py-16">
      <h1 className="text-2xl font-semibold tracking-tight text-ink">Create an account</h1>
      <p className="mt-2 text-sm text-ink-soft">
        Students and researchers sign up here; instructors get their role from a lab admin. We send a link to confirm
        your e-mail address; you can start working before you open it.
      </p>
      <SignUpForm />
      <p className="mt-6 text-sm text-ink-soft">
        Already registered?{" "}
        <Link href="/sign-in" className="font-medium text-brand-600 underline underline-offset-2 hover:text-brand-700">
          Sign in
        </Link>
      </p>
    </section>
  );
}
