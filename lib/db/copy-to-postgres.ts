/**
 * Copies every table of a SQLite database into an empty, migrated PostgreSQL database in one
 * transaction, keeping every id, then proves the copy: the row count and a SHA-256 over the rows
 * in key order must be equal on both sides, or the transaction is rolled back.
 *
 * Both hashes are taken over the same canonical form of each value, built from the PostgreSQL
 * column type: integers and floats as JavaScript prints them (shortest round-trip form), booleans
 * as true/false, timestamps as ISO 8601 UTC with milliseconds (Prisma keeps DateTime as UTC in
 * TIMESTAMP(3)), text as it is, NULL as null. The source side is read from SQLite and converted,
 * the target side read back from PostgreSQL: a lost row, a truncated value or a shifted time
 * changes the hash.
 */
import { createHash } from "node:crypto";
import pg from "pg";
import { appliedMigrationNames, storedFileShasOf } from "./backup-sqlite";
import { openSqlite, type SqliteDatabase } from "./connection";
import type { PostgresClient } from "./postgres";

/** Every table of the schema, parents before children, so foreign keys hold after each insert. */
export const COPY_ORDER = [
  "User",
  "Session",
  "Source",
  "StoredFile",
  "SourceDocument",
  "Material",
  "MaterialComponent",
  "ImportRun",
  "BuildRecord",
  "MappingPreset",
  "Flag",
  "PairDecision",
  "AuditEvent",
  "SettingsVersion",
  "AlloyPropertyOverride",
  "ExportRun",
  "SuggestionSet",
] as const;

export type PgColumnType = "integer" | "double precision" | "boolean" | "timestamp without time zone" | "text";
const KNOWN_TYPES = new Set<string>(["integer", "double precision", "boolean", "timestamp without time zone", "text"]);

/** A refusal or a failed check: the message names the table, row and column, and what to do. */
export class CopyError extends Error {
  constructor(
    message: string,
    readonly kind: "not_empty" | "schema_mismatch" | "bad_value" | "verification_failed",
    readonly details: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = "CopyError";
  }
}

export interface TableCopyReport {
  table: string;
  sourceRows: number;
  targetRows: number;
  sourceSha256: string;
  targetSha256: string;
}

interface TablePlan {
  table: string;
  /** Column names in a fixed order (sorted), the same on both sides. */
  columns: string[];
  types: PgColumnType[];
  primaryKey: string;
  serial: boolean;
}

type Canonical = string | number | boolean | null;

const q = (name: string) => `"${name.replace(/"/g, '""')}"`;

function sqliteTables(source: SqliteDatabase): string[] {
  return (source.prepare(`SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND name <> '_prisma_migrations' ORDER BY name`).all() as { name: string }[]).map((r) => r.name);
}

async function plan(source: SqliteDatabase, target: PostgresClient): Promise<TablePlan[]> {
  const tables = sqliteTables(source);
  const expected = [...COPY_ORDER].sort();
  const missing = expected.filter((t) => !tables.includes(t));
  const extra = tables.filter((t) => !expected.includes(t as (typeof COPY_ORDER)[number]));
  if (missing.length || extra.length) {
    throw new CopyError(
      `The SQLite database does not have this version's tables${missing.length ? ` (missing: ${missing.join(", ")})` : ""}${extra.length ? ` (unknown: ${extra.join(", ")})` : ""}. Run \`meltledger db migrate\` on it with this version first.`,
      "schema_mismatch",
      { missing, extra },
    );
  }
  const pgColumns = (
    await target.query<{ table_name: string; column_name: string; data_type: string; column_default: string | null }>(
      `SELECT table_name, column_name, data_type, column_default FROM information_schema.columns WHERE table_schema = current_schema()`,
    )
  ).rows;
  const plans: TablePlan[] = [];
  for (const table of COPY_ORDER) {
    const sqliteCols = source.prepare(`PRAGMA table_info(${q(table)})`).all() as { name: string; pk: number }[];
    const pgCols = pgColumns.filter((c) => c.table_name === table);
    if (pgCols.length === 0) throw new CopyError(`The PostgreSQL database has no table "${table}": it is not migrated to this version.`, "schema_mismatch", { table });
    const a = sqliteCols.map((c) => c.name).sort();
    const b = pgCols.map((c) => c.column_name).sort();
    if (a.join("\u0001") !== b.join("\u0001")) {
      throw new CopyError(`Table "${table}" has different columns on the two sides (SQLite: ${a.filter((x) => !b.includes(x)).join(", ") || "—"} only; PostgreSQL: ${b.filter((x) => !a.includes(x)).join(", ") || "—"} only). Migrate both with the same Meltledger version.`, "schema_mismatch", { table });
    }
    const pks = sqliteCols.filter((c) => c.pk > 0);
    if (pks.length !== 1) throw new CopyError(`Table "${table}" has ${pks.length} primary key columns; the copy expects exactly one.`, "schema_mismatch", { table });
    const types = a.map((name) => {
      const t = pgCols.find((c) => c.column_name === name)!.data_type;
      if (!KNOWN_TYPES.has(t)) throw new CopyError(`Column "${table}"."${name}" has the PostgreSQL type ${t}, which the copy does not handle.`, "schema_mismatch", { table, column: name });
      return t as PgColumnType;
    });
    const pk = pks[0]!.name;
    const pkDefault = pgCols.find((c) => c.column_name === pk)!.column_default;
    plans.push({ table, columns: a, types, primaryKey: pk, serial: typeof pkDefault === "string" && pkDefault.startsWith("nextval(") });
  }
  return plans;
}

