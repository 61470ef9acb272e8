import type { Prisma } from "../generated/prisma/client";
import type { NormalizedQuantities } from "../schemas/record";
import type { RecordsQuery, RecordSortKey } from "../schemas/records-query";
import { prismaReady } from "./client";
import type { DatabaseEngine } from "./location";
import { sqliteNullOrder, type SqlExecutor, type SqlValue } from "./sql";

type Tx = Prisma.TransactionClient;

/** Everything stored for a record, in canonical units. */
export interface RecordWrite extends Omit<NormalizedQuantities, "enteredValues"> {
  enteredValues: NormalizedQuantities["enteredValues"];
  sourceId: number;
  locationPage: number | null;
  locationLabel: string | null;
  materialId: number;
  alloyKey: string;
  machine: string | null;
  spotDefinition: string | null;
  atmosphere: string | null;
  scanStrategy: string | null;
  outcome: string;
  outcomeText: string | null;
  status: string;
  qualityScore: number | null;
  importRunId?: number | null;
  importFile?: string | null;
  importRow?: number | null;
}

export interface RecordRow extends RecordWrite {
  id: number;
  version: number;
  mergedIntoId: number | null;
  createdById: number | null;
  updatedById: number | null;
  createdAt: Date;
  updatedAt: Date;
}

/** The columns of a record that an edit may change, with the JSON column serialized. */
function toColumns(r: RecordWrite) {
  return {
    sourceId: r.sourceId, locationPage: r.locationPage, locationLabel: r.locationLabel, materialId: r.materialId, alloyKey: r.alloyKey,
    machine: r.machine, laserPowerW: r.laserPowerW, scanSpeedMmPerS: r.scanSpeedMmPerS, hatchSpacingUm: r.hatchSpacingUm,
    layerThicknessUm: r.layerThicknessUm, spotDiameterUm: r.spotDiameterUm, spotDefinition: r.spotDefinition, preheatC: r.preheatC,
    atmosphere: r.atmosphere, scanStrategy: r.scanStrategy, powderD10Um: r.powderD10Um, powderD50Um: r.powderD50Um,
    powderD90Um: r.powderD90Um, outcome: r.outcome, outcomeText: r.outcomeText, relativeDensityPct: r.relativeDensityPct,
    volumetricEnergyJMm3: r.volumetricEnergyJMm3, enteredValues: JSON.stringify(r.enteredValues), status: r.status,
    qualityScore: r.qualityScore, importRunId: r.importRunId ?? null, importFile: r.importFile ?? null, importRow: r.importRow ?? null,
  };
}

type DbRecord = Prisma.BuildRecordGetPayload<object>;

function toRow(r: DbRecord): RecordRow {
  let entered: RecordWrite["enteredValues"] = {};
  try {
    entered = JSON.parse(r.enteredValues) as RecordWrite["enteredValues"];
  } catch {
    entered = {};
  }
  return { ...r, enteredValues: entered };
}

export async function insertRecord(tx: Tx, r: RecordWrite, actorId: number | null): Promise<RecordRow> {
  const created = await tx.buildRecord.create({ data: { ...toColumns(r), createdById: actorId, updatedById: actorId } });
  return toRow(created);
}

export async function getRecordTx(tx: Tx, id: number): Promise<RecordRow | null> {
  const r = await tx.buildRecord.findUnique({ where: { id } });
  return r ? toRow(r) : null;
}

/** Writes the edit only when the stored version is the one the editor saw; null means a conflict. */
export async function updateRecordIfVersion(tx: Tx, id: number, version: number, r: Partial<RecordWrite>, actorId: number | null): Promise<RecordRow | null> {
  const data: Record<string, unknown> = { ...r };
  if (r.enteredValues) data.enteredValues = JSON.stringify(r.enteredValues);
  const { count } = await tx.buildRecord.updateMany({ where: { id, version }, data: { ...data, updatedById: actorId, version: { increment: 1 } } });
  if (count === 0) return null;
  return toRow(await tx.buildRecord.findUniqueOrThrow({ where: { id } }));
}

