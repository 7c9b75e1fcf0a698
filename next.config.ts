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

// Headers every response shares, pages and API alike.
const commonHeaders = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
];

// An API response is data, never a document: opened in a tab, it runs and loads
// nothing. route() in app/_lib/http.ts sets the same on every handler's answer;
// this covers the answers Next gives itself under /api (unknown paths, 405s).
const apiContentSecurityPolicy = "default-src 'none'; sandbox";

// Next sets these headers before the route runs and then ignores any header of
// the same name the route sets, so the config must not name a header a route
// sets itself. Hence three groups: pages (the app's policy), the API (no
// scripts, sandboxed) and the floor-plan image, which sets its own stricter
// image policy, Content-Disposition and nosniff (app/api/benches/[benchId]/floor-plan).
const floorPlanPath = "/api/benches/:benchId/floor-plan";
const headerRules = [
  {
    source: "/:path((?!api(?:/|$)).*)",
    headers: [{ key: "Content-Security-Policy", value: contentSecurityPolicy }, ...commonHeaders],
  },
  {
    source: "/api/:path((?!benches/[^/]+/floor-plan$).*)",
    headers: [
      { key: "Content-Security-Policy", value: apiContentSecurityPolicy },
      ...commonHeaders,
    ],
  },
  {
    source: floorPlanPath,
    headers: commonHeaders.filter((header) => header.key !== "X-Content-Type-Options"),
  },
];

const nextConfig: NextConfig = {
  poweredByHeader: false,
  // A native module, and the DOM the SVG sanitizer runs in (jsdom reads its own
  // files at run time): load them from node_modules instead of bundling them.
  serverExternalPackages: ["better-sqlite3", "jsdom", "dompurify"],
  // `npm run typecheck` (tsc over the app and, separately, the engine) is the type
  // gate and runs first in `npm test`; checking again inside `next build` would
  // double the slowest step and tie the demo build to test-only files.
  typescript: { ignoreBuildErrors: true },
  async headers() {
    return headerRules;
  },
};

export default nextConfig;
