import type { Metadata } from "next";
import Link from "next/link";
import { VerifyEmailForm } from "./verify-email-form";

// The link carries a one-time token: keep the page out of search indexes.
export const metadata: Metadata = { title: "Confirm your e-mail address", robots: { index: false, follow: false } };

export default async function VerifyEmailPage({
  searchParams,
}: {
  searchParams: Promise<{ token?: string | string[] }>;
}) {
  const { token } = await searchParams;
  const value = typeof token === "string" ? token : undefined;
  return (
    <section className="mx-auto max-w-sm px-6 py-16">
      <h1 className="text-2xl font-semibold tracking-tight text-ink">Confirm your e-mail address</h1>
      {value ? (
        <>
          {/* A button rather than confirming on load: mail systems that open links to scan them would use the token up. */}
          <p className="mt-2 text-sm text-ink-soft">Confirm that the address this link was sent to is yours.</p>
          <VerifyEmailForm token={value} />
        </>
      ) : (
        <p role="alert" className="mt-6 rounded-md border border-fault/30 bg-fault-tint px-3 py-2 text-sm text-fault">
          This page needs the link from the confirmation e-mail. Open the link from the message, or{" "}
          <Link href="/sign-in" className="font-medium underline underline-offset-2">
            sign in
          </Link>
          .
        </p>
      )}
    </section>
  );
}
