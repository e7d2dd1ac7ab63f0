import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { DevMailbox } from "@/components/review/dev-mailbox";
import { devMailEnabled, loadDevMail } from "@/lib/server/mail/dev-mail";

export const metadata: Metadata = { title: "Development mail" };
export const dynamic = "force-dynamic";

/** Development only: every e-mail the local SMTP fake received, newest first, and the outbox's state. */
export default async function DevMailPage() {
  if (!devMailEnabled()) notFound();
  const view = await loadDevMail();
  return <DevMailbox view={view} />;
}
