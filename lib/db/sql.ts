/**
 * One async SQL interface over both engines, for the queries that are not worth the ORM's per-row
 * cost (table pages, counts) and that must run on SQLite and on PostgreSQL alike. DATABASE_URL's
 * scheme picks the engine, as in client.ts: a file is the process's raw better-sqlite3 connection
 * (connection.ts), postgres:// or postgresql:// a pg pool.
 *
 * SQL is written once, in the dialect both engines understand, by the rules in DEVELOPERS.md
 * ("SQL for both engines"): `?` placeholders, every mixed-case identifier double-quoted, ILIKE for
 * case-insensitive matching, TRUE/FALSE for booleans, `RETURNING id` for a new row's id. The few
 * differences that cannot be written once (planner hints, NULL order) branch on `db.engine`.
 *
 * Values come back the same on both: numbers as numbers (COUNT too), BOOLEAN columns as booleans,
 * timestamp columns as ISO 8601 UTC text with milliseconds ("2026-12-01T10:00:00.000Z").
 */
import { AsyncLocalStorage } from "node:async_hooks";
import type { Statement } from "better-sqlite3";
import pg from "pg";
import { openSqlite, sqlite, type SqliteDatabase } from "./connection";
import { resolveDatabaseTarget, type DatabaseEngine } from "./location";
import { pgPoolSizes } from "./pool-size";

/** A parameter: Dates are stored as UTC timestamps, booleans as booleans (0/1 in SQLite). */
export type SqlValue = string | number | boolean | null | Date;

export interface SqlRunResult {
  /** Rows inserted, updated or deleted. */
  changes: number;
  /** The `id` of the first row a `RETURNING id` clause returned; null without one. */
  lastInsertId: number | null;
}

/** What a query can be run on: the database, or the open transaction handed to `transaction`'s body. */
export interface SqlExecutor {
  readonly engine: DatabaseEngine;
  all<T>(sql: string, params?: readonly SqlValue[]): Promise<T[]>;
  /**
   * The rows as arrays of values in the SELECT list's order (converted as `all` converts them):
   * no object per row, for reads of many rows where that cost shows (the checks' full scan).
   */
  values<T extends unknown[]>(sql: string, params?: readonly SqlValue[]): Promise<T[]>;
  get<T>(sql: string, params?: readonly SqlValue[]): Promise<T | undefined>;
  run(sql: string, params?: readonly SqlValue[]): Promise<SqlRunResult>;
}

export interface TransactionOptions {
  /** Reads only, from one consistent snapshot; a write in it fails on both engines. */
  readOnly?: boolean;
}

export interface SqlDatabase extends SqlExecutor {
  /**
   * Runs `body` in one transaction: committed when it resolves, rolled back when it throws (the
   * error is passed on). Writers are serialized as SQLite serializes them: SQLite takes the write
   * lock at BEGIN IMMEDIATE; PostgreSQL runs SERIALIZABLE and runs `body` again (up to
   * MAX_TRANSACTION_ATTEMPTS times) when the server reports a serialization failure or deadlock,
   * so `body` must do nothing but database work through `tx`. Transactions do not nest.
   */
  transaction<T>(body: (tx: SqlExecutor) => Promise<T>, options?: TransactionOptions): Promise<T>;
}

/**
 * Each round of a serialization failure lets at least one of the colliding transactions commit,
 * so this many attempts see through that many writers on one row at once.
 */
export const MAX_TRANSACTION_ATTEMPTS = 10;

export class SqlUsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "SqlUsageError";
  }
}

// ---------------------------------------------------------------------------------------------
// Writing SQL once

const WORD_START = /[A-Za-z_]/;
const WORD_PART = /[A-Za-z0-9_]/;

/**
 * The engine's form of a statement written by the shared rules: `?` becomes `$1`, `$2`, … on
 * PostgreSQL, ILIKE becomes LIKE on SQLite (whose LIKE ignores ASCII case already). String
 * literals and quoted identifiers are left as they are.
 * @example translateSql("SELECT * FROM \"Flag\" WHERE id = ? AND code ILIKE ?", "postgresql") // '… id = $1 AND code ILIKE $2'
 */
