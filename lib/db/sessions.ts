import type { SqlExecutor } from "./sql";

/** A session joined with its user, as the per-request check reads it. */
export interface SessionUserRow {
  sessionId: string;
  /** ISO 8601 UTC with milliseconds. */
  expiresAt: string;
  userId: number;
  name: string;
  role: string;
  disabled: boolean;
}

// Sessions are read on every request in team mode: one indexed lookup through sql() (on SQLite the
// raw connection's cached statement, on PostgreSQL one pooled query).
// The id stored is the SHA-256 of the cookie's token, so a copy of the database cannot log anyone in.

export async function insertSession(db: SqlExecutor, s: { id: string; userId: number; createdAt: Date; expiresAt: Date }): Promise<void> {
  await db.run(`INSERT INTO "Session" ("id", "userId", "createdAt", "expiresAt") VALUES (?, ?, ?, ?)`, [s.id, s.userId, s.createdAt, s.expiresAt]);
}

export async function findSessionUser(db: SqlExecutor, id: string): Promise<SessionUserRow | null> {
  const row = await db.get<SessionUserRow>(
    `SELECT s."id" AS "sessionId", s."expiresAt" AS "expiresAt", u."id" AS "userId", u."name" AS "name", u."role" AS "role", u."disabled" AS "disabled"
       FROM "Session" s JOIN "User" u ON u."id" = s."userId" WHERE s."id" = ?`,
    [id],
  );
  return row ?? null;
}

export async function deleteSession(db: SqlExecutor, id: string): Promise<void> {
  await db.run(`DELETE FROM "Session" WHERE "id" = ?`, [id]);
}

/**
 * Removes sessions that expired at or before `now`, compared as instants. SQLite holds timestamps
 * as text whose forms do not all compare with each other, so the instants are compared in
 * JavaScript and the expired ids deleted by key (sessions are few: one per login).
 */
export async function deleteExpiredSessions(db: SqlExecutor, now: Date): Promise<number> {
  const rows = await db.all<{ id: string; expiresAt: string }>(`SELECT "id", "expiresAt" AS "expiresAt" FROM "Session" ORDER BY "id"`);
  let n = 0;
  for (const r of rows) if (Date.parse(r.expiresAt) <= now.getTime()) n += (await db.run(`DELETE FROM "Session" WHERE "id" = ?`, [r.id])).changes;
  return n;
}
