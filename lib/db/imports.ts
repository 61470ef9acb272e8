import { prismaReady } from "./client";
import type { SqlExecutor } from "./sql";

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
  at: Date;
}

/** Records one import run (inside the import's transaction when it commits); returns its id. */
export async function insertImportRun(db: SqlExecutor, r: ImportRunWrite): Promise<number> {
  const { lastInsertId } = await db.run(
    `INSERT INTO "ImportRun" ("fileName", "fileSha256", "format", "sheet", "mapping", "sourceId", "rowCount", "importedCount", "excludedCount", "status", "createdById", "createdAt") VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING "id"`,
    [r.fileName, r.fileSha256, r.format, r.sheet, JSON.stringify(r.mapping ?? {}), r.sourceId, r.rowCount, r.importedCount, r.excludedCount, r.status, r.createdById, r.at],
  );
  return lastInsertId!;
}

export async function finishImportRun(db: SqlExecutor, id: number, counts: { rowCount: number; importedCount: number; excludedCount: number }): Promise<void> {
  await db.run(`UPDATE "ImportRun" SET "rowCount" = ?, "importedCount" = ?, "excludedCount" = ? WHERE "id" = ?`, [counts.rowCount, counts.importedCount, counts.excludedCount, id]);
}

/** Well below both engines' limits on parameters in one statement (SQLite 32766, PostgreSQL 65535). */
const LOOKUP_CHUNK = 500;

/** Source ids by normalized DOI, for the DOIs given (those in the collection). */
export async function sourceIdsByDoi(db: SqlExecutor, dois: readonly string[]): Promise<Map<string, number>> {
  const out = new Map<string, number>();
  const unique = [...new Set(dois)];
  for (let i = 0; i < unique.length; i += LOOKUP_CHUNK) {
    const chunk = unique.slice(i, i + LOOKUP_CHUNK);
    const rows = await db.all<{ id: number; doi: string }>(`SELECT "id", "doi" FROM "Source" WHERE "doi" IN (${chunk.map(() => "?").join(", ")})`, chunk);
    for (const r of rows) out.set(r.doi, r.id);
  }
  return out;
}

/** The source known only by a web address (no DOI), if one. */
export async function sourceIdByUrl(db: SqlExecutor, url: string): Promise<number | null> {
  const row = await db.get<{ id: number }>(`SELECT "id" FROM "Source" WHERE "doi" IS NULL AND "url" = ? ORDER BY "id" LIMIT 1`, [url]);
  return row?.id ?? null;
}

export async function sourceExists(db: SqlExecutor, id: number): Promise<boolean> {
  return (await db.get(`SELECT 1 AS "one" FROM "Source" WHERE "id" = ?`, [id])) !== undefined;
}

/** The ids among those given that name no source. */
export async function missingSourceIds(db: SqlExecutor, ids: Iterable<number>): Promise<number[]> {
  const unique = [...new Set(ids)];
  const found = new Set<number>();
  for (let i = 0; i < unique.length; i += LOOKUP_CHUNK) {
    const chunk = unique.slice(i, i + LOOKUP_CHUNK);
    for (const r of await db.all<{ id: number }>(`SELECT "id" FROM "Source" WHERE "id" IN (${chunk.map(() => "?").join(", ")})`, chunk)) found.add(r.id);
  }
  return unique.filter((id) => !found.has(id));
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
export async function insertPlaceholderSource(db: SqlExecutor, s: PlaceholderSource, actorId: number | null, at: Date): Promise<number> {
  const { lastInsertId } = await db.run(
    `INSERT INTO "Source" ("kind", "title", "titleKey", "doi", "url", "notes", "createdById", "updatedById", "createdAt", "updatedAt") VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING "id"`,
    [s.kind, s.title, s.titleKey, s.doi, s.url, s.notes, actorId, actorId, at, at],
  );
  return lastInsertId!;
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

/** Named presets and, when a source is given, that source's presets; the source's first (NULLs last on both engines). */
export async function listMappingPresets(sourceId: number | null): Promise<MappingPresetRow[]> {
  const db = await prismaReady();
  const rows = await db.mappingPreset.findMany({
    where: sourceId === null ? { sourceId: null } : { OR: [{ sourceId: null }, { sourceId }] },
    orderBy: [{ sourceId: { sort: "desc", nulls: "last" } }, { name: "asc" }, { id: "asc" }],
  });
  return rows.map((r) => ({ ...r, mapping: parseMapping(r.mapping) }));
}

export async function getMappingPreset(id: number): Promise<MappingPresetRow | null> {
  const db = await prismaReady();
  const r = await db.mappingPreset.findUnique({ where: { id } });
  return r ? { ...r, mapping: parseMapping(r.mapping) } : null;
}