export function translateSql(sql: string, engine: DatabaseEngine): string {
  let out = "";
  let n = 0;
  let i = 0;
  while (i < sql.length) {
    const c = sql[i]!;
    if (c === "'" || c === '"') {
      let j = i + 1;
      for (; j < sql.length; j++) {
        if (sql[j] === c) {
          if (sql[j + 1] === c) j++; // doubled quote inside
          else break;
        }
      }
      if (j >= sql.length) throw new SqlUsageError(`translateSql: unterminated ${c === "'" ? "string literal" : "quoted identifier"} in: ${sql}`);
      out += sql.slice(i, j + 1);
      i = j + 1;
    } else if (c === "?") {
      out += engine === "postgresql" ? `$${++n}` : "?";
      i++;
    } else if (WORD_START.test(c) && (i === 0 || !WORD_PART.test(sql[i - 1]!))) {
      let j = i + 1;
      while (j < sql.length && WORD_PART.test(sql[j]!)) j++;
      const word = sql.slice(i, j);
      out += engine === "sqlite" && word.toUpperCase() === "ILIKE" ? "LIKE" : word;
      i = j;
    } else {
      out += c;
      i++;
    }
  }
  return out;
}

/**
 * ORDER BY suffix that puts NULLs where SQLite puts them (first ascending, last descending) on
 * PostgreSQL too, whose default is the opposite. Empty on SQLite, where an explicit NULLS clause
 * can keep the planner from sorting through an index.
 */
export function sqliteNullOrder(engine: DatabaseEngine, direction: "ASC" | "DESC"): string {
  if (engine === "sqlite") return "";
  return direction === "ASC" ? " NULLS FIRST" : " NULLS LAST";
}

/** Timestamps as text: ISO 8601 UTC with milliseconds, whichever form SQLite holds them in. */
export function canonicalTimestamp(value: unknown): string | null {
  if (value === null || value === undefined) return null;
  if (typeof value === "number") return new Date(value).toISOString();
  if (value instanceof Date) return value.toISOString();
  const m = /^(\d{4}-\d{2}-\d{2})[T ](\d{2}:\d{2}:\d{2}(?:\.\d+)?)(Z|[+-]\d{2}:?\d{2})?$/.exec(String(value).trim());
  if (!m) return String(value);
  const d = new Date(`${m[1]}T${m[2]}${m[3] ?? "Z"}`);
  return Number.isNaN(d.getTime()) ? String(value) : d.toISOString();
}

// ---------------------------------------------------------------------------------------------
// SQLite: the raw connection, behind a lock so an open async transaction has it to itself

type Conversion = { name: string; kind: "boolean" | "timestamp" };
type IndexConversion = { index: number; kind: "boolean" | "timestamp" };
interface SqliteStatement {
  stmt: Statement<unknown[]>;
  /** Columns whose declared type needs converting to the shared form; null when none does. */
  conversions: Conversion[] | null;
  /** The same by position, for rows read as arrays. */
  indexConversions: IndexConversion[] | null;
}

function convertValue(kind: "boolean" | "timestamp", v: unknown): unknown {
  return kind === "boolean" ? v === 1 || v === 1n || v === true : canonicalTimestamp(v);
}

const STATEMENT_CACHE_LIMIT = 500;

function sqliteParams(params: readonly SqlValue[]): unknown[] {
  let out: unknown[] | null = null;
  for (let i = 0; i < params.length; i++) {
    const v = params[i];
    if (typeof v === "boolean" || v instanceof Date) {
      out ??= params.slice();
      // Prisma's SQLite adapter stores DateTime as ISO text with "+00:00"; text comparisons need the same form
      out[i] = typeof v === "boolean" ? (v ? 1 : 0) : v.toISOString().replace("Z", "+00:00");
    }
  }
  return out ?? (params as unknown[]);
}

