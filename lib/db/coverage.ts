/**
 * The points of a coverage selection: one query on the covering filter index, only the columns the
 * coverage view needs, handed over column by column (typed arrays, NaN for a missing value) so
 * 100k records cost one index scan and no per-row objects.
 */
import type { Statement } from "better-sqlite3";
import { sqlite, type SqliteDatabase } from "./connection";
import { RECORD_FILTER_INDEX } from "./records";

export interface NumberRange {
  min: number | null;
  max: number | null;
}

export interface CoverageSelection {
  /** One alloy key, or null for every alloy. */
  alloyKey: string | null;
  statuses: readonly string[];
  hatchSpacingUm?: NumberRange | null;
  layerThicknessUm?: NumberRange | null;
  spotDiameterUm?: NumberRange | null;
}

export interface SelectionColumns {
  length: number;
  laserPowerW: Float64Array;
  scanSpeedMmPerS: Float64Array;
  hatchSpacingUm: Float64Array;
  layerThicknessUm: Float64Array;
  spotDiameterUm: Float64Array;
  volumetricEnergyJMm3: Float64Array;
  outcome: string[];
  sourceId: Int32Array;
}

/** The WHERE clause of a selection; exported for the benchmark's bare-query baseline. */
export function coverageWhere(sel: CoverageSelection): { sql: string; params: unknown[] } {
  const parts: string[] = [];
  const params: unknown[] = [];
  if (sel.statuses.length) {
    parts.push(`status IN (${sel.statuses.map(() => "?").join(",")})`);
    params.push(...sel.statuses);
  }
  if (sel.alloyKey !== null) {
    parts.push("alloyKey = ?");
    params.push(sel.alloyKey);
  }
  for (const [column, range] of [["hatchSpacingUm", sel.hatchSpacingUm], ["layerThicknessUm", sel.layerThicknessUm], ["spotDiameterUm", sel.spotDiameterUm]] as const) {
    if (!range) continue;
    if (range.min !== null) {
      parts.push(`${column} >= ?`);
      params.push(range.min);
    }
    if (range.max !== null) {
      parts.push(`${column} <= ?`);
      params.push(range.max);
    }
  }
  return { sql: parts.length ? `WHERE ${parts.join(" AND ")}` : "", params };
}

export const COVERAGE_COLUMNS = "laserPowerW, scanSpeedMmPerS, hatchSpacingUm, layerThicknessUm, spotDiameterUm, volumetricEnergyJMm3, outcome, sourceId";

const cache = new WeakMap<SqliteDatabase, Map<string, Statement<unknown[]>>>();
function prepared(db: SqliteDatabase, sql: string): Statement<unknown[]> {
  let m = cache.get(db);
  if (!m) cache.set(db, (m = new Map()));
  let s = m.get(sql);
  if (!s) m.set(sql, (s = db.prepare(sql).raw(true)));
  return s;
}

const num = (v: unknown) => (typeof v === "number" ? v : Number.NaN);

/**
 * Every record of the selection, column by column, in index order. Every column read is in the
 * covering filter index, so SQLite never visits the table rows.
 *
 * @example
 * selectCoveragePoints({ alloyKey: "316L", statuses: ["accepted"], hatchSpacingUm: { min: 80, max: 120 } }).length;
 */
export function selectCoveragePoints(sel: CoverageSelection, db: SqliteDatabase = sqlite()): SelectionColumns {
  const where = coverageWhere(sel);
  const rows = prepared(db, `SELECT ${COVERAGE_COLUMNS} FROM BuildRecord INDEXED BY ${RECORD_FILTER_INDEX} ${where.sql}`).all(...where.params) as unknown[][];
  const n = rows.length;
  const out: SelectionColumns = {
    length: n,
    laserPowerW: new Float64Array(n),
    scanSpeedMmPerS: new Float64Array(n),
    hatchSpacingUm: new Float64Array(n),
    layerThicknessUm: new Float64Array(n),
    spotDiameterUm: new Float64Array(n),
    volumetricEnergyJMm3: new Float64Array(n),
    outcome: new Array<string>(n),
    sourceId: new Int32Array(n),
  };
  for (let i = 0; i < n; i++) {
    const r = rows[i]!;
    out.laserPowerW[i] = num(r[0]);
    out.scanSpeedMmPerS[i] = num(r[1]);
    out.hatchSpacingUm[i] = num(r[2]);
    out.layerThicknessUm[i] = num(r[3]);
    out.spotDiameterUm[i] = num(r[4]);
    out.volumetricEnergyJMm3[i] = num(r[5]);
    out.outcome[i] = String(r[6]);
    out.sourceId[i] = Number(r[7]);
  }
  return out;
}

/** id, year and title of the given sources, for labels. */
export function sourceTitles(ids: readonly number[], db: SqliteDatabase = sqlite()): { id: number; year: number | null; title: string }[] {
  if (!ids.length) return [];
  return db.prepare(`SELECT id, year, title FROM Source WHERE id IN (${ids.map(() => "?").join(",")})`).all(...ids) as { id: number; year: number | null; title: string }[];
}
