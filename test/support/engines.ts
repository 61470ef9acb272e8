// One test body run on both engines: a migrated temporary SQLite file always, a migrated database
// on the PostgreSQL test server when there is one (describePostgres: skipped, or failed where
// required, without it). DATABASE_URL points at the engine's database for the duration of its
// block, so code that picks its engine from the URL (sql(), prisma()) runs on it.
import Database from "better-sqlite3";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe } from "vitest";
import { disconnectPrisma } from "@/lib/db/client";
import { closeSqlite, openSqlite } from "@/lib/db/connection";
import type { DatabaseEngine } from "@/lib/db/location";
import { migrate } from "@/lib/db/migrate";
import { migratePostgres } from "@/lib/db/migrate-postgres";
import { withPostgres } from "@/lib/db/postgres";
import { closeSql } from "@/lib/db/sql";
import { describePostgres, useTempPostgres, withClient } from "./postgres";

export interface EngineDatabase {
  engine: DatabaseEngine;
  /** What DATABASE_URL is set to while the block runs. */
  url: string;
  /** Where stored files go: next to the SQLite file, or MELTLEDGER_FILES_DIR (a temporary folder) beside PostgreSQL. */
  filesDir: string;
}

/**
 * Runs `body` twice, in a block per engine. `current()` is that block's database; it is ready from
 * the block's beforeAll hooks on (create data there or in the tests). `engine` is known while the
 * tests are being collected (for test names or per-engine sizes).
 */
export function describeEachEngine(name: string, body: (current: () => EngineDatabase, engine: DatabaseEngine) => void): void {
  describe(`${name} (SQLite)`, () => {
    let dir = "";
    let current: EngineDatabase | null = null;
    beforeAll(() => {
      dir = mkdtempSync(path.join(os.tmpdir(), "meltledger-engines-"));
      const filePath = path.join(dir, "meltledger.db");
      const db = openSqlite(filePath);
      try {
        migrate(db);
      } finally {
        db.close();
      }
      current = { engine: "sqlite", url: `file:${filePath}`, filesDir: path.join(dir, "files") };
      process.env.DATABASE_URL = current.url;
    });
    afterAll(async () => {
      await releaseConnections();
      rmSync(dir, { recursive: true, force: true });
    });
    body(() => current ?? fail(), "sqlite");
  });

  describePostgres(`${name} (PostgreSQL)`, () => {
    const server = useTempPostgres("engines");
    let current: EngineDatabase | null = null;
    let filesRoot = "";
    const filesBefore = process.env.MELTLEDGER_FILES_DIR;
    beforeAll(async () => {
      const url = await server.createDatabase();
      await withPostgres(url, (client) => migratePostgres(client));
      // stored files beside a server database go to MELTLEDGER_FILES_DIR: a folder of the test's own, never ./data
      filesRoot = mkdtempSync(path.join(os.tmpdir(), "meltledger-engines-files-"));
      current = { engine: "postgresql", url, filesDir: path.join(filesRoot, "files") };
      process.env.DATABASE_URL = url;
      process.env.MELTLEDGER_FILES_DIR = current.filesDir;
    });
    // before useTempPostgres drops the database (hooks registered later run first)
    afterAll(async () => {
      await releaseConnections();
      if (filesBefore === undefined) delete process.env.MELTLEDGER_FILES_DIR;
      else process.env.MELTLEDGER_FILES_DIR = filesBefore;
      if (filesRoot) rmSync(filesRoot, { recursive: true, force: true });
    });
    body(() => current ?? fail(), "postgresql");
  });
}

async function releaseConnections(): Promise<void> {
  await closeSql();
  await disconnectPrisma();
  closeSqlite();
}

function fail(): never {
  throw new Error("describeEachEngine: the database is ready from the block's beforeAll hooks on, not while tests are being collected");
}

/** Rows for one table, column names as in the schema. */
export type TableRows = [table: string, rows: Record<string, string | number | null>[]];

/**
 * Writes rows with the engine's own driver (better-sqlite3 or pg, not lib/db), ids as given, in
 * one transaction, tables in the order listed.
 */
export async function insertRows(at: EngineDatabase, tables: readonly TableRows[]): Promise<void> {
  const statements = tables.flatMap(([table, rows]) =>
    rows.map((row) => {
      const cols = Object.keys(row);
      return { text: `INSERT INTO "${table}" (${cols.map((c) => `"${c}"`).join(", ")}) VALUES (${cols.map(() => "?").join(", ")})`, values: Object.values(row) };
    }),
  );
  if (at.engine === "sqlite") {
    const db = new Database(at.url.replace(/^file:/, ""));
    try {
      db.transaction(() => statements.forEach((s) => db.prepare(s.text).run(...s.values)))();
    } finally {
      db.close();
    }
    return;
  }
  await withClient(at.url, async (c) => {
    await c.query("BEGIN");
    for (const s of statements) {
      let n = 0;
      await c.query(s.text.replace(/\?/g, () => `$${++n}`), s.values);
    }
    await c.query("COMMIT");
  });
}