class SqliteSql implements SqlDatabase {
  readonly engine = "sqlite" as const;
  private readonly statements = new Map<string, SqliteStatement>();
  private readonly readStatements = new Map<string, SqliteStatement>();
  private readonly rawStatements = new Map<string, SqliteStatement>();
  private readonly readRawStatements = new Map<string, SqliteStatement>();
  /** Settles when the open transaction ends; null when none is open. */
  private busy: Promise<void> | null = null;
  /** The same for read-only transactions, which run on a connection of their own. */
  private readBusy: Promise<void> | null = null;
  private readDb: SqliteDatabase | null = null;
  private readonly inTransaction = new AsyncLocalStorage<true>();

  constructor(readonly db: SqliteDatabase) {}

  /**
   * A read-only connection to the same file for read-only transactions. Their body awaits between
   * statements, and the raw connection is also used synchronously by the bulk paths: a snapshot
   * left open on it could take in another caller's writes (and roll them back with its own). On a
   * connection of its own, a snapshot shares nothing; in WAL mode it never blocks a writer.
   */
  private reader(): SqliteDatabase {
    if (this.readDb?.open) return this.readDb;
    if (this.db.memory) return this.db; // an in-memory database has no second connection
    this.readDb = openSqlite(this.db.name, { readonly: true });
    this.readStatements.clear();
    this.readRawStatements.clear();
    return this.readDb;
  }

  /** Closes the read-only connection, if one was opened. */
  closeReader(): void {
    if (this.readDb?.open && this.readDb !== this.db) this.readDb.close();
    this.readDb = null;
  }

  private prepare(sql: string, on: SqliteDatabase = this.db, raw = false): SqliteStatement {
    const cache = on === this.db ? (raw ? this.rawStatements : this.statements) : raw ? this.readRawStatements : this.readStatements;
    let s = cache.get(sql);
    if (s) return s;
    const stmt = on.prepare(translateSql(sql, "sqlite"));
    let conversions: Conversion[] | null = null;
    let indexConversions: IndexConversion[] | null = null;
    if (stmt.reader) {
      stmt.columns().forEach((col, index) => {
        const type = col.type?.toUpperCase();
        const kind = type === "BOOLEAN" ? "boolean" : type === "DATETIME" ? "timestamp" : null;
        if (kind) {
          (conversions ??= []).push({ name: col.name, kind });
          (indexConversions ??= []).push({ index, kind });
        }
      });
      // raw mode is a setting of the statement: such statements are cached apart
      if (raw) stmt.raw(true);
    }
    if (cache.size >= STATEMENT_CACHE_LIMIT) cache.clear();
    s = { stmt, conversions, indexConversions };
    cache.set(sql, s);
    return s;
  }

  private convert<T>(s: SqliteStatement, row: unknown): T {
    if (!s.conversions || !row) return row as T;
    const r = row as Record<string, unknown>;
    for (const c of s.conversions) {
      const v = r[c.name];
      if (v === null || v === undefined) continue;
      r[c.name] = convertValue(c.kind, v);
    }
    return row as T;
  }

  valuesNow<T extends unknown[]>(sql: string, params: readonly SqlValue[], readOnly = false, on: SqliteDatabase = this.db): T[] {
    const s = this.prepare(sql, on, true);
    if (!s.stmt.reader) throw new SqlUsageError(`values() needs a statement that returns rows: ${sql}`);
    this.refuseWrite(s, sql, readOnly);
    const rows = s.stmt.all(...sqliteParams(params)) as unknown[][];
    if (s.indexConversions) {
      for (const row of rows) {
        for (const c of s.indexConversions) {
          const v = row[c.index];
          if (v !== null && v !== undefined) row[c.index] = convertValue(c.kind, v);
        }
      }
    }
    return rows as T[];
  }

  allNow<T>(sql: string, params: readonly SqlValue[], readOnly = false, on: SqliteDatabase = this.db): T[] {
    const s = this.prepare(sql, on);
    this.refuseWrite(s, sql, readOnly);
    const rows = s.stmt.all(...sqliteParams(params));
    if (s.conversions) for (const row of rows) this.convert(s, row);
    return rows as T[];
  }