export interface RecordDetail extends RecordRow {
  source: { id: number; title: string; year: number | null; doi: string | null; kind: string };
  material: { id: number; designation: string; alloyKey: string; basis: string; compositionKind: string; components: { element: string; amount: number; isBalance: boolean }[] };
}

export async function getRecordDetail(id: number): Promise<RecordDetail | null> {
  const db = await prismaReady();
  const r = await db.buildRecord.findUnique({
    where: { id },
    include: {
      source: { select: { id: true, title: true, year: true, doi: true, kind: true } },
      material: { select: { id: true, designation: true, alloyKey: true, basis: true, compositionKind: true, components: { select: { element: true, amount: true, isBalance: true }, orderBy: { amount: "desc" } } } },
    },
  });
  if (!r) return null;
  const { source, material, ...rest } = r;
  return { ...toRow(rest), source, material };
}

// ---------------------------------------------------------------------------------------------
// The records table: hand-written SQL on the indexed columns, because a page over 100k rows must
// stay within a few milliseconds of the bare query (see bench/). Engine-neutral (sql.ts).

const SORT_COLUMN: Record<RecordSortKey, string> = {
  id: `r."id"`, alloyKey: `r."alloyKey"`, sourceId: `r."sourceId"`, laserPowerW: `r."laserPowerW"`, scanSpeedMmPerS: `r."scanSpeedMmPerS"`,
  hatchSpacingUm: `r."hatchSpacingUm"`, layerThicknessUm: `r."layerThicknessUm"`, spotDiameterUm: `r."spotDiameterUm"`,
  volumetricEnergyJMm3: `r."volumetricEnergyJMm3"`, relativeDensityPct: `r."relativeDensityPct"`, outcome: `r."outcome"`,
  status: `r."status"`, qualityScore: `r."qualityScore"`, updatedAt: `r."updatedAt"`,
};

export interface RecordTableRow {
  id: number;
  sourceId: number;
  sourceLabel: string;
  alloyKey: string;
  laserPowerW: number | null;
  scanSpeedMmPerS: number | null;
  hatchSpacingUm: number | null;
  layerThicknessUm: number | null;
  spotDiameterUm: number | null;
  volumetricEnergyJMm3: number | null;
  relativeDensityPct: number | null;
  outcome: string;
  status: string;
  qualityScore: number | null;
  machine: string | null;
  locationPage: number | null;
  locationLabel: string | null;
  importRow: number | null;
  /** ISO 8601 UTC. */
  updatedAt: string;
}

/** Builds the WHERE clause of a records query (`?` placeholders, sql.ts rules); exported for the benchmark's bare-query baseline. */
export function recordsWhere(q: RecordsQuery): { sql: string; params: SqlValue[] } {
  const parts: string[] = [];
  const params: SqlValue[] = [];
  const inList = (column: string, values: readonly SqlValue[]) => {
    if (!values.length) return;
    parts.push(`${column} IN (${values.map(() => "?").join(",")})`);
    params.push(...values);
  };
  inList(SORT_COLUMN.alloyKey, q.alloy);
  inList(SORT_COLUMN.sourceId, q.sourceId);
  inList(SORT_COLUMN.status, q.status);
  inList(SORT_COLUMN.outcome, q.outcome);
  for (const [key, range] of Object.entries(q.ranges)) {
    if (!range) continue;
    const column = SORT_COLUMN[key as RecordSortKey];
    if (range.min !== null) { parts.push(`${column} >= ?`); params.push(range.min); }
    if (range.max !== null) { parts.push(`${column} <= ?`); params.push(range.max); }
  }
  if (q.search) {
    const like = `%${q.search.replace(/[%_\\]/g, (m) => `\\${m}`)}%`;
    const asId = /^\d+$/.test(q.search) ? Number(q.search) : -1;
    parts.push(`(r."id" = ? OR r."alloyKey" ILIKE ? ESCAPE '\\' OR r."machine" ILIKE ? ESCAPE '\\' OR r."locationLabel" ILIKE ? ESCAPE '\\')`);
    params.push(asId, like, like, like);
  }
  return { sql: parts.length ? `WHERE ${parts.join(" AND ")}` : "", params };
}

