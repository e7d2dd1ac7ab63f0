/**
 * The security headers every response carries, set in next.config.ts `headers()` (pages, API,
 * static files and 404s alike). Dependency-free, so the Next config can import it.
 */

/**
 * Content-Security-Policy (CSP Level 3). The 3D viewer needs WebGL (no CSP directive), blob:
 * workers and data:/blob: images for textures; Next's inline bootstrap scripts need
 * 'unsafe-inline' unless nonces are used, and 'unsafe-eval' only in development (React's dev tools).
 */
export function contentSecurityPolicy(dev: boolean): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'unsafe-inline'${dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self' data:",
    `connect-src 'self'${dev ? " ws: wss:" : ""}`,
    "worker-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

/** The headers every response carries. */
export function securityHeaders(dev: boolean): Record<string, string> {
  return {
    "Content-Security-Policy": contentSecurityPolicy(dev),
    "Referrer-Policy": "same-origin",
    "X-Content-Type-Options": "nosniff",
    "X-Frame-Options": "DENY",
    "Permissions-Policy": "camera=(), microphone=(), geolocation=(), payment=()",
    "Cross-Origin-Opener-Policy": "same-origin",
  };
}
