import path from "node:path";
import { z } from "zod";

const envSchema = z.object({
  DATABASE_URL: z.string().trim().min(1).optional(),
  MELTLEDGER_FILES_DIR: z.string().trim().min(1).optional(),
  MELTLEDGER_UPLOAD_LIMIT_MB: z.coerce.number().positive().max(2048).optional(),
  NODE_ENV: z.enum(["development", "production", "test"]).optional(),
});

export type DatabaseEngine = "sqlite" | "postgresql";

export interface DatabaseLocation {
  /** Absolute path of the SQLite file. */
  filePath: string;
  /** Folder for stored files (content-addressed), next to the database file. */
  dataDir: string;
}

/** What DATABASE_URL names: a SQLite file (the embedded default) or a PostgreSQL server. */
export type DatabaseTarget =
  | ({ engine: "sqlite" } & DatabaseLocation)
  | {
      engine: "postgresql";
      /** The connection URL as given (it may hold a password: show `redactedUrl` instead). */
      url: string;
      redactedUrl: string;
      /** Folder for stored files: MELTLEDGER_FILES_DIR, default ./data/files. */
      dataDir: string;
    };

const POSTGRES_SCHEME = /^postgres(ql)?:\/\//i;

/** The engine a database URL selects by its scheme: postgres:// or postgresql:// is PostgreSQL, anything else a SQLite file. */
export function databaseEngineOf(url: string): DatabaseEngine {
  return POSTGRES_SCHEME.test(url.trim()) ? "postgresql" : "sqlite";
}

/**
 * A URL with its password replaced by "***", for messages and logs.
 * @example redactUrl("postgresql://lab:secret@db:5432/meltledger") // "postgresql://lab:***@db:5432/meltledger"
 */
export function redactUrl(url: string): string {
  return url.replace(/^([a-z]+:\/\/[^:/@]*):[^@/]*@/i, "$1:***@");
}

/**
 * Raised where code that works on a SQLite file only (the raw SQLite connection of connection.ts,
 * and the SQLite halves of lib/db that use it) is asked to run against a PostgreSQL DATABASE_URL.
 * Everything above lib/db reaches the engine through engine-neutral functions that pick the
 * engine's own path, so this marks a SQLite-only call made on the wrong engine.
 */
export class EngineNotSupportedError extends Error {
  constructor(readonly redactedUrl: string) {
    super(`DATABASE_URL names a PostgreSQL server (${redactedUrl}), but this operation works on a SQLite file only (it opens the database file directly): run it with DATABASE_URL naming a SQLite file (file:./data/meltledger.db).`);
    this.name = "EngineNotSupportedError";
  }
}

function readEnv(env: Record<string, string | undefined>) {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    throw new TypeError(`resolveDatabaseLocation: invalid environment: ${parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}`);
  }
  return parsed.data;
}

/**
 * Reads DATABASE_URL: "file:./data/meltledger.db" or a plain path (default ./data/meltledger.db,
 * relative to the working directory) is SQLite; "postgresql://…" or "postgres://…" is PostgreSQL.
 * @example resolveDatabaseTarget({ DATABASE_URL: "postgres://db/ml" }).engine // "postgresql"
 */
export function resolveDatabaseTarget(env: Record<string, string | undefined> = process.env, cwd = process.cwd()): DatabaseTarget {
  const data = readEnv(env);
  const url = data.DATABASE_URL ?? "file:./data/meltledger.db";
  if (databaseEngineOf(url) === "postgresql") {
    return { engine: "postgresql", url, redactedUrl: redactUrl(url), dataDir: path.resolve(cwd, data.MELTLEDGER_FILES_DIR ?? "data/files") };
  }
  const raw = url.replace(/^file:(\/\/)?/, "");
  const filePath = path.resolve(cwd, raw);
  return { engine: "sqlite", filePath, dataDir: path.join(path.dirname(filePath), "files") };
}

/**
 * The SQLite file DATABASE_URL names, for the parts that work on SQLite only; throws
 * EngineNotSupportedError for a PostgreSQL URL rather than opening some other file.
 * @example resolveDatabaseLocation({ DATABASE_URL: "file:/tmp/x.db" }).filePath // "/tmp/x.db"
 */
export function resolveDatabaseLocation(env: Record<string, string | undefined> = process.env, cwd = process.cwd()): DatabaseLocation {
  const target = resolveDatabaseTarget(env, cwd);
  if (target.engine === "postgresql") throw new EngineNotSupportedError(target.redactedUrl);
  return { filePath: target.filePath, dataDir: target.dataDir };
}
