import type { Composition } from "../domain/composition";
import type { ExportRecord, ExportSource } from "../domain/export/types";
import type { SqliteDatabase } from "./connection";
import { parseAuthors } from "./sources";

/** What narrows the records read for an export before the core applies every filter itself. */
export interface ExportCandidateQuery {
  statuses: readonly string[];
  alloys: readonly string[];
  sourceIds: readonly number[];
}

function compositions(db: SqliteDatabase): Map<number, Composition> {
  const out = new Map<number, Composition>();
  const materials = db.prepare(`SELECT id, basis FROM Material`).all() as { id: number; basis: string }[];
  for (const m of materials) out.set(m.id, { basis: m.basis === "at" ? "at" : "wt", components: [] });
  const rows = db.prepare(`SELECT materialId, element, amount, isBalance FROM MaterialComponent ORDER BY materialId, element`).all() as { materialId: number; element: string; amount: number; isBalance: number }[];
  for (const c of rows) out.get(c.materialId)?.components.push({ element: c.element, amount: c.amount, isBalance: c.isBalance === 1 });
  return out;
}

const inList = (column: string, values: readonly unknown[], parts: string[], params: unknown[]) => {
  if (!values.length) return;
  parts.push(`${column} IN (${values.map(() => "?").join(",")})`);
  params.push(...values);
};

/**
 * Records that may enter an export (by status, alloy and source), ordered by id, with their
 * material's composition (one shared object per material).
 */
export function loadExportRecords(db: SqliteDatabase, q: ExportCandidateQuery): ExportRecord[] {
  const parts: string[] = [];
  const params: unknown[] = [];
  inList("status", q.statuses, parts, params);
  inList("alloyKey", q.alloys, parts, params);
  inList("sourceId", q.sourceIds, parts, params);
  // Raw (array) rows and one object per record built here: no intermediate object per row.
  const rows = db
    .prepare(
      `SELECT id, sourceId, materialId, alloyKey, status, outcome, relativeDensityPct, laserPowerW, scanSpeedMmPerS, hatchSpacingUm, layerThicknessUm,
              spotDiameterUm, preheatC, powderD50Um, qualityScore, createdAt, updatedAt
       FROM BuildRecord ${parts.length ? `WHERE ${parts.join(" AND ")}` : ""} ORDER BY id`,
    )
    .raw(true)
    .all(...params) as RawExportRow[];
  const comps = compositions(db);
  const iso = lastValueMemo(isoOf);
  const out: ExportRecord[] = new Array(rows.length);
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i]!;
    const c = comps.get(r[2]);
    out[i] = {
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
    };
  }
  return out;
}

/** The columns of the export query, in order. */
type RawExportRow = [
  id: number, sourceId: number, materialId: number, alloyKey: string, status: string, outcome: string, relativeDensityPct: number | null,
  laserPowerW: number | null, scanSpeedMmPerS: number | null, hatchSpacingUm: number | null, layerThicknessUm: number | null, spotDiameterUm: number | null,
  preheatC: number | null, powderD50Um: number | null, qualityScore: number | null, createdAt: string | number, updatedAt: string | number,
];

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

/** SQLite keeps Prisma's DateTime as text or as epoch milliseconds; the core reads ISO text. */
function isoOf(value: string | number): string {
  if (typeof value === "number") return new Date(value).toISOString();
  return /^\d+$/.test(value) ? new Date(Number(value)).toISOString() : value.replace(" ", "T");
}

/** Count of records in the collection (the datasheet reports what was left out of it). */
export function countRecords(db: SqliteDatabase): number {
  return (db.prepare(`SELECT COUNT(*) AS n FROM BuildRecord`).get() as { n: number }).n;
}

/** Every source, for citations. */
export function loadExportSources(db: SqliteDatabase): ExportSource[] {
  const rows = db.prepare(`SELECT id, kind, title, authors, year, venue, doi, url FROM Source ORDER BY id`).all() as (Omit<ExportSource, "authors"> & { authors: string })[];
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
  createdAt: string | number;
}

const parse = (text: string): unknown => {
  try {
    return JSON.parse(text);
  } catch {
    return {};
  }
};
const toRun = (r: RawRun): ExportRunRow => ({ ...r, params: parse(r.params), counts: parse(r.counts), files: parse(r.files) as Record<string, string>, createdAt: isoOf(r.createdAt) });

export interface ExportRunWrite {
  name: string;
  params: unknown;
  seed: number;
  counts: unknown;
  files: Record<string, string>;
  toolVersion: string;
  createdById: number | null;
  at: string;
}

/** Records one export run; the caller holds the transaction (with its audit event). */
export function insertExportRunRaw(db: SqliteDatabase, r: ExportRunWrite): number {
  return Number(
    db
      .prepare(`INSERT INTO ExportRun (name, params, seed, counts, files, toolVersion, status, createdById, createdAt) VALUES (?, ?, ?, ?, ?, ?, 'complete', ?, ?)`)
      .run(r.name, JSON.stringify(r.params), r.seed, JSON.stringify(r.counts), JSON.stringify(r.files), r.toolVersion, r.createdById, r.at).lastInsertRowid,
  );
}

export function getExportRun(db: SqliteDatabase, name: string): ExportRunRow | null {
  const r = db.prepare(`SELECT * FROM ExportRun WHERE name = ?`).get(name) as RawRun | undefined;
  return r ? toRun(r) : null;
}

export function exportRunNamesLike(db: SqliteDatabase, prefix: string): string[] {
  return (db.prepare(`SELECT name FROM ExportRun WHERE name LIKE ? ESCAPE '\\'`).all(`${prefix.replace(/[%_\\]/g, (m) => `\\${m}`)}%`) as { name: string }[]).map((r) => r.name);
}

/** Export runs, newest first. */
export function listExportRuns(db: SqliteDatabase, limit = 100): ExportRunRow[] {
  return (db.prepare(`SELECT * FROM ExportRun ORDER BY id DESC LIMIT ?`).all(limit) as RawRun[]).map(toRun);
}
