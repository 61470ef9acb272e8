// A throwaway database on the PostgreSQL server a bench was given (BENCH_POSTGRES_URL): created
// with a random name, handed to `body` by URL, dropped afterwards whatever `body` did.
import { randomUUID } from "node:crypto";
import { withPostgres } from "../lib/db/postgres";

export async function withScratchPostgresDatabase<T>(serverUrl: string, body: (url: string) => Promise<T>): Promise<T> {
  const name = `meltledger_bench_${randomUUID().replace(/-/g, "").slice(0, 12)}`;
  const url = new URL(serverUrl);
  await withPostgres(url.toString(), (c) => c.query(`CREATE DATABASE "${name}"`));
  const admin = url.toString();
  url.pathname = `/${name}`;
  try {
    return await body(url.toString());
  } finally {
    await withPostgres(admin, (c) => c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`));
  }
}
