import type { SqlExecutor } from "./sql";

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

const SELECT = `SELECT s."id", s."key", s."value", s."createdById" AS "createdById", u."name" AS "createdByName", s."createdAt" AS "createdAt" FROM "SettingsVersion" s LEFT JOIN "User" u ON u."id" = s."createdById"`;

/** The newest version of a key, or null when none was saved yet. */
export async function latestSettingsVersion(db: SqlExecutor, key: string): Promise<SettingsVersionRow | null> {
  const r = await db.get<RawRow>(`${SELECT} WHERE s."key" = ? ORDER BY s."id" DESC LIMIT 1`, [key]);
  return r ? toRow(r) : null;
}

/** A version by id (of the given key), or null. */
export async function getSettingsVersion(db: SqlExecutor, key: string, id: number): Promise<SettingsVersionRow | null> {
  const r = await db.get<RawRow>(`${SELECT} WHERE s."key" = ? AND s."id" = ?`, [key, id]);
  return r ? toRow(r) : null;
}

/** Versions of a key, newest first. */
export async function listSettingsVersions(db: SqlExecutor, key: string, limit = 50): Promise<SettingsVersionRow[]> {
  return (await db.all<RawRow>(`${SELECT} WHERE s."key" = ? ORDER BY s."id" DESC LIMIT ?`, [key, limit])).map(toRow);
}

/** Adds a version inside the caller's transaction; returns its id. */
export async function insertSettingsVersion(db: SqlExecutor, key: string, value: unknown, actorId: number | null, at: string): Promise<number> {
  const r = await db.run(`INSERT INTO "SettingsVersion" ("key", "value", "createdById", "createdAt") VALUES (?, ?, ?, ?) RETURNING "id"`, [key, JSON.stringify(value), actorId, at]);
  return r.lastInsertId!;
}
