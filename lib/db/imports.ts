import type { SqliteDatabase } from "./connection";
import { prismaReady } from "./client";

export interface ImportRunWrite {
  fileName: string;
  fileSha256: string | null;
  format: "csv" | "xlsx" | "paste" | "pdf_table";
  sheet: string | null;
  mapping: unknown;
  sourceId: number | null;
  rowCount: number;
  importedCount: number;
  excludedCount: number;
  status: "committed" | "failed" | "cancelled";
  createdById: number | null;
  at: string;
}

/** Records one import run on the raw connection (inside the import's transaction when it commits). */
export function insertImportRunRaw(db: SqliteDatabase, r: ImportRunWrite): number {
  return Number(
    db
      .prepare(`INSERT INTO ImportRun (fileName, fileSha256, format, sheet, mapping, sourceId, rowCount, importedCount, excludedCount, status, createdById, createdAt) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`)
      .run(r.fileName, r.fileSha256, r.format, r.sheet, JSON.stringify(r.mapping ?? {}), r.sourceId, r.rowCount, r.importedCount, r.excludedCount, r.status, r.createdById, r.at).lastInsertRowid,
  );
}

export function finishImportRunRaw(db: SqliteDatabase, id: number, counts: { rowCount: number; importedCount: number; excludedCount: number }): void {
  db.prepare(`UPDATE ImportRun SET rowCount = ?, importedCount = ?, excludedCount = ? WHERE id = ?`).run(counts.rowCount, counts.importedCount, counts.excludedCount, id);
}

/** Source ids by normalized DOI, for the DOIs given. */
export function sourceIdsByDoiRaw(db: SqliteDatabase, dois: readonly string[]): Map<string, number> {
  const out = new Map<string, number>();
  const stmt = db.prepare(`SELECT id FROM Source WHERE doi = ?`);
  for (const doi of dois) {
    const row = stmt.get(doi) as { id: number } | undefined;
    if (row) out.set(doi, row.id);
  }
  return out;
}

/** The source known only by a web address (no DOI), if one. */
export function sourceIdByUrlRaw(db: SqliteDatabase, url: string): number | null {
  const row = db.prepare(`SELECT id FROM Source WHERE doi IS NULL AND url = ? ORDER BY id LIMIT 1`).get(url) as { id: number } | undefined;
  return row?.id ?? null;
}

export function sourceExistsRaw(db: SqliteDatabase, id: number): boolean {
  return db.prepare(`SELECT 1 FROM Source WHERE id = ?`).get(id) !== undefined;
}

export interface PlaceholderSource {
  kind: string;
  title: string;
  titleKey: string;
  doi: string | null;
  url: string | null;
  notes: string;
}

/** A source known only by its DOI (or web address), created by an import; completed later by a person. */
export function insertPlaceholderSourceRaw(db: SqliteDatabase, s: PlaceholderSource, actorId: number | null, at: string): number {
  return Number(
    db
      .prepare(`INSERT INTO Source (kind, title, titleKey, doi, url, notes, createdById, updatedById, createdAt, updatedAt) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`)
      .run(s.kind, s.title, s.titleKey, s.doi, s.url, s.notes, actorId, actorId, at, at).lastInsertRowid,
  );
}

export interface ImportRunRow {
  id: number;
  fileName: string;
  format: string;
  sheet: string | null;
  sourceId: number | null;
  rowCount: number;
  importedCount: number;
  excludedCount: number;
  status: string;
  createdAt: Date;
}

export async function listImportRuns(limit: number): Promise<ImportRunRow[]> {
  const db = await prismaReady();
  return db.importRun.findMany({
    orderBy: { id: "desc" },
    take: limit,
    select: { id: true, fileName: true, format: true, sheet: true, sourceId: true, rowCount: true, importedCount: true, excludedCount: true, status: true, createdAt: true },
  });
}

// ---------------------------------------------------------------------------------------------
// Mapping presets: named (sourceId null) or the last mapping used for a source.

export interface MappingPresetRow {
  id: number;
  name: string;
  sourceId: number | null;
  mapping: unknown;
  createdAt: Date;
}

function parseMapping(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return null;
  }
}

/** Saves a preset under (name, source), replacing the mapping of one with the same name and source. */
export async function saveMappingPreset(name: string, sourceId: number | null, mapping: unknown): Promise<MappingPresetRow> {
  const db = await prismaReady();
  const text = JSON.stringify(mapping);
  // SQLite lets NULLs repeat in a unique index, so a named preset is found first, not upserted
  const saved = await db.$transaction(async (tx) => {
    const existing = await tx.mappingPreset.findFirst({ where: { name, sourceId } });
    if (existing) return tx.mappingPreset.update({ where: { id: existing.id }, data: { mapping: text } });
    return tx.mappingPreset.create({ data: { name, sourceId, mapping: text } });
  });
  return { ...saved, mapping: parseMapping(saved.mapping) };
}

/** Named presets and, when a source is given, that source's presets; the source's first. */
export async function listMappingPresets(sourceId: number | null): Promise<MappingPresetRow[]> {
  const db = await prismaReady();
  const rows = await db.mappingPreset.findMany({
    where: sourceId === null ? { sourceId: null } : { OR: [{ sourceId: null }, { sourceId }] },
    orderBy: [{ sourceId: "desc" }, { name: "asc" }],
  });
  return rows.map((r) => ({ ...r, mapping: parseMapping(r.mapping) }));
}

export async function getMappingPreset(id: number): Promise<MappingPresetRow | null> {
  const db = await prismaReady();
  const r = await db.mappingPreset.findUnique({ where: { id } });
  return r ? { ...r, mapping: parseMapping(r.mapping) } : null;
}
