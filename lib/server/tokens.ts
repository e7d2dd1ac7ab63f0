/**
 * Personal API tokens: random, shown once, stored as SHA-256 only, sent as
 * `Authorization: Bearer <token>` (RFC 6750, section 2.1).
 */
import { createHash, randomBytes } from "node:crypto";

const TOKEN_PREFIX = "jpt_";

/** A new token: 32 random bytes, base64url, with a recognisable prefix. */
export function generateToken(): { token: string; hash: string; prefix: string } {
  const token = TOKEN_PREFIX + randomBytes(32).toString("base64url");
  return { token, hash: hashToken(token), prefix: token.slice(0, TOKEN_PREFIX.length + 6) };
}

/** Hex SHA-256 of a token; what the database stores and looks up. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

/** The token from an `Authorization: Bearer …` header, or null (RFC 6750 §2.1: the scheme is case-insensitive). */
export function bearerToken(header: string | null): string | null {
  if (!header) return null;
  const match = /^Bearer\s+([A-Za-z0-9\-._~+/]+=*)\s*$/i.exec(header);
  return match ? match[1] : null;
}
