import type { SqliteDatabase } from "./connection";

/** One stored version of a settings key; versions are only ever added. */
export interface SettingsVersionRow {
  id: number;
  key: string;
  value: unknown;
  createdById: number | null;
  createdByName: string | null;
  createdAt: string;
}

interface RawRow {
  id: number;
  key: string;
  value: string;
  createdById: number | null;
  createdByName: string | null;
  createdAt: string;
}

function toRow(r: RawRow): SettingsVersionRow {
  let value: unknown = {};
  try {
    value = JSON.parse(r.value);
  } catch {
    value = {};
  }
  return { ...r, value };
}

const SELECT = `SELECT s.id, s.key, s.value, s.createdById, u.name AS createdByName, s.createdAt FROM SettingsVersion s LEFT JOIN User u ON u.id = s.createdById`;

/** The newest version of a key, or null when none was saved yet. */
export function latestSettingsVersion(db: SqliteDatabase, key: string): SettingsVersionRow | null {
  const r = db.prepare(`${SELECT} WHERE s.key = ? ORDER BY s.id DESC LIMIT 1`).get(key) as RawRow | undefined;
  return r ? toRow(r) : null;
}

/** A version by id (of the given key), or null. */
export function getSettingsVersion(db: SqliteDatabase, key: string, id: number): SettingsVersionRow | null {
  const r = db.prepare(`${SELECT} WHERE s.key = ? AND s.id = ?`).get(key, id) as RawRow | undefined;
  return r ? toRow(r) : null;
}

/** Versions of a key, newest first. */
export function listSettingsVersions(db: SqliteDatabase, key: string, limit = 50): SettingsVersionRow[] {
  return (db.prepare(`${SELECT} WHERE s.key = ? ORDER BY s.id DESC LIMIT ?`).all(key, limit) as RawRow[]).map(toRow);
}

/** Adds a version inside the caller's transaction; returns its id. */
export function insertSettingsVersion(db: SqliteDatabase, key: string, value: unknown, actorId: number | null, at: string): number {
  return Number(db.prepare(`INSERT INTO SettingsVersion (key, value, createdById, createdAt) VALUES (?, ?, ?, ?)`).run(key, JSON.stringify(value), actorId, at).lastInsertRowid);
}