export function recordsOrderBy(q: RecordsQuery, engine: DatabaseEngine): string {
  const dir = q.direction === "desc" ? "DESC" : "ASC";
  const column = SORT_COLUMN[q.sort];
  // SQLite's own NULL order (first ascending, last descending) keeps the column's index usable
  // for the sort; PostgreSQL is told to follow it. id breaks ties so pages are stable.
  return q.sort === "id" ? `ORDER BY r."id" ${dir}` : `ORDER BY ${column} ${dir}${sqliteNullOrder(engine, dir)}, r."id" ${dir}`;
}

/**
 * The index (schema.prisma, last @@index of BuildRecord) that holds every filterable column.
 * Counting through it reads a narrow index instead of the wide rows, whatever the filter; left to
 * itself SQLite's planner sometimes picks a range index and visits every matching row instead.
 */
export const RECORD_FILTER_INDEX =
  "BuildRecord_status_alloyKey_outcome_sourceId_laserPowerW_scanSpeedMmPerS_hatchSpacingUm_layerThicknessUm_spotDiameterUm_volumetricEnergyJMm3_relativeDensityPct_idx";

/** `INDEXED BY` is SQLite's alone; PostgreSQL's planner gets no hint. */
export function recordFilterIndexHint(engine: DatabaseEngine): string {
  return engine === "sqlite" ? `INDEXED BY "${RECORD_FILTER_INDEX}"` : "";
}

type PageRow = Omit<RecordTableRow, "sourceLabel"> & { sourceYear: number | null; sourceTitle: string | null; total: number };

/**
 * One page of the records table and the number of records matching its filter, read by one
 * statement: the count is an uncorrelated subquery (evaluated once) and each row's source label a
 * lookup by primary key, so the page and its total come from one snapshot on both engines without
 * a transaction — on PostgreSQL one round trip instead of five. A page past the end has no row to
 * carry the count, so then the count is read alone.
 */
export async function listRecordsPage(q: RecordsQuery, db: SqlExecutor): Promise<{ rows: RecordTableRow[]; total: number }> {
  const where = recordsWhere(q);
  const count = `SELECT COUNT(*) AS n FROM "BuildRecord" r ${recordFilterIndexHint(db.engine)} ${where.sql}`;
  const page = await db.all<PageRow>(
    `SELECT r."id", r."sourceId", r."alloyKey", r."laserPowerW", r."scanSpeedMmPerS", r."hatchSpacingUm", r."layerThicknessUm", r."spotDiameterUm",
            r."volumetricEnergyJMm3", r."relativeDensityPct", r."outcome", r."status", r."qualityScore", r."machine", r."locationPage", r."locationLabel",
            r."importRow", r."updatedAt",
            (SELECT s."year" FROM "Source" s WHERE s."id" = r."sourceId") AS "sourceYear",
            (SELECT s."title" FROM "Source" s WHERE s."id" = r."sourceId") AS "sourceTitle",
            (${count}) AS "total"
     FROM "BuildRecord" r ${where.sql} ${recordsOrderBy(q, db.engine)} LIMIT ? OFFSET ?`,
    [...where.params, ...where.params, q.pageSize, q.page * q.pageSize],
  );
  if (!page.length) return { rows: [], total: (await db.get<{ n: number }>(count, where.params))!.n };
  const rows: RecordTableRow[] = page.map((p) => ({
    id: p.id, sourceId: p.sourceId, sourceLabel: sourceLabel(p.sourceId, p.sourceYear, p.sourceTitle), alloyKey: p.alloyKey, laserPowerW: p.laserPowerW,
    scanSpeedMmPerS: p.scanSpeedMmPerS, hatchSpacingUm: p.hatchSpacingUm, layerThicknessUm: p.layerThicknessUm, spotDiameterUm: p.spotDiameterUm,
    volumetricEnergyJMm3: p.volumetricEnergyJMm3, relativeDensityPct: p.relativeDensityPct, outcome: p.outcome, status: p.status, qualityScore: p.qualityScore,
    machine: p.machine, locationPage: p.locationPage, locationLabel: p.locationLabel, importRow: p.importRow, updatedAt: p.updatedAt,
  }));
  return { rows, total: page[0]!.total };
}

