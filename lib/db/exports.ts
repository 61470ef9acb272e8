import type { Composition } from "../domain/composition";
import type { ExportRecord, ExportSource } from "../domain/export/types";
import { parseAuthors } from "./sources";
import { canonicalTimestamp, type SqlExecutor, type SqlValue } from "./sql";

/** What narrows the records read for an export before the core applies every filter itself. */
export interface ExportCandidateQuery {
  statuses: readonly string[];
  alloys: readonly string[];
  sourceIds: readonly number[];
}

async function compositions(db: SqlExecutor): Promise<Map<number, Composition>> {
  const out = new Map<number, Composition>();
  const materials = await db.all<{ id: number; basis: string }>(`SELECT "id", "basis" FROM "Material" ORDER BY "id"`);
  for (const m of materials) out.set(m.id, { basis: m.basis === "at" ? "at" : "wt", components: [] });
  const rows = await db.all<{ materialId: number; element: string; amount: number; isBalance: boolean }>(
    `SELECT "materialId" AS "materialId", "element", "amount", "isBalance" AS "isBalance" FROM "MaterialComponent" ORDER BY "materialId", "element", "id"`,
  );
  for (const c of rows) out.get(c.materialId)?.components.push({ element: c.element, amount: c.amount, isBalance: c.isBalance });
  return out;
}

const inList = (column: string, values: readonly SqlValue[], parts: string[], params: SqlValue[]) => {
  if (!values.length) return;
  parts.push(`"${column}" IN (${values.map(() => "?").join(",")})`);
  params.push(...values);
};

/**
 * A row of the export query as an array of values, in the SELECT list's order (no object per row
 * from the driver): id, sourceId, materialId, alloyKey, status, outcome, relativeDensityPct,
 * laserPowerW, scanSpeedMmPerS, hatchSpacingUm, layerThicknessUm, spotDiameterUm, preheatC,
 * powderD50Um, qualityScore, createdAt, updatedAt (timestamps as text).
 */
type ExportRow = [
  id: number, sourceId: number, materialId: number, alloyKey: string, status: string, outcome: string, relativeDensityPct: number | null,
  laserPowerW: number | null, scanSpeedMmPerS: number | null, hatchSpacingUm: number | null, layerThicknessUm: number | null,
  spotDiameterUm: number | null, preheatC: number | null, powderD50Um: number | null, qualityScore: number | null,
  createdAt: string | number, updatedAt: string | number,
];

/** Rows read per query: the driver's row objects of one page die young instead of all 100k surviving a collection. */
const PAGE_ROWS = 4096;

/**
 * Records that may enter an export (by status, alloy and source), ordered by id, with their
 * material's composition (one shared object per material). Read a page at a time by id (keyset:
 * each page is the next ids after the last one read), so call it inside a read-only transaction
 * for one consistent view. Timestamps in the canonical form (ISO 8601 UTC with milliseconds)
 * whatever the engine keeps them in, so both engines give the same records.
 */
export async function loadExportRecords(db: SqlExecutor, q: ExportCandidateQuery, pageRows = PAGE_ROWS): Promise<ExportRecord[]> {
  const parts: string[] = [];
  const params: SqlValue[] = [];
  inList("status", q.statuses, parts, params);
  inList("alloyKey", q.alloys, parts, params);
  inList("sourceId", q.sourceIds, parts, params);
  parts.push(`"id" > ?`);
  // The timestamps are read as text (CAST has no declared type, so the executor does not convert
  // them row by row) and made canonical here, once per distinct value: rows written together share them.
  const query = `SELECT "id", "sourceId", "materialId", "alloyKey", "status", "outcome", "relativeDensityPct", "laserPowerW", "scanSpeedMmPerS",
            "hatchSpacingUm", "layerThicknessUm", "spotDiameterUm", "preheatC", "powderD50Um", "qualityScore",
            CAST("createdAt" AS TEXT), CAST("updatedAt" AS TEXT)
     FROM "BuildRecord" WHERE ${parts.join(" AND ")} ORDER BY "id" LIMIT ${Math.max(1, Math.floor(pageRows))}`;
  const comps = await compositions(db);
  const iso = lastValueMemo(isoOf);
  const out: ExportRecord[] = [];
  for (let after = 0; ; ) {
    const rows = await db.values<ExportRow>(query, [...params, after]);
    // A record object of its own per row, written out as a literal: its fields live inside the
    // object, which the build reads many times over.
    for (const r of rows) {
      const c = comps.get(r[2]);
      out.push({
        id: r[0],
        sourceId: r[1],
        alloyKey: r[3],
        status: r[4],
        outcome: r[5],
        relativeDensityPct: r[6],
        laserPowerW: r[7],
        scanSpeedMmPerS: r[8],
        hatchSpacingUm: r[9],
        layerThicknessUm: r[10],
        spotDiameterUm: r[11],
        preheatC: r[12],
        powderD50Um: r[13],
        qualityScore: r[14],
        createdAt: iso(r[15]),
        updatedAt: iso(r[16]),
        composition: c && c.components.length ? c : null,
      });
    }
    if (rows.length < pageRows) break;
    after = rows[rows.length - 1]![0];
  }
  return out;
}

