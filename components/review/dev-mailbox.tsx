"use client";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { DateTime } from "@/components/ui/date-time";
import { EmptyState, Panel } from "@/components/ui/panel";
import { Table, Td, Th } from "@/components/ui/table";
import type { DevMailView } from "@/lib/server/mail/dev-mail";

/** The development mailbox: one row per received message; open one to read its text and HTML parts. */
export function DevMailbox({ view }: { view: DevMailView }) {
  const [open, setOpen] = useState<string | null>(view.messages[0]?.id ?? null);
  const [part, setPart] = useState<"text" | "html">("text");
  const message = view.messages.find((m) => m.id === open);
  return (
    <div className="mx-auto max-w-6xl px-6 py-8">
      <h1 className="text-2xl font-semibold tracking-tight">Development mail</h1>
      <p className="text-sm text-ink-soft">
        What the local SMTP fake received
        {view.dir ? (
          <>
            {" "}
            (stored under <code className="font-mono text-xs">{view.dir}</code>)
          </>
        ) : null}
        . This page does not exist in production.
      </p>
      <div className="mt-6 grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,1.2fr)]">
        <Panel className="overflow-x-auto">
          {view.messages.length === 0 ? (
            <div className="p-4">
              <EmptyState title="No messages yet">
                Invite a student or submit a plan; the e-mail appears here once the mail worker has sent it.
              </EmptyState>
            </div>
          ) : (
            <Table aria-label="Received messages">
              <thead>
                <tr>
                  <Th>Received</Th>
                  <Th>To</Th>
                  <Th>Subject</Th>
                </tr>
              </thead>
              <tbody>
                {view.messages.map((m) => (
                  <tr key={m.id} className={m.id === open ? "bg-brand-50" : undefined} data-testid="mail-row">
                    <Td className="tabular text-xs whitespace-nowrap">
                      <DateTime value={m.receivedAt} />
                    </Td>
                    <Td className="text-xs">{m.to}</Td>
                    <Td>
                      <button
                        type="button"
                        className="text-left text-brand-700 underline-offset-2 hover:underline"
                        onClick={() => setOpen(m.id)}
                      >
                        {m.subject}
                      </button>
                    </Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          )}
        </Panel>
        {message ? (
          <Panel className="flex min-h-[320px] flex-col" aria-label="Message">
            <div className="border-b border-line px-4 py-3">
              <p className="font-medium" data-testid="mail-subject">
                {message.subject}
              </p>
              <p className="text-xs text-ink-soft">
                From {message.from} to {message.to} · {message.kind ?? "mail"} ·{" "}
                <span className="font-mono">{message.messageId}</span>
              </p>
              <div className="mt-2 flex gap-2">
                <Button size="sm" variant={part === "text" ? "primary" : "secondary"} onClick={() => setPart("text")}>
                  Text
                </Button>
                <Button size="sm" variant={part === "html" ? "primary" : "secondary"} onClick={() => setPart("html")}>
                  HTML
                </Button>
              </div>
            </div>
            {part === "text" ? (
              <pre
                className="flex-1 overflow-auto px-4 py-3 font-mono text-xs whitespace-pre-wrap"
                data-testid="mail-text"
              >
                {message.text}
              </pre>
            ) : (
              // Sandboxed: the message's HTML can neither run scripts nor reach this page.
              <iframe title="HTML part" sandbox="" srcDoc={message.html} className="min-h-[320px] flex-1 bg-white" />
            )}
          </Panel>
        ) : null}
      </div>
      <h2 className="mt-10 text-lg font-semibold">Outbox</h2>
      <p className="text-sm text-ink-soft">
        Every message is written here with the action that caused it, then sent by the mail worker with retries.
      </p>
      <Panel className="mt-3 overflow-x-auto">
        <Table aria-label="Outbox">
          <thead>
            <tr>
              <Th>Queued</Th>
              <Th>Kind</Th>
              <Th>To</Th>
              <Th>Status</Th>
              <Th numeric>Attempts</Th>
              <Th>Last error</Th>
            </tr>
          </thead>
          <tbody>
            {view.outbox.map((r) => (
              <tr key={r.id}>
                <Td className="tabular text-xs whitespace-nowrap">
                  <DateTime value={r.createdAt} />
                </Td>
                <Td className="text-xs">{r.kind}</Td>
                <Td className="text-xs">{r.toAddress}</Td>
                <Td className="text-xs font-medium">{r.status}</Td>
                <Td numeric>{r.attempts}</Td>
                <Td className="max-w-xs truncate text-xs text-ink-soft" title={r.lastError ?? undefined}>
                  {r.lastError ?? ""}
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      </Panel>
    </div>
  );
}
