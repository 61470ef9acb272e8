import { createHash, randomUUID } from "node:crypto";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import type { SqliteDatabase } from "./connection";

/** Folder holding prisma/<sub>/<timestamp>_<name>/migration.sql, found from this file upwards. */
function findMigrationsDir(sub: string): string {
  let dir = import.meta.dirname ?? process.cwd();
  for (let i = 0; i < 6; i++) {
    const candidate = path.join(dir, "prisma", sub);
    if (existsSync(candidate)) return candidate;
    dir = path.dirname(dir);
  }
  return path.join(process.cwd(), "prisma", sub);
}

/** SQLite migrations: prisma/migrations. */
export function defaultMigrationsDir(): string {
  return findMigrationsDir("migrations");
}

/** PostgreSQL migrations: prisma/postgres/migrations (see migrate-postgres.ts). */
export function defaultPostgresMigrationsDir(): string {
  return findMigrationsDir(path.join("postgres", "migrations"));
}

export interface MigrationFile {
  name: string;
  sql: string;
  checksum: string;
}

export function readMigrations(dir = defaultMigrationsDir()): MigrationFile[] {
  return readdirSync(dir, { withFileTypes: true })
    .filter((e) => e.isDirectory() && /^\d{14}_\w+$/.test(e.name))
    .map((e) => e.name)
    .sort()
    .map((name) => {
      const sql = readFileSync(path.join(dir, name, "migration.sql"), "utf8");
      return { name, sql, checksum: createHash("sha256").update(sql).digest("hex") };
    });
}

// The same table Prisma Migrate keeps, so its tooling reads our history.
const HISTORY_TABLE = `CREATE TABLE IF NOT EXISTS "_prisma_migrations" (
    "id"                    TEXT PRIMARY KEY NOT NULL,
    "checksum"              TEXT NOT NULL,
    "finished_at"           DATETIME,
    "migration_name"        TEXT NOT NULL,
    "logs"                  TEXT,
    "rolled_back_at"        DATETIME,
    "started_at"            DATETIME NOT NULL DEFAULT current_timestamp,
    "applied_steps_count"   INTEGER UNSIGNED NOT NULL DEFAULT 0
)`;

export interface MigrationResult {
  applied: string[];
  alreadyApplied: string[];
}

export class MigrationError extends Error {
  constructor(message: string, readonly migration: string) {
    super(message);
    this.name = "MigrationError";
  }
}

/**
 * Applies every migration not yet recorded, each in its own transaction, and records it in
 * `_prisma_migrations`. A recorded migration whose file has changed stops the run: history is
 * never rewritten silently.
 */
/**
 * Whether the history (name → checksum of finished migrations) already holds this migration; a
 * migration whose file changed after it was applied is refused. Shared by both engines' runners.
 */
export function isApplied(done: ReadonlyMap<string, string>, m: MigrationFile): boolean {
  const known = done.get(m.name);
  if (known === undefined) return false;
  if (known !== m.checksum) {
    throw new MigrationError(`Migration ${m.name} was changed after it was applied (checksum differs). Add a new migration instead of editing an applied one.`, m.name);
  }
  return true;
}

export function migrate(db: SqliteDatabase, migrations: MigrationFile[] = readMigrations(), now: () => Date = () => new Date()): MigrationResult {
  db.exec(HISTORY_TABLE);
  const done = new Map(
    (db.prepare(`SELECT migration_name, checksum FROM "_prisma_migrations" WHERE finished_at IS NOT NULL AND rolled_back_at IS NULL`).all() as { migration_name: string; checksum: string }[]).map((r) => [r.migration_name, r.checksum]),
  );
  const result: MigrationResult = { applied: [], alreadyApplied: [] };
  const record = db.prepare(`INSERT INTO "_prisma_migrations" (id, checksum, finished_at, migration_name, started_at, applied_steps_count) VALUES (?, ?, ?, ?, ?, 1)`);
  for (const m of migrations) {
    if (isApplied(done, m)) {
      result.alreadyApplied.push(m.name);
      continue;
    }
    const startedAt = now().toISOString();
    try {
      db.transaction(() => {
        db.exec(m.sql);
        record.run(randomUUID(), m.checksum, now().toISOString(), m.name, startedAt);
      })();
    } catch (error) {
      throw new MigrationError(`Migration ${m.name} failed and was rolled back: ${(error as Error).message}`, m.name);
    }
    result.applied.push(m.name);
  }
  return result;
}
