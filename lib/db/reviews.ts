// Writes of the review actions on the raw connection, so each action is one synchronous
// transaction (record, flags, pair decision and audit together) with no awaits inside.
import type { SqliteDatabase } from "./connection";

/** The columns of a record a review action may change. */
const REVIEW_COLUMNS = new Set([
  "laserPowerW", "scanSpeedMmPerS", "hatchSpacingUm", "layerThicknessUm", "spotDiameterUm", "preheatC", "powderD10Um", "powderD50Um",
  "powderD90Um", "relativeDensityPct", "volumetricEnergyJMm3", "enteredValues", "status", "mergedIntoId",
]);

export interface ReviewRecordRow {
  id: number;
  version: number;
  status: string;
  sourceId: number;
  alloyKey: string;
  spotDefinition: string | null;
  enteredValues: string;
  mergedIntoId: number | null;
  laserPowerW: number | null;
  scanSpeedMmPerS: number | null;
  hatchSpacingUm: number | null;
  layerThicknessUm: number | null;
  spotDiameterUm: number | null;
  preheatC: number | null;
  powderD10Um: number | null;
  powderD50Um: number | null;
  powderD90Um: number | null;
  relativeDensityPct: number | null;
  volumetricEnergyJMm3: number | null;
}

export function getReviewRecord(db: SqliteDatabase, id: number): ReviewRecordRow | null {
  return (
    (db
      .prepare(
        `SELECT id, version, status, sourceId, alloyKey, spotDefinition, enteredValues, mergedIntoId, laserPowerW, scanSpeedMmPerS, hatchSpacingUm, layerThicknessUm,
                spotDiameterUm, preheatC, powderD10Um, powderD50Um, powderD90Um, relativeDensityPct, volumetricEnergyJMm3
         FROM BuildRecord WHERE id = ?`,
      )
      .get(id) as ReviewRecordRow | undefined) ?? null
  );
}

/** Updates a record only at `version` (caller's transaction); false when someone saved first. */
export function updateRecordIfVersionRaw(db: SqliteDatabase, id: number, version: number, set: Record<string, unknown>, actorId: number | null, at: string): boolean {
  const keys = Object.keys(set);
  for (const k of keys) if (!REVIEW_COLUMNS.has(k)) throw new RangeError(`updateRecordIfVersionRaw: column ${k} is not changed by review`);
  const assignments = keys.map((k) => `"${k}" = ?`).join(", ");
  const r = db
    .prepare(`UPDATE BuildRecord SET ${assignments}${keys.length ? ", " : ""}version = version + 1, updatedById = ?, updatedAt = ? WHERE id = ? AND version = ?`)
    .run(...keys.map((k) => set[k]), actorId, at, id, version);
  return r.changes === 1;
}

/** Sets (or clears, with null) a source's quality override only at `version`; false on a conflict. */
export function setSourceQualityOverrideIfVersion(db: SqliteDatabase, id: number, version: number, override: number | null, reason: string | null, actorId: number | null, at: string): boolean {
  const r = db
    .prepare(`UPDATE Source SET qualityOverride = ?, qualityOverrideReason = ?, qualityOverrideById = ?, version = version + 1, updatedById = ?, updatedAt = ? WHERE id = ? AND version = ?`)
    .run(override, reason, override === null ? null : actorId, actorId, at, id, version);
  return r.changes === 1;
}

/** Ids of the records of a source. */
export function recordIdsOfSource(db: SqliteDatabase, sourceId: number): number[] {
  return (db.prepare(`SELECT id FROM BuildRecord WHERE sourceId = ? ORDER BY id`).all(sourceId) as { id: number }[]).map((r) => r.id);
}
