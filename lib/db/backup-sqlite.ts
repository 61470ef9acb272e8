/**
 * Backups of a SQLite database, the twin of backup-postgres.ts: a snapshot through SQLite's online
 * backup API (better-sqlite3's `db.backup()`, which copies the database page by page and starts
 * over when another connection writes meanwhile, so the copy holds whole transactions only and the
 * server may keep writing), and the manifest's facts read from that snapshot file itself.
 * Restore puts a snapshot file in place of the database file, moving its write-ahead log along.
 */
import { existsSync, renameSync } from "node:fs";
import Database from "better-sqlite3";
import { sqlite, type SqliteDatabase } from "./connection";

/** Tables whose row counts a SQLite backup's manifest records (those the snapshot holds). */
export const SQLITE_COUNTED_TABLES = ["BuildRecord", "Source", "Flag", "AuditEvent", "User", "StoredFile", "SourceDocument", "ImportRun"] as const;

/** What a SQLite backup's manifest records, read from the snapshot. */
export interface SqliteSnapshotFacts {
  /** SQLite's integrity_check answer: "ok", or its findings joined by "; ". */
  integrity: string;
  counts: Record<string, number>;
  /** Applied migrations, by name. */
  migrations: string[];
  /** SHA-256 names of the stored files the snapshot refers to. */
  storedFiles: string[];
}

/**
 * The snapshot could not be written for a reason of the disk or the folder (full, read-only, not
 * openable, an I/O error, or a file-system error): `cause` is the error as thrown, so the caller
 * can say where and why. Any other error of the backup is thrown as it is.
 */
export class SnapshotWriteError extends Error {
  constructor(override readonly cause: unknown) {
    super((cause as Error)?.message ?? String(cause));
    this.name = "SnapshotWriteError";
  }
}

const hasTable = (db: SqliteDatabase, name: string) => db.prepare(`SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = ?`).get(name) !== undefined;

function countsOf(db: SqliteDatabase): Record<string, number> {
  const out: Record<string, number> = {};
  for (const t of SQLITE_COUNTED_TABLES) {
    if (hasTable(db, t)) out[t] = (db.prepare(`SELECT COUNT(*) AS n FROM "${t}"`).get() as { n: number }).n;
  }
  return out;
}

function integrityOf(db: SqliteDatabase): string {
  const rows = db.pragma("integrity_check") as { integrity_check: string }[];
  return rows.map((r) => r.integrity_check).join("; ");
}

/** Applied migrations of a SQLite database, by name: finished and not rolled back, as the migration runner counts them. */
export function appliedMigrationNames(db: SqliteDatabase): string[] {
  if (!hasTable(db, "_prisma_migrations")) return [];
  return (db.prepare(`SELECT migration_name AS name FROM _prisma_migrations WHERE finished_at IS NOT NULL AND rolled_back_at IS NULL ORDER BY migration_name`).all() as { name: string }[]).map((r) => r.name);
}

/** SHA-256 names of the stored files a SQLite database refers to, in order. */
export function storedFileShasOf(db: SqliteDatabase): string[] {
  if (!hasTable(db, "StoredFile")) return [];
  return (db.prepare(`SELECT sha256 FROM StoredFile ORDER BY sha256`).all() as { sha256: string }[]).map((r) => r.sha256);
}

/** Runs `body` on the SQLite file `file` opened read-only (it must exist), closing it whatever happens. */
function withSnapshot<T>(file: string, body: (db: SqliteDatabase) => T): T {
  const db = new Database(file, { readonly: true, fileMustExist: true });
  try {
    return body(db);
  } finally {
    db.close();
  }
}

/** The facts a manifest records about the SQLite file `file` (a snapshot, opened read-only). */
export function sqliteSnapshotFacts(file: string): SqliteSnapshotFacts {
  return withSnapshot(file, (db) => ({ integrity: integrityOf(db), counts: countsOf(db), migrations: appliedMigrationNames(db), storedFiles: storedFileShasOf(db) }));
}

/** SQLite's integrity_check of the file `file` (opened read-only): "ok" when whole. */
export function sqliteFileIntegrity(file: string): string {
  return withSnapshot(file, integrityOf);
}

/**
 * Writes a snapshot of the database DATABASE_URL names (a SQLite file) to `file` with the online
 * backup API, then reads the manifest's facts from the snapshot. A failure to write it that lies
 * with the disk or folder is a SnapshotWriteError.
 */
export async function snapshotSqlite(file: string): Promise<SqliteSnapshotFacts> {
  try {
    await sqlite().backup(file);
  } catch (e) {
    const code = (e as { code?: unknown } | null)?.code;
    // SQLite's own errors other than a full, unopenable, read-only or failing disk are not the folder's fault
    if (typeof code === "string" && code.startsWith("SQLITE_") && !/FULL|CANTOPEN|READONLY|IOERR/.test(code)) throw e;
    throw new SnapshotWriteError(e);
  }
  return sqliteSnapshotFacts(file);
}

/**
 * Renames a SQLite database file and its write-ahead log and shared-memory files (`-wal`, `-shm`,
 * where present) to `to`: the log may hold committed transactions the main file does not yet.
 */
export function moveSqliteFile(from: string, to: string): void {
  renameSync(from, to);
  for (const suffix of ["-wal", "-shm"]) if (existsSync(from + suffix)) renameSync(from + suffix, to + suffix);
}