  getNow<T>(sql: string, params: readonly SqlValue[], readOnly = false, on: SqliteDatabase = this.db): T | undefined {
    const s = this.prepare(sql, on);
    this.refuseWrite(s, sql, readOnly);
    return this.convert<T | undefined>(s, s.stmt.get(...sqliteParams(params)));
  }

  runNow(sql: string, params: readonly SqlValue[], readOnly = false, on: SqliteDatabase = this.db): SqlRunResult {
    const s = this.prepare(sql, on);
    this.refuseWrite(s, sql, readOnly);
    if (s.stmt.reader) {
      // a RETURNING clause: every changed row comes back
      const rows = s.stmt.all(...sqliteParams(params)) as { id?: unknown }[];
      const id = rows[0]?.id;
      return { changes: rows.length, lastInsertId: typeof id === "number" ? id : typeof id === "bigint" ? Number(id) : null };
    }
    return { changes: s.stmt.run(...sqliteParams(params)).changes, lastInsertId: null };
  }

  private refuseWrite(s: SqliteStatement, sql: string, readOnly: boolean) {
    if (readOnly && !s.stmt.readonly) throw new SqlUsageError(`A read-only transaction cannot run a write: ${sql}`);
  }

  /** Runs `op` now when no transaction holds the connection, else after it ends. */
  private whenFree<T>(op: () => T): Promise<T> {
    if (this.inTransaction.getStore()) {
      return Promise.reject(new SqlUsageError("A query on the database inside transaction(): use the transaction's own executor (the body's argument)."));
    }
    if (!this.busy) {
      try {
        return Promise.resolve(op());
      } catch (error) {
        return Promise.reject(error as Error);
      }
    }
    return this.busy.then(() => this.whenFree(op));
  }

  all<T>(sql: string, params: readonly SqlValue[] = []): Promise<T[]> {
    return this.whenFree(() => this.allNow<T>(sql, params));
  }

  values<T extends unknown[]>(sql: string, params: readonly SqlValue[] = []): Promise<T[]> {
    return this.whenFree(() => this.valuesNow<T>(sql, params));
  }

  get<T>(sql: string, params: readonly SqlValue[] = []): Promise<T | undefined> {
    return this.whenFree(() => this.getNow<T>(sql, params));
  }

  run(sql: string, params: readonly SqlValue[] = []): Promise<SqlRunResult> {
    return this.whenFree(() => this.runNow(sql, params));
  }

  async transaction<T>(body: (tx: SqlExecutor) => Promise<T>, options: TransactionOptions = {}): Promise<T> {
    if (this.inTransaction.getStore()) throw new SqlUsageError("transaction() inside a transaction: transactions do not nest.");
    const readOnly = options.readOnly ?? false;
    // Read-only transactions take turns on the read connection, the others on the raw one.
    const slot = readOnly ? "readBusy" : "busy";
    while (this[slot]) await this[slot];
    let release!: () => void;
    this[slot] = new Promise<void>((resolve) => (release = resolve));
    let open = true;
    try {
      const on = readOnly ? this.reader() : this.db;
      const check = () => {
        if (!open) throw new SqlUsageError("A query on a transaction that has ended.");
      };
      const tx: SqlExecutor = {
        engine: "sqlite",
        all: async <R>(sql: string, params: readonly SqlValue[] = []) => (check(), this.allNow<R>(sql, params, readOnly, on)),
        values: async <R extends unknown[]>(sql: string, params: readonly SqlValue[] = []) => (check(), this.valuesNow<R>(sql, params, readOnly, on)),
        get: async <R>(sql: string, params: readonly SqlValue[] = []) => (check(), this.getNow<R>(sql, params, readOnly, on)),
        run: async (sql: string, params: readonly SqlValue[] = []) => (check(), this.runNow(sql, params, readOnly, on)),
      };
      // IMMEDIATE takes the write lock now, so what the body reads cannot change before it writes;
      // a read-only transaction reads one WAL snapshot from its first read.
      on.exec(readOnly ? "BEGIN DEFERRED" : "BEGIN IMMEDIATE");
      try {
        const result = await this.inTransaction.run(true, () => body(tx));
        // COMMIT itself can fail (a deferred foreign key, a full disk) and leave the transaction open
        on.exec("COMMIT");
        return result;
      } catch (error) {
        if (on.inTransaction) on.exec("ROLLBACK");
        throw error;
      }
    } finally {
      open = false;
      this[slot] = null;
      release();
    }
  }
}

