/**
 * Sign-in with next-auth 4 (Credentials provider, JWT session in a signed, encrypted,
 * http-only cookie). Failed attempts are counted in PostgreSQL, so the back-off holds across
 * app servers: after a few failures for an account (or many from one client address), the next
 * attempt must wait a delay that doubles with each further failure, and the user is told how
 * many seconds. A correct password after the delay always works: nobody can lock an account or
 * a shared address out for longer than the capped delay.
 */
import bcrypt from "bcryptjs";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { randomUUID } from "node:crypto";
import {
  getUserForSignIn,
  recentFailedSignInsForEmail,
  recentFailedSignInsFromIp,
  recordSignInAttempt,
  revokeSession,
  type SignInFailures,
} from "@/db/queries/users";
import { env } from "./env";
import { PEER_ADDRESS_HEADER } from "./peer-address";
import { signInSchema } from "../shared/schemas/auth";

/**
 * Sign-in back-off: failures within the window beyond the free ones make the next attempt wait
 * 2, 4, 8 … seconds after the latest failure, up to the cap (per account and per client address).
 */
export const SIGN_IN_BACKOFF = {
  freePerEmail: 3,
  freePerIp: 10,
  maxDelayPerEmailS: 300,
  maxDelayPerIpS: 60,
  windowMinutes: 15,
} as const;

/** Seconds to wait after the latest failure, given how many failures there were. */
export function backoffDelayS(failures: number, free: number, maxS: number): number {
  const over = failures - free;
  if (over <= 0) return 0;
  return Math.min(maxS, 2 ** Math.min(over, 30));
}

/** Seconds until the next attempt may be made (0: now), from the failures and the clock. */
export function retryAfterS(f: SignInFailures, free: number, maxS: number, nowMs: number): number {
  if (!f.lastFailureAt) return 0;
  const readyMs = f.lastFailureAt.getTime() + backoffDelayS(f.failures, free, maxS) * 1000;
  return Math.max(0, Math.ceil((readyMs - nowMs) / 1000));
}

/** Cookies are `secure` everywhere except on a loopback http address (local development and tests). */
export function secureCookies(): boolean {
  const url = new URL(env().APP_URL);
  const loopback = ["127.0.0.1", "localhost", "[::1]"].includes(url.hostname);
  return url.protocol === "https:" || !loopback;
}

/** The session cookie's name; `__Secure-` when the cookie is secure (RFC 6265bis cookie prefixes). */
export function sessionCookieName(): string {
  return `${secureCookies() ? "__Secure-" : ""}jp.session`;
}

/** The secret that signs sessions; sign-in is refused (fails closed) while it is missing. */
export function sessionSecret(): string | undefined {
  return env().NEXTAUTH_SECRET;
}

export const SESSION_MAX_AGE_S = 8 * 60 * 60;

/** The start of the message shown while the back-off holds; it goes on with the seconds to wait. */
export const RATE_LIMITED_MESSAGE = "Too many failed sign-in attempts.";
export function rateLimitedMessage(waitS: number): string {
  return `${RATE_LIMITED_MESSAGE} Try again in ${waitS} second${waitS === 1 ? "" : "s"}.`;
}
export const BAD_CREDENTIALS_MESSAGE = "E-mail or password is wrong.";

/** A fixed hash, compared against when the e-mail is unknown, so timing does not reveal which accounts exist. */
const UNKNOWN_USER_HASH = "$2b$10$s2KksfKqIyMoHmh/0udEPe2wFY5DzlAUsYZW1Z.QpKawvGoOxCEj2";

/**
 * Checks an e-mail and password. Returns the user, or throws an Error whose message the
 * sign-in form shows (next-auth passes it through as `error`).
 */
