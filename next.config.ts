import type { NextConfig } from "next";

const isDev = process.env.NODE_ENV === "development";

// Content Security Policy without nonces (so pages can stay static). Fonts are
// self-hosted through next/font, so font-src is 'self' only; the engine runs in
// a Web Worker, hence worker-src. Next's inline bootstrap scripts and style
// attributes need 'unsafe-inline'; 'unsafe-eval' only in development (React's
// dev-time error overlays). No upgrade-insecure-requests: the demo is served
// over plain HTTP on localhost; put HTTPS and HSTS at the reverse proxy.
const contentSecurityPolicy = [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline'${isDev ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' blob: data:",
  "font-src 'self'",
  "connect-src 'self'",
  "worker-src 'self' blob:",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join("; ");

const securityHeaders = [
  { key: "Content-Security-Policy", value: contentSecurityPolicy },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
];

const nextConfig: NextConfig = {
  poweredByHeader: false,
  // A native module: load it from node_modules at run time instead of bundling it.
  serverExternalPackages: ["better-sqlite3"],
  // `npm run typecheck` (tsc over the app and, separately, the engine) is the type
  // gate and runs first in `npm test`; checking again inside `next build` would
  // double the slowest step and tie the demo build to test-only files.
  typescript: { ignoreBuildErrors: true },
  async headers() {
    return [{ source: "/:path*", headers: securityHeaders }];
  },
};

export default nextConfig;
