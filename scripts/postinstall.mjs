// Runs after every `npm install` / `npm ci`:
// 1. makes sure better-sqlite3's native addon exists (npm 11 may hold install scripts back);
// 2. generates the Prisma clients into lib/generated/prisma (SQLite) and lib/generated/prisma-pg (PostgreSQL).
import { execFileSync } from "node:child_process";
import { createRequire } from "node:module";
import path from "node:path";

const require = createRequire(import.meta.url);
const root = path.resolve(import.meta.dirname, "..");

function nativeAddonLoads() {
  try {
    const Database = require("better-sqlite3");
    new Database(":memory:").close();
    return true;
  } catch {
    return false;
  }
}

if (!nativeAddonLoads()) {
  console.log("[postinstall] better-sqlite3 native addon missing: building it from source");
  const pkgDir = path.dirname(require.resolve("better-sqlite3/package.json"));
  // npm tells scripts where its bundled node-gyp is; fall back to one on PATH.
  const gyp = process.env.npm_config_node_gyp;
  if (gyp) execFileSync(process.execPath, [gyp, "rebuild", "--release"], { cwd: pkgDir, stdio: "inherit" });
  else execFileSync("node-gyp", ["rebuild", "--release"], { cwd: pkgDir, stdio: "inherit" });
  if (!nativeAddonLoads()) {
    console.error("[postinstall] better-sqlite3 still does not load; see the messages above");
    process.exit(1);
  }
}

execFileSync(process.execPath, [path.join(root, "scripts/prisma-generate.mjs")], { stdio: "inherit" });
