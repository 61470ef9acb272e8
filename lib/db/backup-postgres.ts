/**
 * Backups of a PostgreSQL database with PostgreSQL's own tools: `pg_dump --format=custom` taken
 * inside a snapshot this module exports (so the row counts, table digests and stored-file list of
 * the manifest are read from exactly the data the dump holds), and `pg_restore --single-transaction`
 * into a fresh schema. The tools come with PostgreSQL's client package (Debian/Ubuntu:
 * postgresql-client); their absence is reported with how to install them.
 */
import { execFile, spawn } from "node:child_process";
import { COPY_ORDER } from "./copy-to-postgres";
import type { PostgresClient } from "./postgres";

export const PG_TOOLS_MISSING =
  "is not installed or not on PATH. Backups of a PostgreSQL database use PostgreSQL's own pg_dump and pg_restore: install the client tools of the server's major version or newer (Debian/Ubuntu: apt-get install postgresql-client; Fedora: dnf install postgresql; macOS: brew install libpq) and run the command again.";

/** A pg_dump or pg_restore that could not run or failed: the message says which and why. */
export class PgToolError extends Error {
  constructor(
    message: string,
    readonly kind: "missing" | "failed",
  ) {
    super(message);
    this.name = "PgToolError";
  }
}

/**
 * The URL without its password, and the password for PGPASSWORD: a password on a command line
 * can be read by anyone on the machine (`ps`), the environment of a child process cannot.
 */
export function connectionForTools(url: string): { url: string; env: NodeJS.ProcessEnv } {
  const parsed = new URL(url);
  const env: NodeJS.ProcessEnv = { ...process.env };
  if (parsed.password) {
    env.PGPASSWORD = decodeURIComponent(parsed.password);
    parsed.password = "";
  }
  return { url: parsed.toString(), env };
}

function run(tool: "pg_dump" | "pg_restore", args: string[], env: NodeJS.ProcessEnv): Promise<string> {
  return new Promise((resolve, reject) => {
    const child = spawn(tool, args, { env, stdio: ["ignore", "pipe", "pipe"] });
    let out = "";
    let err = "";
    child.stdout.on("data", (d) => (out += d));
    child.stderr.on("data", (d) => (err += d));
    child.on("error", (e) => reject((e as NodeJS.ErrnoException).code === "ENOENT" ? new PgToolError(`${tool} ${PG_TOOLS_MISSING}`, "missing") : e));
    child.on("close", (code) => (code === 0 ? resolve(out) : reject(new PgToolError(`${tool} failed (exit ${code}): ${err.trim().split("\n").slice(-3).join(" ") || "no message"}`, "failed"))));
  });
}

/** The version line of a tool ("pg_dump (PostgreSQL) 17.6"), or a PgToolError when it is missing. */
export function pgToolVersion(tool: "pg_dump" | "pg_restore"): Promise<string> {
  return new Promise((resolve, reject) => {
    execFile(tool, ["--version"], (error, stdout) => {
      if ((error as NodeJS.ErrnoException | null)?.code === "ENOENT") reject(new PgToolError(`${tool} ${PG_TOOLS_MISSING}`, "missing"));
      else if (error) reject(new PgToolError(`${tool} --version failed: ${error.message}`, "failed"));
      else resolve(stdout.trim());
    });
  });
}

/** One table's row count and a SHA-256 over its rows in one canonical order (the rows' text, by bytes). */
export interface TableDigest {
  table: string;
  rows: number;
  sha256: string;
}

/**
 * Count and digest of every Meltledger table. A row's text form (`t::text`) is PostgreSQL's own
 * and fixed for a schema, and rows are ordered by it byte-wise (COLLATE "C"), so the same rows give
 * the same digest in any database of the same schema.
 */
export async function tableDigests(client: PostgresClient): Promise<TableDigest[]> {
  const out: TableDigest[] = [];
  for (const table of COPY_ORDER) {
    const r = await client.query<{ rows: string; sha256: string }>(
      `SELECT COUNT(*) AS rows, encode(sha256(convert_to(COALESCE(string_agg(t::text, E'\\n' ORDER BY t::text COLLATE "C"), ''), 'UTF8')), 'hex') AS sha256 FROM "${table}" t`,
    );
    out.push({ table, rows: Number(r.rows[0]!.rows), sha256: r.rows[0]!.sha256 });
  }
  return out;
}

/** Applied migrations, by name. */
export async function appliedMigrations(client: PostgresClient): Promise<string[]> {
  const exists = await client.query(`SELECT 1 FROM information_schema.tables WHERE table_schema = current_schema() AND table_name = '_prisma_migrations'`);
  if (exists.rowCount === 0) return [];
  return (await client.query<{ name: string }>(`SELECT migration_name AS name FROM "_prisma_migrations" WHERE finished_at IS NOT NULL ORDER BY migration_name`)).rows.map((r) => r.name);
}

