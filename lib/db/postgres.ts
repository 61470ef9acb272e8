import pg from "pg";
import { redactUrl } from "./location";

export type PostgresClient = pg.Client;

/**
 * Opens one connection to the PostgreSQL server a URL names, runs `body` with it and closes it,
 * whatever `body` does. For maintenance work (migrations, `db copy`); the app's queries go
 * through the Prisma client's pool (client.ts).
 */
export async function withPostgres<T>(url: string, body: (client: PostgresClient) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: url, application_name: "meltledger" });
  // an error on an idle connection (server shut down) must not crash the process; the next query reports it
  client.on("error", () => undefined);
  await client.connect();
  try {
    return await body(client);
  } finally {
    await client.end().catch(() => undefined);
  }
}

// What Prisma's pg adapter calls a failure to reach the server or be let in (@prisma/adapter-pg's
// error mapping): its DriverAdapterError names the kind in `cause`, and a known request error
// around it (code P1001 and the like) keeps that under meta.driverAdapterError.
const ADAPTER_CONNECTION_KINDS = new Set(["DatabaseNotReachable", "DatabaseDoesNotExist", "DatabaseAccessDenied", "AuthenticationFailed", "ConnectionClosed", "SocketTimeout", "TlsConnectionError"]);

function adapterConnectionKind(error: unknown): string | null {
  const e = error as { cause?: { kind?: unknown }; meta?: { driverAdapterError?: { cause?: { kind?: unknown } } } } | null;
  const kind = e?.cause?.kind ?? e?.meta?.driverAdapterError?.cause?.kind;
  return typeof kind === "string" && ADAPTER_CONNECTION_KINDS.has(kind) ? kind : null;
}

/**
 * The reason a connection failed in one line: pg's message as it is, or for Prisma's error (whose
 * message is several lines naming the call that failed) its last line ("Can't reach database
 * server at db:5432"). Neither holds the password.
 */
export function connectionFailureReason(error: unknown): string {
  const message = (error as Error | null)?.message ?? String(error);
  if (adapterConnectionKind(error) === null) return message;
  const lines = message.split("\n").map((l) => l.trim()).filter(Boolean);
  return lines.at(-1) ?? adapterConnectionKind(error)!;
}

/** True when an error from pg, or from Prisma's pg adapter, means the server could not be reached or refused the login. */
export function isPostgresConnectionError(error: unknown): boolean {
  if (adapterConnectionKind(error) !== null) return true;
  const code = (error as { code?: unknown } | null)?.code;
  // SQLSTATE class 08 = connection exception, 28 = invalid authorization, 3D000 = no such database
  // (PostgreSQL documentation, Appendix A "PostgreSQL Error Codes")
  if (typeof code === "string" && (/^(08|28)/.test(code) || code === "3D000" || code === "57P03")) return true;
  return code === "ECONNREFUSED" || code === "ENOTFOUND" || code === "ETIMEDOUT" || code === "EHOSTUNREACH" || code === "ECONNRESET";
}

/** A one-line reason for a connection failure, with the URL's password hidden. */
export function describeConnectionError(url: string, error: unknown): string {
  return `Could not connect to ${redactUrl(url)}: ${(error as Error).message}`;
}
