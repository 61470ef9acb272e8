/**
 * The points of a coverage selection: one query on the covering filter index, only the columns the
 * coverage view needs, handed over column by column (typed arrays, NaN for a missing value) so
 * 100k records cost one index scan and the driver's row objects only.
 */
import { recordFilterIndexHint } from "./records";
import type { SqlExecutor, SqlValue } from "./sql";

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
export function coverageWhere(sel: CoverageSelection): { sql: string; params: SqlValue[] } {
  const parts: string[] = [];
  const params: SqlValue[] = [];
  if (sel.statuses.length) {
    parts.push(`"status" IN (${sel.statuses.map(() => "?").join(",")})`);
    params.push(...sel.statuses);
  }
  if (sel.alloyKey !== null) {
    parts.push(`"alloyKey" = ?`);
    params.push(sel.alloyKey);
  }
  for (const [column, range] of [["hatchSpacingUm", sel.hatchSpacingUm], ["layerThicknessUm", sel.layerThicknessUm], ["spotDiameterUm", sel.spotDiameterUm]] as const) {
    if (!range) continue;
    if (range.min !== null) {
      parts.push(`"${column}" >= ?`);
      params.push(range.min);
    }
    if (range.max !== null) {
      parts.push(`"${column}" <= ?`);
      params.push(range.max);
    }
  }
  return { sql: parts.length ? `WHERE ${parts.join(" AND ")}` : "", params };
}

export const COVERAGE_COLUMNS = `"laserPowerW" AS "laserPowerW", "scanSpeedMmPerS" AS "scanSpeedMmPerS", "hatchSpacingUm" AS "hatchSpacingUm", "layerThicknessUm" AS "layerThicknessUm",
  "spotDiameterUm" AS "spotDiameterUm", "volumetricEnergyJMm3" AS "volumetricEnergyJMm3", "outcome", "sourceId" AS "sourceId"`;

/**
 * The query of a selection on the engine: SQLite is told to read the covering filter index, and
 * the points come in id order on both engines (the scatter sample and a suggestion set's
 * fingerprint follow the order of the points).
 */
export function coverageSql(sel: CoverageSelection, engine: SqlExecutor["engine"]): { sql: string; params: SqlValue[] } {
  const where = coverageWhere(sel);
  return { sql: `SELECT ${COVERAGE_COLUMNS} FROM "BuildRecord" ${recordFilterIndexHint(engine)} ${where.sql} ORDER BY "id"`, params: where.params };
}

interface CoverageRow {
  laserPowerW: number | null;
  scanSpeedMmPerS: number | null;
  hatchSpacingUm: number | null;
  layerThicknessUm: number | null;
  spotDiameterUm: number | null;
  volumetricEnergyJMm3: number | null;
  outcome: string;
  sourceId: number;
}

const num = (v: number | null) => (typeof v === "number" ? v : Number.NaN);

/**
 * Every record of the selection, column by column, in id order. On SQLite every column read is
 * in the covering filter index (the id too: it is the rowid), so it never visits the table rows.
 *
 * @example
 * (await selectCoveragePoints(sql(), { alloyKey: "316L", statuses: ["accepted"], hatchSpacingUm: { min: 80, max: 120 } })).length;
 */
export async function selectCoveragePoints(db: SqlExecutor, sel: CoverageSelection): Promise<SelectionColumns> {
  const q = coverageSql(sel, db.engine);
  const rows = await db.all<CoverageRow>(q.sql, q.params);
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
    out.laserPowerW[i] = num(r.laserPowerW);
    out.scanSpeedMmPerS[i] = num(r.scanSpeedMmPerS);
    out.hatchSpacingUm[i] = num(r.hatchSpacingUm);
    out.layerThicknessUm[i] = num(r.layerThicknessUm);
    out.spotDiameterUm[i] = num(r.spotDiameterUm);
    out.volumetricEnergyJMm3[i] = num(r.volumetricEnergyJMm3);
    out.outcome[i] = String(r.outcome);
    out.sourceId[i] = Number(r.sourceId);
  }
  return out;
}

/** id, year and title of the given sources, for labels. */
export async function sourceTitles(db: SqlExecutor, ids: readonly number[]): Promise<{ id: number; year: number | null; title: string }[]> {
  if (!ids.length) return [];
  return db.all<{ id: number; year: number | null; title: string }>(`SELECT "id", "year", "title" FROM "Source" WHERE "id" IN (${ids.map(() => "?").join(",")}) ORDER BY "id"`, ids);
}
