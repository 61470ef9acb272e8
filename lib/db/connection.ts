import Database from "better-sqlite3";
import { mkdirSync } from "node:fs";
import path from "node:path";
import { resolveDatabaseLocation } from "./location";

export type SqliteDatabase = Database.Database;

/**
 * Per-connection settings. WAL lets readers run beside one writer; foreign keys are off by default
 * in SQLite. The page cache is raised from SQLite's default of about 2 MB to 64 MiB (a negative
 * cache_size is in KiB, per the SQLite pragma documentation): a bulk import updates eleven record
 * indexes, and with the small cache their pages are evicted and read back over and over.
 */
export function applyConnectionPragmas(db: SqliteDatabase): void {
  db.pragma("journal_mode = WAL");
  db.pragma("foreign_keys = ON");
  db.pragma("busy_timeout = 10000");
  db.pragma("synchronous = NORMAL");
  db.pragma("cache_size = -65536");
}

/** Opens (creating its folder) a SQLite file with the project's pragmas. */
export function openSqlite(filePath: string, options: { readonly?: boolean } = {}): SqliteDatabase {
  if (!options.readonly) mkdirSync(path.dirname(filePath), { recursive: true });
  const db = new Database(filePath, { readonly: options.readonly ?? false, fileMustExist: options.readonly ?? false });
  try {
    if (!options.readonly) applyConnectionPragmas(db);
    else db.pragma("busy_timeout = 10000");
  } catch (error) {
    // e.g. WAL cannot be set up on a read-only disk: do not leave the handle open behind the error
    db.close();
    throw error;
  }
  return db;
}

const globalForSqlite = globalThis as unknown as { meltledgerSqlite?: Map<string, SqliteDatabase> };

/**
 * The process-wide raw connection for the file DATABASE_URL names, used by the migration runner
 * and by the bulk paths (imports, table pages, benchmarks) where the ORM's per-row cost matters.
 */
export function sqlite(): SqliteDatabase {
  const { filePath } = resolveDatabaseLocation();
  globalForSqlite.meltledgerSqlite ??= new Map();
  let db = globalForSqlite.meltledgerSqlite.get(filePath);
  if (!db || !db.open) {
    db = openSqlite(filePath);
    globalForSqlite.meltledgerSqlite.set(filePath, db);
  }
  return db;
}

/** Closes every cached raw connection (tests and CLI exit). */
export function closeSqlite(): void {
  for (const db of globalForSqlite.meltledgerSqlite?.values() ?? []) if (db.open) db.close();
  globalForSqlite.meltledgerSqlite?.clear();
}
