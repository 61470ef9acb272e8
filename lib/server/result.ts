import type { FieldErrors } from "../schemas/issues";
import { fieldErrorsOf } from "../schemas/issues";
import type { z } from "zod";

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
    const code = (error as { code?: string }).code;
    if (code === "SQLITE_BUSY" || code === "P2034") return fail("unavailable", "The database is busy; try again in a moment.");
    if (code === "SQLITE_READONLY" || code === "SQLITE_FULL") return fail("unavailable", "The database cannot be written (read-only or full disk); nothing was changed.");
    console.error("[meltledger] unexpected error", error);
    return fail("internal", "Something went wrong on the server; nothing was changed. The error was logged.");
  }
}
