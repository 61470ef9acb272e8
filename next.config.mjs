/** @type {import('next').NextConfig} */
const nextConfig = {
  // better-sqlite3 is a native addon: load it from node_modules at run time, never bundle it.
  serverExternalPackages: ["better-sqlite3", "@prisma/adapter-better-sqlite3"],
  poweredByHeader: false,
  // A separate build folder lets a second build (e.g. a browser-test run) proceed beside a dev server.
  distDir: process.env.MELTLEDGER_DIST_DIR || ".next",
  typescript: { ignoreBuildErrors: false },
};
export default nextConfig;
