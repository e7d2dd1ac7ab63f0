import type { NextConfig } from "next";
import { securityHeaders } from "./lib/server/security-headers";

/**
 * There is deliberately no proxy (middleware): with one, Next clones and buffers every request
 * body up to `proxyClientMaxBodySize` (10 MB by default) and hands the route handler only that
 * much — uploads were cut silently. The security headers come from `headers()` below instead,
 * which also covers static files under `/_next/static` and `public/`.
 */
const nextConfig: NextConfig = {
  serverExternalPackages: ["pg", "pino", "tinypool", "esbuild"],
  poweredByHeader: false,
  async headers() {
    const dev = process.env.NODE_ENV === "development";
    return [
      { source: "/:path*", headers: Object.entries(securityHeaders(dev)).map(([key, value]) => ({ key, value })) },
    ];
  },
};

export default nextConfig;