function badValue(table: string, id: unknown, column: string, value: unknown, what: string): CopyError {
  const shown = typeof value === "string" ? JSON.stringify(value.length > 60 ? `${value.slice(0, 60)}…` : value) : String(value);
  return new CopyError(
    `Table "${table}", row ${JSON.stringify(id)}, column "${column}": ${shown} is not ${what}. Correct that row in the SQLite database (or report it if Meltledger wrote it); nothing was written to PostgreSQL.`,
    "bad_value",
    { table, id, column },
  );
}

/** Parses a SQLite DateTime as Prisma's adapter writes it (ISO 8601 text, "YYYY-MM-DD HH:MM:SS" from CURRENT_TIMESTAMP, or Unix milliseconds); UTC throughout. */
function sqliteDate(value: unknown): Date | null {
  if (typeof value === "number" || typeof value === "bigint") {
    const d = new Date(Number(value));
    return Number.isNaN(d.getTime()) ? null : d;
  }
  if (typeof value !== "string") return null;
  const m = /^(\d{4}-\d{2}-\d{2})[T ](\d{2}:\d{2}:\d{2}(?:\.\d+)?)(Z|[+-]\d{2}:?\d{2})?$/.exec(value.trim());
  if (!m) return null;
  const d = new Date(`${m[1]}T${m[2]}${m[3] ?? "Z"}`);
  return Number.isNaN(d.getTime()) ? null : d;
}

/** A SQLite value in the canonical form for the PostgreSQL column type; throws CopyError when it cannot be one. */
function fromSqlite(type: PgColumnType, value: unknown, where: { table: string; id: unknown; column: string }): Canonical {
  if (value === null || value === undefined) return null;
  const fail = (what: string) => badValue(where.table, where.id, where.column, value, what);
  switch (type) {
    case "integer": {
      const n = typeof value === "bigint" ? Number(value) : value;
      // PostgreSQL INTEGER is 32-bit signed
      if (typeof n !== "number" || !Number.isInteger(n) || n < -2147483648 || n > 2147483647) throw fail("a 32-bit integer");
      return n;
    }
    case "double precision": {
      const n = typeof value === "bigint" ? Number(value) : value;
      if (typeof n !== "number" || Number.isNaN(n)) throw fail("a number");
      return n;
    }
    case "boolean":
      if (value === 0 || value === 1 || value === 0n || value === 1n) return Number(value) === 1;
      throw fail("a boolean (0 or 1)");
    case "timestamp without time zone": {
      const d = sqliteDate(value);
      if (!d) throw fail("a date and time");
      return d.toISOString();
    }
    case "text": {
      const s = typeof value === "number" || typeof value === "bigint" ? String(value) : value;
      if (typeof s !== "string") throw fail("text");
      if (s.includes("\u0000")) throw fail("text PostgreSQL can store (it holds a NUL character, which PostgreSQL text refuses)");
      return s;
    }
  }
}

/** A value read back from PostgreSQL (timestamps as their text, see TARGET_TYPES) in the canonical form. */
function fromPostgres(type: PgColumnType, value: unknown): Canonical {
  if (value === null || value === undefined) return null;
  if (type === "timestamp without time zone") return new Date(`${String(value).replace(" ", "T")}Z`).toISOString();
  if (type === "integer" || type === "double precision") return Number(value);
  return value as Canonical;
}