/** SHA-256 names of the stored files the database refers to. */
export async function storedFileShas(client: PostgresClient): Promise<string[]> {
  return (await client.query<{ sha256: string }>(`SELECT "sha256" FROM "StoredFile" ORDER BY "sha256" COLLATE "C"`)).rows.map((r) => r.sha256);
}

export interface SnapshotFacts {
  migrations: string[];
  tables: TableDigest[];
  storedFiles: string[];
  serverVersion: string;
  pgDumpVersion: string;
}

/**
 * Dumps the database into `file` (pg_dump's custom format) from a snapshot exported by a
 * REPEATABLE READ transaction held open meanwhile, and reads the manifest's facts in that same
 * transaction: whatever the server writes meanwhile, both see the same data.
 */
export async function dumpPostgres(client: PostgresClient, url: string, file: string): Promise<SnapshotFacts> {
  const pgDumpVersion = await pgToolVersion("pg_dump");
  await client.query("BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY");
  try {
    const snapshot = (await client.query<{ id: string }>("SELECT pg_export_snapshot() AS id")).rows[0]!.id;
    const tools = connectionForTools(url);
    const dumped = run("pg_dump", ["--format=custom", "--no-owner", "--no-privileges", `--snapshot=${snapshot}`, `--file=${file}`, `--dbname=${tools.url}`], tools.env);
    const facts = (async () => ({
      migrations: await appliedMigrations(client),
      tables: await tableDigests(client),
      storedFiles: await storedFileShas(client),
      serverVersion: (await client.query<{ v: string }>("SELECT current_setting('server_version') AS v")).rows[0]!.v,
    }))();
    // both run in parallel: the snapshot lives only as long as this transaction
    const [read] = await Promise.all([facts, dumped]);
    return { ...read, pgDumpVersion };
  } finally {
    await client.query("COMMIT").catch(() => undefined);
  }
}

/** True when the archive is one pg_restore can read (its table of contents lists). */
export async function checkArchive(file: string): Promise<void> {
  await run("pg_restore", ["--list", file], process.env);
}

/** Tables in the current schema and how many rows they hold in all (without the migration log). */
export async function schemaContents(client: PostgresClient): Promise<{ schema: string; tables: number; rows: Record<string, number> }> {
  const schema = (await client.query<{ s: string }>("SELECT current_schema() AS s")).rows[0]!.s;
  const names = (await client.query<{ name: string }>(`SELECT table_name AS name FROM information_schema.tables WHERE table_schema = $1 AND table_type = 'BASE TABLE' ORDER BY table_name`, [schema])).rows.map((r) => r.name);
  const rows: Record<string, number> = {};
  for (const name of names) {
    if (name === "_prisma_migrations") continue;
    const n = Number((await client.query<{ n: string }>(`SELECT COUNT(*) AS n FROM "${name.replace(/"/g, '""')}"`)).rows[0]!.n);
    if (n > 0) rows[name] = n;
  }
  return { schema, tables: names.length, rows };
}

/**
 * Restores `file` into the current schema, which must hold no tables: the old schema is renamed
 * aside first (kept, never dropped) and an empty one made in its place. pg_restore runs as one
 * transaction, so a failure leaves the new schema empty; it is then removed and the old one put back.
 * Returns the name the old schema was kept under, or null when there were no tables to keep.
 */
export async function restorePostgres(client: PostgresClient, url: string, file: string, keepAs: string): Promise<string | null> {
  await pgToolVersion("pg_restore");
  const { schema, tables } = await schemaContents(client);
  const q = (s: string) => `"${s.replace(/"/g, '""')}"`;
  let kept: string | null = null;
  if (tables > 0) {
    await client.query("BEGIN");
    await client.query(`ALTER SCHEMA ${q(schema)} RENAME TO ${q(keepAs)}`);
    await client.query(`CREATE SCHEMA ${q(schema)}`);
    await client.query("COMMIT");
    kept = keepAs;
  }
  const tools = connectionForTools(url);
  try {
    await run("pg_restore", ["--no-owner", "--no-privileges", "--single-transaction", "--exit-on-error", `--dbname=${tools.url}`, file], tools.env);
  } catch (error) {
    if (kept) {
      await client.query("BEGIN");
      await client.query(`DROP SCHEMA ${q(schema)}`); // empty: the restore ran as one transaction and rolled back
      await client.query(`ALTER SCHEMA ${q(kept)} RENAME TO ${q(schema)}`);
      await client.query("COMMIT");
    }
    throw error;
  }
  return kept;
}
