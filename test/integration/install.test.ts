// A clean `npm ci` must leave a working native SQLite addon: npm 11 skips install scripts that
// package.json does not allow, and scripts/postinstall.mjs rebuilds the addon if it is missing.
import { createRequire } from "node:module";
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, test } from "vitest";

const ROOT = path.resolve(import.meta.dirname, "../..");
const require = createRequire(import.meta.url);

describe("installation", () => {
  test("better-sqlite3's install script is allowed and Prisma's engine download is not", () => {
    const pkg = JSON.parse(readFileSync(path.join(ROOT, "package.json"), "utf8")) as { allowScripts?: Record<string, boolean> };
    expect(pkg.allowScripts?.["better-sqlite3"]).toBe(true);
    expect(pkg.allowScripts?.["@prisma/engines"]).toBe(false);
  });

  test("the native addon loads and runs SQL", () => {
    const Database = require("better-sqlite3") as typeof import("better-sqlite3");
    const db = new Database(":memory:");
    expect(db.prepare("SELECT sqlite_version() AS v").get()).toHaveProperty("v");
    db.close();
  });

  test("the generated Prisma client is present", () => {
    expect(() => readFileSync(path.join(ROOT, "lib/generated/prisma/client.ts"))).not.toThrow();
  });

  test("the PostgreSQL client is generated beside it, for the postgresql provider", () => {
    const generated = readFileSync(path.join(ROOT, "lib/generated/prisma-pg/internal/class.ts"), "utf8");
    expect(generated).toMatch(/"activeProvider":\s*"postgresql"/);
  });

  test("the pg adapter matches @prisma/client's version", () => {
    const version = (name: string) => (JSON.parse(readFileSync(path.join(ROOT, "node_modules", name, "package.json"), "utf8")) as { version: string }).version;
    expect(version("@prisma/adapter-pg")).toBe(version("@prisma/client"));
  });
});
