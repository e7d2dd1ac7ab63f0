"use client";

import { useState } from "react";
import { createTokenSchema } from "@/lib/shared/schemas/api";

type Token = { id: string; name: string; prefix: string; createdAt: string; lastUsedAt: string | null; expiresAt: string | null; revokedAt: string | null };

const day = (iso: string | null) => (iso ? new Date(iso).toISOString().slice(0, 10) : "—");

export function TokenManager({ initial }: { initial: Token[] }) {
  const [tokens, setTokens] = useState(initial);
  const [fresh, setFresh] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);

  async function create(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const formElement = event.currentTarget;
    const form = new FormData(formElement);
    const days = String(form.get("expiresInDays") ?? "");
    const parsed = createTokenSchema.safeParse({ name: form.get("name"), ...(days ? { expiresInDays: Number(days) } : {}) });
    if (!parsed.success) {
      setError(parsed.error.issues.map((i) => `${i.path.join(".")} ${i.message}`).join("; "));
      return;
    }
    setError(null);
    const res = await fetch("/api/v1/tokens", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(parsed.data) });
    const body = (await res.json()) as Token & { token?: string; error?: { message: string } };
    if (!res.ok || !body.token) {
      setError(body.error?.message ?? "The token could not be created.");
      return;
    }
    setFresh(body.token);
    setTokens((list) => [{ ...body, lastUsedAt: null, revokedAt: null }, ...list]);
    formElement.reset();
  }

  async function revoke(id: string) {
    const res = await fetch(`/api/v1/tokens/${id}`, { method: "DELETE" });
    if (res.ok) setTokens((list) => list.map((t) => (t.id === id ? { ...t, revokedAt: new Date().toISOString() } : t)));
    else setError("The token could not be revoked.");
  }

  return (
    <div className="mt-8 space-y-8">
      <form onSubmit={create} className="flex flex-wrap items-end gap-3">
        <label className="text-sm font-medium">
          Name
          <input name="name" required maxLength={80} placeholder="lab CI" className="mt-1 block w-56 rounded border border-line bg-panel px-3 py-2" />
        </label>
        <label className="text-sm font-medium">
          Expires after (days)
          <input name="expiresInDays" type="number" min={1} max={366} placeholder="never" className="mt-1 block w-36 rounded border border-line bg-panel px-3 py-2" />
        </label>
        <button type="submit" className="rounded bg-brand-600 px-4 py-2 text-sm font-medium text-white hover:bg-brand-700">
          Create token
        </button>
      </form>
      {error ? <p role="alert" className="rounded bg-fault-tint px-3 py-2 text-sm text-fault">{error}</p> : null}
      {fresh ? (
        <div role="status" className="rounded border border-pass/30 bg-pass-tint px-4 py-3 text-sm">
          <p className="font-medium">Copy your new token now; it will not be shown again.</p>
          <code className="mt-2 block break-all font-mono text-xs">{fresh}</code>
        </div>
      ) : null}
      <table className="w-full border-collapse text-sm">
        <thead>
          <tr className="border-b border-line text-left text-ink-faint">
            <th className="py-2 pr-3 font-medium">Name</th>
            <th className="py-2 pr-3 font-medium">Starts with</th>
            <th className="py-2 pr-3 font-medium">Created</th>
            <th className="py-2 pr-3 font-medium">Last used</th>
            <th className="py-2 pr-3 font-medium">Expires</th>
            <th className="py-2 font-medium"><span className="sr-only">Action</span></th>
          </tr>
        </thead>
        <tbody className="tabular-nums">
          {tokens.map((t) => (
            <tr key={t.id} className="border-b border-line/60">
              <td className="py-2 pr-3">{t.name}</td>
              <td className="py-2 pr-3 font-mono text-xs">{t.prefix}…</td>
              <td className="py-2 pr-3">{day(t.createdAt)}</td>
              <td className="py-2 pr-3">{day(t.lastUsedAt)}</td>
              <td className="py-2 pr-3">{day(t.expiresAt)}</td>
              <td className="py-2 text-right">
                {t.revokedAt ? (
                  <span className="text-ink-faint">revoked {day(t.revokedAt)}</span>
                ) : (
                  <button type="button" onClick={() => revoke(t.id)} className="rounded border border-line px-2 py-1 text-xs hover:border-fault hover:text-fault">
                    Revoke
                  </button>
                )}
              </td>
            </tr>
          ))}
          {tokens.length === 0 ? (
            <tr>
              <td colSpan={6} className="py-4 text-ink-faint">No tokens yet.</td>
            </tr>
          ) : null}
        </tbody>
      </table>
    </div>
  );
}
