import type { FieldErrors } from "../schemas/issues";
import { fieldErrorsOf } from "../schemas/issues";
import { NUL_MESSAGE, nulCharacterPath } from "../schemas/plain-input";
import type { z } from "zod";
import { EngineNotSupportedError } from "../db/location";
import { connectionFailureReason, isPostgresConnectionError } from "../db/postgres";

export type AppErrorCode =
  | "invalid_input"
  | "not_found"
  | "conflict"
  | "forbidden"
  | "unauthenticated"
  | "too_large"
  | "unsupported_type"
  | "unavailable"
  | "internal";

export interface AppError {
  code: AppErrorCode;
  message: string;
  details?: { fieldErrors?: FieldErrors; [key: string]: unknown };
}

export type Result<T> = { ok: true; data: T } | { ok: false; error: AppError };

export const ok = <T>(data: T): Result<T> => ({ ok: true, data });
export const fail = (code: AppErrorCode, message: string, details?: AppError["details"]): { ok: false; error: AppError } => ({
  ok: false,
  error: details ? { code, message, details } : { code, message },
});

/**
 * An input with a NUL character in any text as `invalid_input` naming the field (PostgreSQL cannot
 * store it, SQLite could: refused alike on both), or null. Use cases call it before parsing.
 */
export function nulRefusal(input: unknown): { ok: false; error: AppError } | null {
  const at = nulCharacterPath(input);
  if (at === null) return null;
  const field = at || "input";
  return fail("invalid_input", `"${field}" contains a NUL character (\\u0000), which the database cannot store; remove it. Nothing was changed.`, { fieldErrors: { [field]: [NUL_MESSAGE] } });
}

/** A zod failure as an invalid_input error with field messages. */
export function invalid(error: z.ZodError, message = "Some fields need attention."): { ok: false; error: AppError } {
  return fail("invalid_input", message, { fieldErrors: fieldErrorsOf(error) });
}

const STATUS: Record<AppErrorCode, number> = {
  invalid_input: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  unsupported_type: 415,
  unavailable: 503,
  internal: 500,
};

/** HTTP status for an error code, used at the route edge. */
export function httpStatusOf(code: AppErrorCode): number {
  return STATUS[code];
}

/** Thrown inside a transaction to abort it with a typed error; caught by the use case. */
export class AppFailure extends Error {
  constructor(readonly error: AppError) {
    super(error.message);
    this.name = "AppFailure";
  }
}

/** Runs a use case body, turning AppFailure into a result and unexpected errors into `internal`. */
export async function guard<T>(body: () => Promise<Result<T>>): Promise<Result<T>> {
  try {
    return await body();
  } catch (error) {
    if (error instanceof AppFailure) return { ok: false, error: error.error };
    if (error instanceof EngineNotSupportedError) return fail("unavailable", error.message, { engine: "postgresql" });
    const storage = storageFailure(error) ?? postgresFailure(error) ?? databaseRefusal(error);
    if (storage) return storage;
    console.error("[meltledger] unexpected error", error);
    return fail("internal", "Something went wrong on the server; nothing was changed. The error was logged.");
  }
}

/**
 * The SQLite error code of an error from better-sqlite3 (`code`), the Prisma driver adapter
 * (`cause.originalCode`) or a file-system call (`ENOSPC`, `EROFS`, …), or null.
 */
export function sqliteCodeOf(error: unknown): string | null {
  if (!error || typeof error !== "object") return null;
  const e = error as { code?: unknown; cause?: { originalCode?: unknown }; meta?: { driverAdapterError?: { cause?: { originalCode?: unknown } } } };
  // the Prisma adapter wraps the SQLite error, once (DriverAdapterError) or twice (a known request error's meta)
  const wrapped = e.cause?.originalCode ?? e.meta?.driverAdapterError?.cause?.originalCode;
  if (typeof wrapped === "string") return wrapped;
  if (typeof e.code === "string" && (e.code.startsWith("SQLITE_") || /^E[A-Z]+$/.test(e.code) || e.code === "P2034")) return e.code;
  return null;
}

/** Busy, read-only, full or unreadable storage as an `unavailable` error with a message that says which; null for anything else. */
export function storageFailure(error: unknown): { ok: false; error: AppError } | null {
  const code = sqliteCodeOf(error);
  if (!code) return null;
  if (code === "P2034" || code.startsWith("SQLITE_BUSY") || code.startsWith("SQLITE_LOCKED")) return fail("unavailable", "The database is busy; try again in a moment.");
  if (code.startsWith("SQLITE_FULL") || code === "ENOSPC" || code === "EDQUOT") return fail("unavailable", "The disk holding the database is full; nothing was changed. Free some space and try again.", { storage: "full" });
  if (code.startsWith("SQLITE_READONLY") || code === "EROFS" || code === "EACCES" || code === "EPERM") return fail("unavailable", "The database is read-only (its file, folder or disk cannot be written); nothing was changed.", { storage: "read_only" });
  if (code.startsWith("SQLITE_CANTOPEN")) return fail("unavailable", "The database file cannot be opened for writing (SQLITE_CANTOPEN): its folder or disk may be read-only, or the file is missing; nothing was changed.", { storage: "cannot_open" });
  if (code.startsWith("SQLITE_IOERR")) return fail("unavailable", `The disk reported an error while reading or writing the database (${code}); nothing was changed. Check the disk.`, { storage: "io_error" });
  return null;
}