/** `f` remembering its last argument and result: rows written together share their timestamps. */
function lastValueMemo<A, R>(f: (a: A) => R): (a: A) => R {
  let seen = false;
  let lastArg: A;
  let lastResult: R;
  return (a) => {
    if (!seen || a !== lastArg) {
      lastArg = a;
      lastResult = f(a);
      seen = true;
    }
    return lastResult;
  };
}

/**
 * A stored timestamp in the canonical form. SQLite keeps Prisma's DateTime as ISO text (with
 * "+00:00" or "Z"), as "YYYY-MM-DD HH:MM:SS" from a column default, or as epoch milliseconds;
 * PostgreSQL's TIMESTAMP(3) as text is "YYYY-MM-DD HH:MM:SS.fff" in UTC.
 */
function isoOf(value: string | number): string {
  if (typeof value === "number" || /^\d+$/.test(value)) return new Date(Number(value)).toISOString();
  return canonicalTimestamp(value) ?? "";
}

/** Count of records in the collection (the datasheet reports what was left out of it). */
export async function countRecords(db: SqlExecutor): Promise<number> {
  return (await db.get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "BuildRecord"`))?.n ?? 0;
}

/**
 * Records with one of the statuses and, when alloys are given, one of the alloys: what the
 * export reports as left out by status and by alloy before the core sees the rest.
 */
export async function countExportCandidates(db: SqlExecutor, statuses: readonly string[], alloys: readonly string[]): Promise<number> {
  const parts: string[] = [];
  const params: SqlValue[] = [];
  if (!statuses.length) return 0;
  inList("status", statuses, parts, params);
  inList("alloyKey", alloys, parts, params);
  return (await db.get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "BuildRecord" WHERE ${parts.join(" AND ")}`, params))?.n ?? 0;
}

/** Every source, for citations. */
export async function loadExportSources(db: SqlExecutor): Promise<ExportSource[]> {
  const rows = await db.all<Omit<ExportSource, "authors"> & { authors: string }>(`SELECT "id", "kind", "title", "authors", "year", "venue", "doi", "url" FROM "Source" ORDER BY "id"`);
  return rows.map((s) => ({ ...s, authors: parseAuthors(s.authors) }));
}

export interface ExportRunRow {
  id: number;
  name: string;
  params: unknown;
  seed: number;
  counts: unknown;
  files: Record<string, string>;
  toolVersion: string;
  status: string;
  createdById: number | null;
  createdAt: string;
}

interface RawRun extends Omit<ExportRunRow, "params" | "counts" | "files" | "createdAt"> {
  params: string;
  counts: string;
  files: string;
  createdAt: string;
}

const RUN_COLUMNS = `"id", "name", "params", "seed", "counts", "files", "toolVersion" AS "toolVersion", "status", "createdById" AS "createdById", "createdAt" AS "createdAt"`;

const parse = (text: string): unknown => {
  try {
    return JSON.parse(text);
  } catch {
    return {};
  }
};
// createdAt is a timestamp column: the executor gives it in the canonical form on both engines.
const toRun = (r: RawRun): ExportRunRow => ({ ...r, params: parse(r.params), counts: parse(r.counts), files: parse(r.files) as Record<string, string> });

export interface ExportRunWrite {
  name: string;
  params: unknown;
  seed: number;
  counts: unknown;
  files: Record<string, string>;
  toolVersion: string;
  createdById: number | null;
  at: Date;
}

/** Records one export run; the caller holds the transaction (with its audit event). */
export async function insertExportRun(db: SqlExecutor, r: ExportRunWrite): Promise<number> {
  const result = await db.run(
    `INSERT INTO "ExportRun" ("name", "params", "seed", "counts", "files", "toolVersion", "status", "createdById", "createdAt") VALUES (?, ?, ?, ?, ?, ?, 'complete', ?, ?) RETURNING "id"`,
    [r.name, JSON.stringify(r.params), r.seed, JSON.stringify(r.counts), JSON.stringify(r.files), r.toolVersion, r.createdById, r.at],
  );
  if (result.lastInsertId === null) throw new Error(`The export run "${r.name}" was not recorded.`);
  return result.lastInsertId;
}

export async function getExportRun(db: SqlExecutor, name: string): Promise<ExportRunRow | null> {
  const r = await db.get<RawRun>(`SELECT ${RUN_COLUMNS} FROM "ExportRun" WHERE "name" = ?`, [name]);
  return r ? toRun(r) : null;
}

/** Names of the runs that start with `prefix`, compared exactly (no pattern, case kept) on both engines. */
export async function exportRunNamesLike(db: SqlExecutor, prefix: string): Promise<string[]> {
  const rows = await db.all<{ name: string }>(`SELECT "name" FROM "ExportRun" WHERE SUBSTR("name", 1, ?) = ? ORDER BY "id"`, [prefix.length, prefix]);
  return rows.map((r) => r.name);
}

/** Export runs, newest first. */
export async function listExportRuns(db: SqlExecutor, limit = 100): Promise<ExportRunRow[]> {
  return (await db.all<RawRun>(`SELECT ${RUN_COLUMNS} FROM "ExportRun" ORDER BY "id" DESC LIMIT ?`, [limit])).map(toRun);
}
