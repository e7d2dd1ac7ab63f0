/**
 * Who is calling a route handler: an API token holder (`Authorization: Bearer`, RFC 6750)
 * or a signed-in user (the next-auth session cookie). The user is re-read from PostgreSQL on
 * every request, so a disabled account, a changed role, a revoked token or a signed-out session
 * takes effect at once.
 */
import { decode } from "next-auth/jwt";
import { getTokenOwner } from "@/db/queries/tokens";
import { getSessionUserById } from "@/db/queries/users";
import { sessionCookieName, sessionSecret } from "./auth";
import { AppError } from "./errors";
import { requestContext } from "./log";
import type { Actor } from "./permissions";
import { assertSameOrigin } from "./security";
import { bearerToken, hashToken } from "./tokens";

function readCookie(header: string | null, name: string): string | null {
  if (!header) return null;
  for (const part of header.split(";")) {
    const eq = part.indexOf("=");
    if (eq < 0) continue;
    if (part.slice(0, eq).trim() === name) return decodeURIComponent(part.slice(eq + 1).trim());
  }
  return null;
}

/**
 * Whether a session began (its `signedInAt` claim) no earlier than the last password change. The
 * claim is in whole seconds, like a JWT NumericDate (RFC 7519 §4.1.6), so the change time is truncated too:
 * a sign-in in the same second as the reset must keep working, at the price of a cookie issued
 * earlier in that same second also surviving. A cookie without the claim proves nothing, so for an
 * account whose password has changed it is refused.
 * API tokens are not affected: they are revoked on their own (tokens.ts), not by a password change.
 */
function issuedAfterPasswordChange(issuedAtS: number | undefined, passwordChangedAt: Date): boolean {
  if (issuedAtS === undefined) return false;
  return issuedAtS >= Math.floor(passwordChangedAt.getTime() / 1000);
}

/** The actor behind a request, or null when it carries no valid credentials. */
export async function authenticate(request: Request): Promise<Actor | null> {
  const authorization = request.headers.get("authorization");
  if (authorization !== null) {
    // API tokens are deliberately not ended by a password change (only session cookies are, below):
    // they are scripts' credentials, revoked one by one on the tokens page.
    const token = bearerToken(authorization);
    if (!token) return null;
    const owner = await getTokenOwner({ tokenHash: hashToken(token) });
    return owner ? { userId: owner.userId, siteRole: owner.siteRole, via: "token", tokenId: owner.tokenId } : null;
  }
  const secret = sessionSecret();
  const cookie = readCookie(request.headers.get("cookie"), sessionCookieName());
  if (!secret || !cookie) return null;
  let sub: string | undefined;
  let sid: string | undefined;
  let issuedAtS: number | undefined;
  try {
    const jwt = await decode({ token: cookie, secret });
    sub = typeof jwt?.sub === "string" ? jwt.sub : undefined;
    // The session's own id (lib/server/auth.ts jwt callback); without one a sign-out could not end it, so it is refused.
    sid = typeof jwt?.sid === "string" ? jwt.sid : undefined;
    // The sign-in time (lib/server/auth.ts jwt callback), not `iat`, which every session refresh renews.
    issuedAtS = typeof jwt?.signedInAt === "number" ? jwt.signedInAt : undefined;
  } catch {
    return null;
  }
  const uuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
  if (!sub || !uuid.test(sub) || !sid || !uuid.test(sid)) return null;
  const user = await getSessionUserById({ id: sub, sessionId: sid });
  if (!user) return null;
  if (user.passwordChangedAt && !issuedAfterPasswordChange(issuedAtS, user.passwordChangedAt)) return null;
  return { userId: user.id, siteRole: user.siteRole, via: "session" };
}

/**
 * Refuses (403) an API token where only a signed-in person may act: managing tokens. A leaked
 * token must not be able to mint successors or revoke others, or it would outlive its own revocation.
 */
export function assertNotToken(actor: Actor, what: string): void {
  if (actor.via === "token") {
    throw new AppError("forbidden:token", `API tokens cannot ${what}; sign in to the web app to do it.`);
  }
}

/**
 * The actor, or a 401. For a cookie session on a state-changing method, also the same-origin
 * check (tokens are not sent by browsers on their own, so they need none).
 */
export async function requireActor(request: Request): Promise<Actor> {
  const actor = await authenticate(request);
  if (!actor) {
    const hadBearer = request.headers.has("authorization");
    throw new AppError(
      "unauthorized",
      hadBearer ? "The API token is not valid, has expired or was revoked." : undefined,
    );
  }
  if (actor.via === "session") assertSameOrigin(request);
  const ctx = requestContext();
  if (ctx) ctx.actorId = actor.userId;
  return actor;
}