/** A short "year · title" label for a source; `source N` when it is gone. */
function sourceLabel(id: number, year: number | null, title: string | null): string {
  if (title === null) return `source ${id}`;
  return `${year ?? "n.d."} · ${title.length > 60 ? `${title.slice(0, 59)}…` : title}`;
}

// ---------------------------------------------------------------------------------------------
// Bulk writes (seed, imports, figures, benchmarks), inside the caller's transaction on either engine.

const INSERT_COLUMNS = [
  "sourceId", "locationPage", "locationLabel", "materialId", "alloyKey", "machine", "laserPowerW", "scanSpeedMmPerS", "hatchSpacingUm",
  "layerThicknessUm", "spotDiameterUm", "spotDefinition", "preheatC", "atmosphere", "scanStrategy", "powderD10Um", "powderD50Um",
  "powderD90Um", "outcome", "outcomeText", "relativeDensityPct", "volumetricEnergyJMm3", "enteredValues", "status", "qualityScore",
  "importRunId", "importFile", "importRow", "createdById", "updatedById", "createdAt", "updatedAt",
] as const;

const INSERT_HEAD = `INSERT INTO "BuildRecord" (${INSERT_COLUMNS.map((c) => `"${c}"`).join(", ")}) VALUES `;
const ROW_PLACEHOLDERS = `(${INSERT_COLUMNS.map(() => "?").join(", ")})`;

/** One record's INSERT (values from recordInsertValues); the form both engines understand. */
export const RECORD_INSERT_SQL = `${INSERT_HEAD}${ROW_PLACEHOLDERS}`;

/** Who wrote a record, and when. */
export interface RecordStamp {
  actorId: number | null;
  at: Date;
}

/** Positional values for RECORD_INSERT_SQL. */
export function recordInsertValues(r: RecordWrite, actorId: number | null, at: SqlValue): SqlValue[] {
  // Straight from the record (no intermediate column object): this runs once per imported row.
  return [
    r.sourceId, r.locationPage, r.locationLabel, r.materialId, r.alloyKey, r.machine, r.laserPowerW, r.scanSpeedMmPerS, r.hatchSpacingUm,
    r.layerThicknessUm, r.spotDiameterUm, r.spotDefinition, r.preheatC, r.atmosphere, r.scanStrategy, r.powderD10Um, r.powderD50Um,
    r.powderD90Um, r.outcome, r.outcomeText, r.relativeDensityPct, r.volumetricEnergyJMm3, JSON.stringify(r.enteredValues), r.status, r.qualityScore,
    r.importRunId ?? null, r.importFile ?? null, r.importRow ?? null, actorId, actorId, at, at,
  ];
}

/**
 * Rows per multi-row INSERT on PostgreSQL: one round trip per this many records instead of one per
 * record, and their 32,000 parameters stay below the 65,535 one statement can carry (the
 * frontend/backend protocol's Bind message counts parameters in 16 bits).
 */
export const POSTGRES_INSERT_ROWS = 1000;

const multiRowSql = new Map<number, string>();
function multiRowInsert(rows: number): string {
  let text = multiRowSql.get(rows);
  if (!text) {
    text = `${INSERT_HEAD}${Array.from({ length: rows }, () => ROW_PLACEHOLDERS).join(", ")} RETURNING "id"`;
    if (multiRowSql.size > 4) multiRowSql.clear();
    multiRowSql.set(rows, text);
  }
  return text;
}

async function sqliteLastRowId(db: SqlExecutor): Promise<number> {
  return (await db.get<{ id: number }>(`SELECT last_insert_rowid() AS "id"`))!.id;
}

/**
 * Inserts records inside the caller's transaction and returns their ids in row order. `stamp` is
 * one author and time for all, or one per row (the demo scenario's history). SQLite runs one
 * cached prepared statement per row (nothing is faster there: there are no round trips);
 * PostgreSQL one multi-row INSERT … RETURNING "id" per POSTGRES_INSERT_ROWS rows.
 */
