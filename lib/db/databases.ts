/**
 * The database DATABASE_URL names, as a whole, on either engine: bringing its schema up to this
 * version, and closing every connection this process holds to it. Callers above lib/db use these
 * rather than the engine's own runner or connection.
 */
import { disconnectPrisma } from "./client";
import { closeSqlite, sqlite } from "./connection";
import { resolveDatabaseTarget, type DatabaseEngine } from "./location";
import { migrate, type MigrationResult } from "./migrate";
import { migratePostgres } from "./migrate-postgres";
import { describeConnectionError, isPostgresConnectionError, withPostgres } from "./postgres";
import { closeSql } from "./sql";

export interface MigrationsSummary extends MigrationResult {
  engine: DatabaseEngine;
  /** The SQLite file, or the PostgreSQL server's URL with its password hidden. */
  filePath: string;
}

/** The database server could not be reached or refused the login; the message names it (no password). */
export class DatabaseUnreachableError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "DatabaseUnreachableError";
  }
}

/**
 * Applies the pending migrations of the engine DATABASE_URL selects: prisma/migrations on a SQLite
 * file (through the process's raw connection), prisma/postgres/migrations on a PostgreSQL server
 * (through a connection of its own, closed after). A server that cannot be reached is a
 * DatabaseUnreachableError; a migration that fails or was edited after it was applied, a
 * MigrationError.
 */
export async function applyMigrations(): Promise<MigrationsSummary> {
  const target = resolveDatabaseTarget();
  if (target.engine === "sqlite") return { filePath: target.filePath, engine: "sqlite", ...migrate(sqlite()) };
  try {
    const r = await withPostgres(target.url, (client) => migratePostgres(client));
    return { filePath: target.redactedUrl, engine: "postgresql", ...r };
  } catch (error) {
    if (isPostgresConnectionError(error)) throw new DatabaseUnreachableError(`${describeConnectionError(target.url, error)}.`);
    throw error;
  }
}

/**
 * Closes every connection and pool this process holds, on either engine: the PostgreSQL pools and
 * SQLite read-only connections of sql(), the Prisma client, and the raw SQLite connections. For a
 * command's exit (an open pool would keep the process alive until its idle connections time out)
 * and before a database is moved aside or replaced. The next query opens them again.
 */
export async function closeDatabases(): Promise<void> {
  await closeSql();
  await disconnectPrisma();
  closeSqlite();
}
