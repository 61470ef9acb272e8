const isDev = process.env.NODE_ENV === "development";

/**
 * Content Security Policy. Next's App Router puts its bootstrap and flight data in inline scripts,
 * so scripts are 'self' plus 'unsafe-inline' (nonces would force every page to render per request);
 * development adds 'unsafe-eval' for React's tooling. The PDF viewer's worker is served by this
 * server (/api/pdf-worker) and pdf.js may start it from a blob: URL. Nothing may frame the app.
 */
export const CONTENT_SECURITY_POLICY = [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline'${isDev ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self' data:",
  `connect-src 'self'${isDev ? " ws: wss:" : ""}`,
  "worker-src 'self' blob:",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join("; ");

/** Headers on every response (pages, API, static files). */
export const SECURITY_HEADERS = [
  { key: "Content-Security-Policy", value: CONTENT_SECURITY_POLICY },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Referrer-Policy", value: "same-origin" },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=(), usb=()" },
];

/** @type {import('next').NextConfig} */
const nextConfig = {
  // better-sqlite3 is a native addon: load it from node_modules at run time, never bundle it; pg
  // (and Prisma's adapter over it) likewise, as pg reaches for its optional native binding at run time.
  serverExternalPackages: ["better-sqlite3", "@prisma/adapter-better-sqlite3", "pg", "@prisma/adapter-pg"],
  poweredByHeader: false,
  // A separate build folder lets a second build (e.g. a browser-test run) proceed beside a dev server.
  distDir: process.env.MELTLEDGER_DIST_DIR || ".next",
  typescript: { ignoreBuildErrors: false },
  async headers() {
    return [{ source: "/:path*", headers: SECURITY_HEADERS }];
  },
};
export default nextConfig;
