/**
 * The development mail view: what the local SMTP fake received and the outbox's state. It holds
 * every user's reset and verification links, so it is served only when all of these hold:
 * - the server is not a production build, or `JP_DEV_MAIL=1` says explicitly that this one is a
 *   local production build (`npm start`, `npm test`);
 * - the app is configured for a loopback address (APP_URL) and every socket this process listens
 *   on is bound to loopback (a server reachable from the network never shows it);
 * - the caller is a signed-in admin (checked by the page and the route with the session).
 * Anywhere else it does not exist (404).
 */
import "server-only";
import { Server } from "node:net";
import { listOutbox } from "@/db/queries/mail";
import { env } from "../env";
import { fakeMailDir } from "./config";
import { readFakeMailbox, type FakeMessage } from "../../../scripts/fakes/smtp";

const LOOPBACK = /^(127\.\d+\.\d+\.\d+|::1|::ffff:127\.\d+\.\d+\.\d+|localhost|\[::1\])$/;

/**
 * The addresses the servers of this process listen on. Node has no public API for a process's
 * listening sockets; `_getActiveHandles` is the long-standing internal one. When it is missing,
 * an unknown address is returned, so the check fails closed.
 */
export function listeningAddresses(): string[] {
  const handles = (process as unknown as { _getActiveHandles?: () => unknown[] })._getActiveHandles;
  if (typeof handles !== "function") return ["(unknown)"];
  const out: string[] = [];
  for (const h of handles.call(process)) {
    if (!(h instanceof Server) || !h.listening) continue;
    const addr = h.address();
    out.push(addr === null ? "(unknown)" : typeof addr === "string" ? addr : addr.address);
  }
  return out;
}

/** Whether this process serves only loopback: APP_URL is loopback and no socket listens elsewhere. */
export function servesLoopbackOnly(
  appUrl: string = env().APP_URL,
  addresses: string[] = listeningAddresses(),
): boolean {
  if (!LOOPBACK.test(new URL(appUrl).hostname)) return false;
  // A Unix socket path (starts with "/") is local too.
  return addresses.every((a) => LOOPBACK.test(a) || a.startsWith("/"));
}

/** Whether the development mail view may exist in this process (the caller must still be an admin). */
export function devMailEnabled(): boolean {
  const explicit = process.env.JP_DEV_MAIL === "1";
  if (process.env.NODE_ENV === "production" && !explicit) return false;
  return servesLoopbackOnly();
}

export type DevMailView = {
  dir: string | null;
  messages: FakeMessage[];
  outbox: {
    id: string;
    kind: string;
    toAddress: string;
    subject: string;
    status: string;
    attempts: number;
    lastError: string | null;
    createdAt: string;
    sentAt: string | null;
  }[];
};

/** Newest first. */
export async function loadDevMail(): Promise<DevMailView> {
  const dir = fakeMailDir() ?? null;
  const messages = dir ? (await readFakeMailbox(dir)).reverse() : [];
  const outbox = (await listOutbox({ limit: 200 })).map((r) => ({
    id: r.id,
    kind: r.kind,
    toAddress: r.toAddress,
    subject: r.subject,
    status: r.status,
    attempts: r.attempts,
    lastError: r.lastError,
    createdAt: r.createdAt.toISOString(),
    sentAt: r.sentAt?.toISOString() ?? null,
  }));
  return { dir, messages, outbox };
}