// pg turns TIMESTAMP (OID 1114) into a Date in the process's local time zone; read its text
// instead and treat it as UTC, as Prisma does.
const TIMESTAMP_OID = 1114;
const TARGET_TYPES = {
  getTypeParser: (oid: number, format?: "text" | "binary") => {
    if (oid === TIMESTAMP_OID) return (text: string) => text;
    return pg.types.getTypeParser(oid, format);
  },
};

function rowLine(values: Canonical[]): string {
  // JSON keeps strings, numbers, booleans and null apart; non-finite floats are spelled out
  return `${JSON.stringify(values.map((v) => (typeof v === "number" && !Number.isFinite(v) ? { float: String(v) } : v)))}\n`;
}

// PostgreSQL takes at most 65535 parameters in one statement (its wire protocol counts them in 16 bits)
const MAX_PARAMETERS = 65_535;

async function copyTable(source: SqliteDatabase, target: PostgresClient, p: TablePlan, batchRows: number): Promise<{ rows: number; sha256: string }> {
  const hash = createHash("sha256");
  const perBatch = Math.max(1, Math.min(batchRows, Math.floor(MAX_PARAMETERS / p.columns.length)));
  const insertHead = `INSERT INTO ${q(p.table)} (${p.columns.map(q).join(", ")}) VALUES `;
  let batch: Canonical[][] = [];
  let rows = 0;
  const flush = async () => {
    if (batch.length === 0) return;
    const params: Canonical[] = [];
    const tuples = batch.map((values) => `(${values.map((v) => `$${params.push(v)}`).join(", ")})`);
    const first = batch[0]![p.columns.indexOf(p.primaryKey)];
    const last = batch[batch.length - 1]![p.columns.indexOf(p.primaryKey)];
    try {
      await target.query(insertHead + tuples.join(", "), params);
    } catch (error) {
      throw new CopyError(`Writing table "${p.table}" (rows ${JSON.stringify(first)} to ${JSON.stringify(last)}) to PostgreSQL failed: ${(error as Error).message}. Nothing was written.`, "bad_value", { table: p.table, from: first, to: last });
    }
    batch = [];
  };
  const stmt = source.prepare(`SELECT ${p.columns.map(q).join(", ")} FROM ${q(p.table)} ORDER BY ${q(p.primaryKey)}`).raw(true);
  const pkIndex = p.columns.indexOf(p.primaryKey);
  // the SQLite statement stays open across the awaits below; nothing else uses this connection meanwhile
  for (const raw of stmt.iterate() as IterableIterator<unknown[]>) {
    const id = raw[pkIndex];
    const values = raw.map((v, i) => fromSqlite(p.types[i]!, v, { table: p.table, id, column: p.columns[i]! }));
    hash.update(rowLine(values));
    batch.push(values);
    rows++;
    if (batch.length >= perBatch) await flush();
  }
  await flush();
  return { rows, sha256: hash.digest("hex") };
}

async function hashTarget(target: PostgresClient, p: TablePlan, pageRows: number): Promise<{ rows: number; sha256: string }> {
  const hash = createHash("sha256");
  const pkIndex = p.columns.indexOf(p.primaryKey);
  // "C" collation orders text keys by bytes, as SQLite's BINARY collation does
  const key = p.types[pkIndex] === "text" ? `${q(p.primaryKey)} COLLATE "C"` : q(p.primaryKey);
  const select = `SELECT ${p.columns.map(q).join(", ")} FROM ${q(p.table)}`;
  let rows = 0;
  let last: unknown = undefined;
  for (;;) {
    const page = await target.query({
      text: `${select}${last === undefined ? "" : ` WHERE ${key} > $1`} ORDER BY ${key} LIMIT ${pageRows}`,
      values: last === undefined ? [] : [last],
      rowMode: "array",
      types: TARGET_TYPES,
    });
    for (const raw of page.rows as unknown[][]) hash.update(rowLine(raw.map((v, i) => fromPostgres(p.types[i]!, v))));
    rows += page.rows.length;
    if (page.rows.length < pageRows) break;
    last = (page.rows[page.rows.length - 1] as unknown[])[pkIndex];
  }
  return { rows, sha256: hash.digest("hex") };
}

/** Row counts of every table in COPY_ORDER that has rows. */
export async function nonEmptyTables(target: PostgresClient): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const t of COPY_ORDER) {
    const n = Number((await target.query<{ n: string }>(`SELECT COUNT(*) AS n FROM ${q(t)}`)).rows[0]!.n);
    if (n > 0) out[t] = n;
  }
  return out;
}

