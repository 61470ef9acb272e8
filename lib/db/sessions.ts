import type { SqliteDatabase } from "./connection";

/** A session joined with its user, as the per-request check reads it. */
export interface SessionUserRow {
  sessionId: string;
  expiresAt: string;
  userId: number;
  name: string;
  role: string;
  disabled: boolean;
}

// Sessions are read on every request in team mode: one indexed lookup on the raw connection.
// The id stored is the SHA-256 of the cookie's token, so a copy of the database cannot log anyone in.

export function insertSession(db: SqliteDatabase, s: { id: string; userId: number; createdAt: string; expiresAt: string }): void {
  db.prepare(`INSERT INTO Session (id, userId, createdAt, expiresAt) VALUES (?, ?, ?, ?)`).run(s.id, s.userId, s.createdAt, s.expiresAt);
}

export function findSessionUser(db: SqliteDatabase, id: string): SessionUserRow | null {
  const row = db
    .prepare(`SELECT s.id AS sessionId, s.expiresAt, u.id AS userId, u.name, u.role, u.disabled FROM Session s JOIN User u ON u.id = s.userId WHERE s.id = ?`)
    .get(id) as (Omit<SessionUserRow, "disabled"> & { disabled: number }) | undefined;
  return row ? { ...row, disabled: row.disabled !== 0 } : null;
}

export function deleteSession(db: SqliteDatabase, id: string): void {
  db.prepare(`DELETE FROM Session WHERE id = ?`).run(id);
}

/** Removes sessions that expired before `nowIso` (compared as instants). */
export function deleteExpiredSessions(db: SqliteDatabase, nowMs: number): number {
  const rows = db.prepare(`SELECT id, expiresAt FROM Session`).all() as { id: string; expiresAt: string }[];
  const del = db.prepare(`DELETE FROM Session WHERE id = ?`);
  let n = 0;
  for (const r of rows) if (Date.parse(r.expiresAt) <= nowMs) n += del.run(r.id).changes;
  return n;
}
