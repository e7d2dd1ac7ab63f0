/**
 * Sign-in with next-auth 4 (Credentials provider, JWT session in a signed, encrypted,
 * http-only cookie). Sign-in attempts are rate-limited through PostgreSQL so the limit
 * holds across app servers. Password reset and e-mail verification hook in here later
 * (`users.emailVerifiedAt` is already in the schema).
 */
import bcrypt from "bcryptjs";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import {
  countFailedSignIns,
  countFailedSignInsFromIp,
  getUserForSignIn,
  recordSignInAttempt,
} from "@/db/queries/users";
import { env } from "./env";
import { signInSchema } from "../shared/schemas/auth";

/** Failed attempts allowed per e-mail (and, more loosely, per address) in the window. */
export const SIGN_IN_LIMIT = { perEmail: 5, perIp: 30, windowMinutes: 15 } as const;

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

/** Message shown when the rate limit refuses an attempt. */
export const RATE_LIMITED_MESSAGE = `Too many failed sign-in attempts. Wait ${SIGN_IN_LIMIT.windowMinutes} minutes and try again.`;
export const BAD_CREDENTIALS_MESSAGE = "E-mail or password is wrong.";

/** A fixed hash, compared against when the e-mail is unknown, so timing does not reveal which accounts exist. */
const UNKNOWN_USER_HASH = "$2b$10$s2KksfKqIyMoHmh/0udEPe2wFY5DzlAUsYZW1Z.QpKawvGoOxCEj2";

/**
 * Checks an e-mail and password. Returns the user, or throws an Error whose message the
 * sign-in form shows (next-auth passes it through as `error`).
 */
export async function verifyCredentials(raw: unknown, ip: string | null): Promise<{ id: string; email: string; name: string }> {
  const parsed = signInSchema.safeParse(raw);
  if (!parsed.success) throw new Error(BAD_CREDENTIALS_MESSAGE);
  const { email, password } = parsed.data;
  const since = new Date(Date.now() - SIGN_IN_LIMIT.windowMinutes * 60_000);
  const [byEmail, byIp] = await Promise.all([
    countFailedSignIns({ email, since }),
    ip ? countFailedSignInsFromIp({ ip, since }) : Promise.resolve(0),
  ]);
  if (byEmail >= SIGN_IN_LIMIT.perEmail || byIp >= SIGN_IN_LIMIT.perIp) {
    throw new Error(RATE_LIMITED_MESSAGE);
  }
  const user = await getUserForSignIn({ email });
  const ok = await bcrypt.compare(password, user?.passwordHash ?? UNKNOWN_USER_HASH);
  const allowed = ok && user !== undefined && user.disabledAt === null;
  await recordSignInAttempt({ email, ip, succeeded: allowed });
  if (!allowed || !user) throw new Error(BAD_CREDENTIALS_MESSAGE);
  return { id: user.id, email: user.email, name: user.name };
}

/** The client address from the proxy headers, when present (only trustworthy behind our own proxy). */
export function clientIp(headers: Headers | Record<string, string | string[] | undefined> | undefined): string | null {
  if (!headers) return null;
  const get = (name: string): string | undefined => {
    if (headers instanceof Headers) return headers.get(name) ?? undefined;
    const v = headers[name];
    return Array.isArray(v) ? v[0] : v;
  };
  const forwarded = get("x-forwarded-for")?.split(",")[0]?.trim();
  return forwarded || get("x-real-ip") || null;
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
    callbacks: {
      async jwt({ token, user }) {
        // `signedInAt` is set once, at sign-in, and carried through every refresh: next-auth gives a
        // refreshed cookie a new `iat`, so only this claim can tell a session from before a password change.
        if (user) {
          token.sub = user.id;
          token.signedInAt = Math.floor(Date.now() / 1000);
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
