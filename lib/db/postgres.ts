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

/** True when an error from pg means the server could not be reached or refused the login. */
export function isPostgresConnectionError(error: unknown): boolean {
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