// ---------------------------------------------------------------------------------------------
// PostgreSQL: a pool

// pg's own parsing, except: COUNT and other BIGINT (OID 20) and NUMERIC (1700) results as numbers
// (counts stay far below 2^53); TIMESTAMP without time zone (1114) read as UTC — pg would take it
// as the process's local time — and given in the canonical text form; BOOLEAN stays boolean.
const OID = { int8: 20, numeric: 1700, timestamp: 1114 } as const;
const PG_TYPES = {
  getTypeParser: (oid: number, format?: "text" | "binary") => {
    if (oid === OID.int8 || oid === OID.numeric) return (text: string) => Number(text);
    if (oid === OID.timestamp) return (text: string) => new Date(`${text.replace(" ", "T")}Z`).toISOString();
    return pg.types.getTypeParser(oid, format);
  },
};

// SQLSTATE 40001 serialization_failure, 40P01 deadlock_detected (PostgreSQL documentation, Appendix A)
const RETRYABLE = new Set(["40001", "40P01"]);

function pgParams(params: readonly SqlValue[]): unknown[] {
  // a Date as UTC text: pg would send it in the process's local time zone, and TIMESTAMP keeps no zone
  return params.map((v) => (v instanceof Date ? v.toISOString() : v));
}

type Queryable = Pick<pg.Pool | pg.PoolClient, "query">;

class PostgresExecutor implements SqlExecutor {
  readonly engine = "postgresql" as const;
  constructor(private readonly on: Queryable) {}

  async all<T>(sql: string, params: readonly SqlValue[] = []): Promise<T[]> {
    return (await this.on.query(translateSql(sql, "postgresql"), pgParams(params))).rows as T[];
  }

  async values<T extends unknown[]>(sql: string, params: readonly SqlValue[] = []): Promise<T[]> {
    return (await this.on.query({ text: translateSql(sql, "postgresql"), values: pgParams(params), rowMode: "array" })).rows as T[];
  }

  async get<T>(sql: string, params: readonly SqlValue[] = []): Promise<T | undefined> {
    return (await this.all<T>(sql, params))[0];
  }

  async run(sql: string, params: readonly SqlValue[] = []): Promise<SqlRunResult> {
    const result = await this.on.query(translateSql(sql, "postgresql"), pgParams(params));
    const id = (result.rows[0] as { id?: unknown } | undefined)?.id;
    return { changes: result.rowCount ?? 0, lastInsertId: typeof id === "number" ? id : null };
  }
}

class PostgresSql extends PostgresExecutor implements SqlDatabase {
  private readonly inTransaction = new AsyncLocalStorage<true>();

  constructor(readonly pool: pg.Pool) {
    super(pool);
  }

  override all<T>(sql: string, params?: readonly SqlValue[]): Promise<T[]> {
    this.refuseInside();
    return super.all<T>(sql, params);
  }

  override values<T extends unknown[]>(sql: string, params?: readonly SqlValue[]): Promise<T[]> {
    this.refuseInside();
    return super.values<T>(sql, params);
  }

  override get<T>(sql: string, params?: readonly SqlValue[]): Promise<T | undefined> {
    this.refuseInside();
    return super.get<T>(sql, params);
  }

  override run(sql: string, params?: readonly SqlValue[]): Promise<SqlRunResult> {
    this.refuseInside();
    return super.run(sql, params);
  }