export async function verifyCredentials(
  raw: unknown,
  ip: string | null,
): Promise<{ id: string; email: string; name: string }> {
  const parsed = signInSchema.safeParse(raw);
  if (!parsed.success) throw new Error(BAD_CREDENTIALS_MESSAGE);
  const { email, password } = parsed.data;
  const since = new Date(Date.now() - SIGN_IN_BACKOFF.windowMinutes * 60_000);
  const [byEmail, byIp] = await Promise.all([
    recentFailedSignInsForEmail({ email, since }),
    ip ? recentFailedSignInsFromIp({ ip, since }) : Promise.resolve({ failures: 0, lastFailureAt: null }),
  ]);
  const now = Date.now();
  const waitS = Math.max(
    retryAfterS(byEmail, SIGN_IN_BACKOFF.freePerEmail, SIGN_IN_BACKOFF.maxDelayPerEmailS, now),
    retryAfterS(byIp, SIGN_IN_BACKOFF.freePerIp, SIGN_IN_BACKOFF.maxDelayPerIpS, now),
  );
  // Refused before the password is compared, and not counted: waiting out the delay is enough.
  if (waitS > 0) throw new Error(rateLimitedMessage(waitS));
  const user = await getUserForSignIn({ email });
  const ok = await bcrypt.compare(password, user?.passwordHash ?? UNKNOWN_USER_HASH);
  const allowed = ok && user !== undefined && user.disabledAt === null;
  await recordSignInAttempt({ email, ip, succeeded: allowed });
  if (!allowed || !user) throw new Error(BAD_CREDENTIALS_MESSAGE);
  return { id: user.id, email: user.email, name: user.name };
}

export { PEER_ADDRESS_HEADER };

/** `::ffff:192.0.2.1` → `192.0.2.1`, so IPv4 clients on a dual-stack socket compare equal. */
function normaliseIp(ip: string): string {
  const v = ip.trim().toLowerCase();
  return v.startsWith("::ffff:") && v.includes(".") ? v.slice(7) : v;
}

/**
 * The client's address: the connection's peer, unless that peer is one of TRUSTED_PROXIES, in
 * which case X-Forwarded-For is read from the right, skipping further trusted proxies, and the
 * first untrusted address is the client. A client's own X-Forwarded-For is never believed.
 * Null when the peer is unknown (a handler called without a server).
 */
export function clientIp(
  headers: Headers | Record<string, string | string[] | undefined> | undefined,
  trusted: readonly string[] = env().TRUSTED_PROXIES,
): string | null {
  if (!headers) return null;
  const get = (name: string): string | undefined => {
    if (headers instanceof Headers) return headers.get(name) ?? undefined;
    const v = headers[name];
    return Array.isArray(v) ? v.join(",") : v;
  };
  const peer = get(PEER_ADDRESS_HEADER);
  if (!peer) return null;
  const trustedSet = new Set(trusted.map(normaliseIp));
  let client = normaliseIp(peer);
  if (!trustedSet.has(client)) return client;
  const hops = (get("x-forwarded-for") ?? "")
    .split(",")
    .map((h) => normaliseIp(h))
    .filter(Boolean);
  while (hops.length > 0) {
    client = hops.pop()!;
    if (!trustedSet.has(client)) return client;
  }
  return client;
}

export function authOptions(): NextAuthOptions {
  const secure = secureCookies();
  return {
    secret: sessionSecret(),
    session: { strategy: "jwt", maxAge: SESSION_MAX_AGE_S },
    useSecureCookies: secure,
    cookies: {
      sessionToken: {
        name: sessionCookieName(),
        options: { httpOnly: true, sameSite: "lax", path: "/", secure },
      },
    },
    pages: { signIn: "/sign-in" },
    providers: [
      CredentialsProvider({
        name: "E-mail and password",
        credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
        async authorize(credentials, req) {
          return verifyCredentials(credentials, clientIp(req?.headers));
        },
      }),
    ],
    events: {
      // Sign-out ends the session on the server too: a copied cookie stops working at once.
      async signOut({ token }) {
        const sid = typeof token?.sid === "string" ? token.sid : undefined;
        const sub = typeof token?.sub === "string" ? token.sub : undefined;
        if (!sid || !sub) return;
        const expS = typeof token.exp === "number" ? token.exp : Math.floor(Date.now() / 1000) + SESSION_MAX_AGE_S;
        await revokeSession({ sessionId: sid, userId: sub, expiresAt: new Date(expS * 1000) });
      },
    },
    callbacks: {
      async jwt({ token, user }) {
        // `signedInAt` is set once, at sign-in, and carried through every refresh: next-auth gives a
        // refreshed cookie a new `iat`, so only this claim can tell a session from before a password change.
        // `sid` names this session, so sign-out can revoke exactly it (revoked_sessions, checked on every request).
        if (user) {
          token.sub = user.id;
          token.signedInAt = Math.floor(Date.now() / 1000);
          token.sid = randomUUID();
        }
        return token;
      },
      async session({ session, token }) {
        if (session.user && token.sub) (session.user as { id?: string }).id = token.sub;
        return session;
      },
    },
  };
}