export interface CopyOptions {
  /** Rows per INSERT statement (capped by PostgreSQL's parameter limit); default 1000. */
  batchRows?: number;
  /** Rows per query when reading the copy back (keyset pages keep memory flat however large a table is); default 5000. */
  readPageRows?: number;
  /** Called after each table is written and read back. */
  onTable?: (report: TableCopyReport) => void;
  /** Runs after the rows are written and verified, before COMMIT; a throw rolls everything back (the stored files are copied here). */
  beforeCommit?: (reports: TableCopyReport[]) => Promise<void>;
}

/**
 * Copies `source` (read in one read transaction, so a running server's writes do not tear it)
 * into `target`, which must hold this version's migrated, empty tables. All or nothing: one
 * PostgreSQL transaction, the tables locked against other writers, sequences moved past the
 * copied ids, counts and hashes checked before COMMIT.
 */
export async function copySqliteToPostgres(source: SqliteDatabase, target: PostgresClient, options: CopyOptions = {}): Promise<TableCopyReport[]> {
  const plans = await plan(source, target);
  source.exec("BEGIN");
  try {
    await target.query("BEGIN");
    try {
      await target.query(`LOCK TABLE ${COPY_ORDER.map(q).join(", ")} IN EXCLUSIVE MODE`);
      const filled = await nonEmptyTables(target);
      if (Object.keys(filled).length > 0) {
        throw new CopyError(
          `The PostgreSQL database already holds data (${Object.entries(filled).map(([t, n]) => `${t}: ${n} row(s)`).join(", ")}). \`db copy\` only fills an empty database: give a new, empty one.`,
          "not_empty",
          { rows: filled },
        );
      }
      const reports: TableCopyReport[] = [];
      for (const p of plans) {
        const copied = await copyTable(source, target, p, options.batchRows ?? 1000);
        if (p.serial) {
          // the next id is one past the largest copied id (or 1 for an empty table)
          await target.query(`SELECT setval(pg_get_serial_sequence($1, $2), COALESCE((SELECT MAX(${q(p.primaryKey)}) FROM ${q(p.table)}), 1), (SELECT COUNT(*) > 0 FROM ${q(p.table)}))`, [q(p.table), p.primaryKey]);
        }
        const back = await hashTarget(target, p, Math.max(1, options.readPageRows ?? 5000));
        const report = { table: p.table, sourceRows: copied.rows, targetRows: back.rows, sourceSha256: copied.sha256, targetSha256: back.sha256 };
        reports.push(report);
        options.onTable?.(report);
      }
      const differing = reports.filter((r) => r.sourceRows !== r.targetRows || r.sourceSha256 !== r.targetSha256);
      if (differing.length > 0) {
        throw new CopyError(`The copy did not verify: ${differing.map((r) => `${r.table} (${r.sourceRows} rows in SQLite, ${r.targetRows} in PostgreSQL${r.sourceSha256 !== r.targetSha256 ? ", hashes differ" : ""})`).join("; ")}. Nothing was written.`, "verification_failed", { tables: differing });
      }
      await options.beforeCommit?.(reports);
      await target.query("COMMIT");
      return reports;
    } catch (error) {
      await target.query("ROLLBACK").catch(() => undefined);
      throw error;
    }
  } finally {
    source.exec("COMMIT");
  }
}

/** The SQLite file `db copy` reads from, open read-only while the copy runs. */
export interface SqliteCopySource {
  /** The file's applied migrations (finished, not rolled back), by name. */
  appliedMigrations(): string[];
  /** SHA-256 names of the stored files the database refers to, in order. */
  storedFileShas(): string[];
  /** copySqliteToPostgres from this file. */
  copyTo(target: PostgresClient, options?: CopyOptions): Promise<TableCopyReport[]>;
}

/** Opens the SQLite file `filePath` read-only (it must exist), runs `body` with it and closes it, whatever `body` does. */
export async function withSqliteSource<T>(filePath: string, body: (source: SqliteCopySource) => Promise<T>): Promise<T> {
  const db = openSqlite(filePath, { readonly: true });
  try {
    return await body({
      appliedMigrations: () => appliedMigrationNames(db),
      storedFileShas: () => storedFileShasOf(db),
      copyTo: (target, options) => copySqliteToPostgres(db, target, options),
    });
  } finally {
    db.close();
  }
}