/**
 * A PostgreSQL server that cannot be reached (or refuses the login), or transactions that kept
 * colliding after sql.ts's retries, as `unavailable`; null for anything else. The driver's message
 * names host and port, never the password.
 */
export function postgresFailure(error: unknown): { ok: false; error: AppError } | null {
  if (isPostgresConnectionError(error)) {
    return fail("unavailable", `The PostgreSQL server cannot be reached or refused the connection (${connectionFailureReason(error)}); nothing was changed. Try again when it is back.`, { engine: "postgresql" });
  }
  const code = (error as { code?: unknown } | null)?.code;
  // SQLSTATE 40001 serialization_failure, 40P01 deadlock_detected (PostgreSQL documentation, Appendix A)
  if (code === "40001" || code === "40P01") return fail("unavailable", "The database is busy with conflicting changes; try again in a moment.", { engine: "postgresql" });
  // 53300 too_many_connections (Appendix A): the server's max_connections is spent by all its clients together
  if (code === "53300") return fail("unavailable", "The PostgreSQL server has no free connection (max_connections reached); try again in a moment, or lower MELTLEDGER_PG_POOL_SIZE on the app servers sharing it.", { engine: "postgresql" });
  return null;
}

/**
 * The SQLSTATE of an error from PostgreSQL: `code` of a pg error, or the original code the Prisma
 * driver adapter keeps (`cause.originalCode`, or the known request error's `meta`), or null.
 */
export function postgresCodeOf(error: unknown): string | null {
  if (!error || typeof error !== "object") return null;
  const e = error as { code?: unknown; severity?: unknown; cause?: { originalCode?: unknown }; meta?: { driverAdapterError?: { cause?: { originalCode?: unknown } } } };
  const code = e.cause?.originalCode ?? e.meta?.driverAdapterError?.cause?.originalCode ?? (typeof e.severity === "string" ? e.code : undefined);
  return typeof code === "string" && /^[0-9A-Z]{5}$/.test(code) ? code : null;
}

/**
 * A value PostgreSQL refuses that the use case's validation let through, as `invalid_input`, and a
 * duplicate key on either engine as `conflict`, rather than `internal`; null for anything else.
 * Validation in lib/schemas and lib/server refuses these first with a message naming the field:
 * this is the net under it. SQLSTATEs from the PostgreSQL documentation, Appendix A (Error Codes).
 */
const SAME_KEY = "Something with the same key was stored at the same time; nothing was changed. Reload and try again.";

export function databaseRefusal(error: unknown): { ok: false; error: AppError } | null {
  // better-sqlite3's extended result code for a UNIQUE constraint (SQLite documentation, "Result and Error Codes")
  if (sqliteCodeOf(error) === "SQLITE_CONSTRAINT_UNIQUE") return fail("conflict", SAME_KEY, { engine: "sqlite" });
  const code = postgresCodeOf(error);
  if (!code) return null;
  // 22003 numeric_value_out_of_range: an integer beyond INTEGER (32-bit) or BIGINT, a float beyond double precision
  if (code === "22003") return fail("invalid_input", "A number is too large for the database (whole numbers such as ids and versions go up to 2,147,483,647); nothing was changed. Check the numbers you entered.", { engine: "postgresql", sqlstate: code });
  // 22P05 untranslatable_character (\u0000 in text), 22021 character_not_in_repertoire (invalid UTF-8)
  if (code === "22P05" || code === "22021") return fail("invalid_input", "The text contains a character the database cannot store (a NUL character, \\u0000, or invalid UTF-8); nothing was changed. Remove it and try again.", { engine: "postgresql", sqlstate: code });
  // 22008 datetime_field_overflow, 22007 invalid_datetime_format
  if (code === "22008" || code === "22007") return fail("invalid_input", "A date is outside the range the database can store; nothing was changed. Check the dates you entered.", { engine: "postgresql", sqlstate: code });
  // 23505 unique_violation: another request stored the same key first
  if (code === "23505") return fail("conflict", SAME_KEY, { engine: "postgresql", sqlstate: code });
  return null;
}
