import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { DevMailbox } from "@/components/review/dev-mailbox";
import { optionalPageUser } from "@/lib/server/page-actor";
import { devMailEnabled, loadDevMail } from "@/lib/server/mail/dev-mail";

export const metadata: Metadata = { title: "Development mail" };
export const dynamic = "force-dynamic";

/**
 * Local development only: every e-mail the local SMTP fake received, newest first, and the
 * outbox's state — for a signed-in admin on a loopback-only server (lib/server/mail/dev-mail.ts).
 */
export default async function DevMailPage() {
  if (!devMailEnabled()) notFound();
  const user = await optionalPageUser();
  if (!user || user.actor.siteRole !== "admin") notFound();
  const view = await loadDevMail();
  return (
    <>
      <div
        role="note"
        data-testid="dev-mail-notice"
        className="mx-auto mt-6 max-w-6xl rounded border border-amber-400 bg-amber-50 px-4 py-3 text-sm"
      >
        <strong>Development tool, local machine only.</strong> This page shows the e-mail the local mail fake captured,
        including password-reset and verification links that sign in as their recipients. It is served only to an admin,
        only while the server listens on a loopback address, and only when{" "}
        <code className="font-mono text-xs">JP_DEV_MAIL=1</code> is set for a production build. No real e-mail is sent
        from here.
      </div>
      <DevMailbox view={view} />
    </>
  );
}