export async function insertRecords(db: SqlExecutor, rows: readonly RecordWrite[], stamp: RecordStamp | ((index: number) => RecordStamp)): Promise<number[]> {
  const stampOf = typeof stamp === "function" ? stamp : () => stamp;
  const ids: number[] = new Array(rows.length);
  if (db.engine === "sqlite") {
    // No RETURNING here: it makes SQLite's insert about three times slower (100k records 6.4 s
    // against 1.9 s on the development machine). The table's AUTOINCREMENT key gives each new row
    // an id above every id before it, so n rows whose first and last ids are n - 1 apart hold
    // every id in between, in row order.
    if (!rows.length) return ids;
    let first = 0;
    for (let i = 0; i < rows.length; i++) {
      const s = stampOf(i);
      await db.run(RECORD_INSERT_SQL, recordInsertValues(rows[i]!, s.actorId, s.at));
      if (i === 0) first = await sqliteLastRowId(db);
    }
    const last = await sqliteLastRowId(db);
    if (last - first !== rows.length - 1) throw new Error(`insertRecords: ${rows.length} rows were given ids ${first} to ${last}; another writer inserted records in between`);
    for (let i = 0; i < rows.length; i++) ids[i] = first + i;
    return ids;
  }
  for (let start = 0; start < rows.length; start += POSTGRES_INSERT_ROWS) {
    const end = Math.min(rows.length, start + POSTGRES_INSERT_ROWS);
    const params: SqlValue[] = [];
    for (let i = start; i < end; i++) {
      const s = stampOf(i);
      params.push(...recordInsertValues(rows[i]!, s.actorId, s.at));
    }
    const returned = await db.all<{ id: number }>(multiRowInsert(end - start), params);
    if (returned.length !== end - start) throw new Error(`insertRecords: ${returned.length} ids came back for ${end - start} rows`);
    // Each row draws its id from the sequence as it is inserted, in VALUES order, so ascending ids
    // are row order whatever order RETURNING lists them in (PostgreSQL does not promise one).
    const chunkIds = returned.map((r) => r.id).sort((a, b) => a - b);
    for (let i = 0; i < chunkIds.length; i++) ids[start + i] = chunkIds[i]!;
  }
  return ids;
}

// ---------------------------------------------------------------------------------------------

export interface CollectionStats {
  records: number;
  sources: number;
  byStatus: Record<string, number>;
  byAlloy: { alloyKey: string; count: number; byStatus: Record<string, number> }[];
  byOutcome: Record<string, number>;
}

/** Record counts by status, alloy and outcome, and the number of sources. Engine-neutral (sql.ts). */
export async function collectionStats(db: SqlExecutor): Promise<CollectionStats> {
  const rows = await db.all<{ alloyKey: string; status: string; n: number }>(
    `SELECT "alloyKey" AS "alloyKey", "status", COUNT(*) AS n FROM "BuildRecord" GROUP BY "alloyKey", "status" ORDER BY "alloyKey", "status"`,
  );
  const byStatus: Record<string, number> = {};
  const alloys = new Map<string, { alloyKey: string; count: number; byStatus: Record<string, number> }>();
  let records = 0;
  for (const r of rows) {
    records += r.n;
    byStatus[r.status] = (byStatus[r.status] ?? 0) + r.n;
    const a = alloys.get(r.alloyKey) ?? { alloyKey: r.alloyKey, count: 0, byStatus: {} };
    a.count += r.n;
    a.byStatus[r.status] = (a.byStatus[r.status] ?? 0) + r.n;
    alloys.set(r.alloyKey, a);
  }
  const byOutcome = Object.fromEntries((await db.all<{ outcome: string; n: number }>(`SELECT "outcome", COUNT(*) AS n FROM "BuildRecord" GROUP BY "outcome"`)).map((r) => [r.outcome, r.n]));
  const sources = (await db.get<{ n: number }>(`SELECT COUNT(*) AS n FROM "Source"`))!.n;
  // stable sort: equal counts stay in alloy order
  return { records, sources, byStatus, byAlloy: [...alloys.values()].sort((a, b) => b.count - a.count), byOutcome };
}

/** The alloy keys present in the collection, sorted. Engine-neutral (sql.ts). */
export async function distinctAlloys(db: SqlExecutor): Promise<string[]> {
  return (await db.all<{ alloyKey: string }>(`SELECT DISTINCT "alloyKey" AS "alloyKey" FROM "BuildRecord" ORDER BY "alloyKey"`)).map((r) => r.alloyKey);
}
