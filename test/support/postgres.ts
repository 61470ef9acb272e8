// PostgreSQL for the integration tests: a fresh database per test file on the server that
// MELTLEDGER_TEST_PG_URL names (scripts/test.sh starts a throwaway one, see scripts/test-postgres.sh).
// Without that URL the PostgreSQL tests are skipped with a message saying how to run them, except
// under scripts/test.sh or CI (MELTLEDGER_TEST_PG_REQUIRED=1 or CI=true), where they fail instead.
import { randomUUID } from "node:crypto";
import pg from "pg";
import { afterAll, describe, expect, test } from "vitest";

export const HOW_TO_RUN_POSTGRES_TESTS =
  "PostgreSQL tests skipped: MELTLEDGER_TEST_PG_URL is not set. Run them with `npm test` (scripts/test.sh starts a throwaway server), " +
  "or start one with `eval \"$(bash scripts/test-postgres.sh start)\"` and run vitest in that shell (stop it with `bash scripts/test-postgres.sh stop \"$MELTLEDGER_TEST_PG_DIR\"`).";

const serverUrl = () => process.env.MELTLEDGER_TEST_PG_URL?.trim() || null;
const required = () => process.env.MELTLEDGER_TEST_PG_REQUIRED === "1" || process.env.CI === "true";

const MISSING_SERVER =
  "MELTLEDGER_TEST_PG_URL is not set, and the PostgreSQL tests are required here (MELTLEDGER_TEST_PG_REQUIRED=1 or CI=true): the PostgreSQL server did not start. See the \"[postgres]\" lines of scripts/test.sh's output.";

/**
 * `describe` when a PostgreSQL server is there; without one, `describe.skip` with a message
 * saying how to run the tests, or — where they are required — one failing test in their place
 * (a failing hook would leave the tests "skipped" in the counts).
 */
export function describePostgres(name: string, body: () => void): void {
  if (serverUrl()) describe(name, body);
  else if (required()) describe(name, () => test("a PostgreSQL server is running for these tests", () => expect.fail(MISSING_SERVER)));
  else {
    console.warn(HOW_TO_RUN_POSTGRES_TESTS);
    describe.skip(name, body);
  }
}

/** The URL of database `name` on the test server. */
function databaseUrl(name: string): string {
  const u = new URL(serverUrl()!);
  u.pathname = `/${name}`;
  return u.toString();
}

async function onServer(sql: string): Promise<void> {
  const client = new pg.Client({ connectionString: serverUrl()! });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

/**
 * Creates empty databases on the test server on request and drops them after the file's tests.
 * Use inside describePostgres.
 */
export function useTempPostgres(label: string): { createDatabase: () => Promise<string> } {
  const created: string[] = [];
  afterAll(async () => {
    if (!serverUrl()) return;
    for (const name of created) await onServer(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
  });
  return {
    createDatabase: async () => {
      if (!serverUrl()) throw new Error(MISSING_SERVER);
      const name = `meltledger_${label}_${randomUUID().slice(0, 8)}`.toLowerCase().replace(/[^a-z0-9_]/g, "_");
      await onServer(`CREATE DATABASE "${name}"`);
      created.push(name);
      return databaseUrl(name);
    },
  };
}

/** Runs `body` with one connection to `url`, closed afterwards. */
export async function withClient<T>(url: string, body: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    return await body(client);
  } finally {
    await client.end();
  }
}
