import type { Metadata } from "next";
import { listApiTokens } from "@/db/queries/tokens";
import { requirePageActor } from "@/lib/server/page-actor";
import { TokenManager } from "./token-manager";

export const metadata: Metadata = { title: "API tokens" };

export default async function TokensPage() {
  const actor = await requirePageActor("/settings/tokens");
  const tokens = await listApiTokens({ userId: actor.userId });
  return (
    <section className="mx-auto max-w-3xl px-6 py-12 text-ink">
      <h1 className="text-2xl font-semibold tracking-tight">API tokens</h1>
      <p className="mt-2 text-sm text-ink-soft">
        A token lets scripts and CI use the API with your permissions (send it as{" "}
        <code className="font-mono">Authorization: Bearer …</code>). It is shown once, when you create it; revoking it
        stops it at once.
      </p>
      <TokenManager
        initial={tokens.map((t) => ({
          id: t.id,
          name: t.name,
          prefix: t.prefix,
          createdAt: t.createdAt.toISOString(),
          lastUsedAt: t.lastUsedAt?.toISOString() ?? null,
          expiresAt: t.expiresAt?.toISOString() ?? null,
          revokedAt: t.revokedAt?.toISOString() ?? null,
        }))}
      />
    </section>
  );
}