  // The same mistake fails on both engines (on SQLite it would wait for itself).
  private refuseInside() {
    if (this.inTransaction.getStore()) throw new SqlUsageError("A query on the database inside transaction(): use the transaction's own executor (the body's argument).");
  }

  async transaction<T>(body: (tx: SqlExecutor) => Promise<T>, options: TransactionOptions = {}): Promise<T> {
    if (this.inTransaction.getStore()) throw new SqlUsageError("transaction() inside a transaction: transactions do not nest.");
    const begin = options.readOnly ? "BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY" : "BEGIN ISOLATION LEVEL SERIALIZABLE";
    for (let attempt = 1; ; attempt++) {
      const client = await this.pool.connect();
      let open = true;
      const inner = new PostgresExecutor(client);
      const check = () => {
        if (!open) throw new SqlUsageError("A query on a transaction that has ended.");
      };
      const tx: SqlExecutor = {
        engine: "postgresql",
        all: (sql, params) => (check(), inner.all(sql, params)),
        values: (sql, params) => (check(), inner.values(sql, params)),
        get: (sql, params) => (check(), inner.get(sql, params)),
        run: (sql, params) => (check(), inner.run(sql, params)),
      };
      let broken = false;
      try {
        await client.query(begin);
        const result = await this.inTransaction.run(true, () => body(tx));
        await client.query("COMMIT");
        return result;
      } catch (error) {
        await client.query("ROLLBACK").catch(() => (broken = true));
        const code = (error as { code?: unknown }).code;
        if (typeof code === "string" && RETRYABLE.has(code) && attempt < MAX_TRANSACTION_ATTEMPTS) {
          // a short random pause, growing with the attempts, so the same transactions do not collide again
          await new Promise((resolve) => setTimeout(resolve, Math.random() * 4 * attempt));
          continue;
        }
        throw error;
      } finally {
        open = false;
        client.release(broken);
      }
    }
  }
}

// ---------------------------------------------------------------------------------------------

const globalForSql = globalThis as unknown as { meltledgerSql?: Map<string, SqlDatabase> };

/** The database DATABASE_URL names, one per process and URL. */
export function sql(): SqlDatabase {
  const target = resolveDatabaseTarget();
  const key = target.engine === "sqlite" ? `sqlite:${target.filePath}` : target.url;
  globalForSql.meltledgerSql ??= new Map();
  const cached = globalForSql.meltledgerSql.get(key);
  // the raw SQLite connection may have been closed (closeSqlite) and opened again
  if (cached && (!(cached instanceof SqliteSql) || cached.db.open)) return cached;
  if (cached instanceof SqliteSql) cached.closeReader();
  const db: SqlDatabase = target.engine === "sqlite" ? new SqliteSql(sqlite()) : postgresSql(target.url, { max: pgPoolSizes().sql });
  globalForSql.meltledgerSql.set(key, db);
  return db;
}

/** An interface over a raw SQLite connection the caller owns (tests, tools). */
export function sqliteSql(db: SqliteDatabase): SqlDatabase {
  return new SqliteSql(db);
}

/** A pooled interface to one PostgreSQL database; close it with closeSql (or pool.end). */
export function postgresSql(url: string, options: { max?: number } = {}): SqlDatabase & { pool: pg.Pool } {
  const pool = new pg.Pool({ connectionString: url, max: options.max ?? 10, application_name: "meltledger", types: PG_TYPES });
  // an error on an idle connection (server restarted) must not crash the process; the next query reports it
  pool.on("error", () => undefined);
  return new PostgresSql(pool);
}

/** Ends the PostgreSQL pools opened by sql() and SQLite's read-only connections (the raw SQLite connection closes with closeSqlite). */
export async function closeSql(): Promise<void> {
  const all = [...(globalForSql.meltledgerSql?.values() ?? [])];
  globalForSql.meltledgerSql?.clear();
  for (const db of all) {
    if (db instanceof PostgresSql) await db.pool.end();
    else if (db instanceof SqliteSql) db.closeReader();
  }
}
