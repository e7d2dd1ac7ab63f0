import type { Metadata } from "next";
import Link from "next/link";
import { ResetPasswordForm } from "./reset-password-form";

// The link carries a one-time token: keep the page out of search indexes.
export const metadata: Metadata = { title: "Choose a new password", robots: { index: false, follow: false } };

export default async function ResetPasswordPage({
  searchParams,
}: {
  searchParams: Promise<{ token?: string | string[] }>;
}) {
  const { token } = await searchParams;
  const value = typeof token === "string" ? token : undefined;
  return (
    <section className="mx-auto max-w-sm px-6 py-16">
      <h1 className="text-2xl font-semibold tracking-tight text-ink">Choose a new password</h1>
      {value ? (
        <>
          <p className="mt-2 text-sm text-ink-soft">
            The new password replaces the old one at once; other reset links you asked for stop working.
          </p>
          <ResetPasswordForm token={value} />
        </>
      ) : (
        <p role="alert" className="mt-6 rounded-md border border-fault/30 bg-fault-tint px-3 py-2 text-sm text-fault">
          This page needs the link from the reset e-mail.{" "}
          <Link href="/forgot-password" className="font-medium underline underline-offset-2">
            Ask for a new link
          </Link>
          .
        </p>
      )}
    </section>
  );
}
