// Reads and writes of the review actions, inside the caller's transaction (sql().transaction), so
// each action (record, flags, pair decision and audit) commits together on either engine.
import type { SqlExecutor, SqlValue } from "./sql";

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

export async function getReviewRecord(db: SqlExecutor, id: number): Promise<ReviewRecordRow | null> {
  return (
    (await db.get<ReviewRecordRow>(
      `SELECT "id", "version", "status", "sourceId", "alloyKey", "spotDefinition", "enteredValues", "mergedIntoId", "laserPowerW", "scanSpeedMmPerS", "hatchSpacingUm",
              "layerThicknessUm", "spotDiameterUm", "preheatC", "powderD10Um", "powderD50Um", "powderD90Um", "relativeDensityPct", "volumetricEnergyJMm3"
       FROM "BuildRecord" WHERE "id" = ?`,
      [id],
    )) ?? null
  );
}

/** Updates a record only at `version` (caller's transaction); false when someone saved first. */
export async function updateRecordIfVersion(db: SqlExecutor, id: number, version: number, set: Record<string, SqlValue>, actorId: number | null, at: string): Promise<boolean> {
  const keys = Object.keys(set);
  for (const k of keys) if (!REVIEW_COLUMNS.has(k)) throw new RangeError(`updateRecordIfVersion: column ${k} is not changed by review`);
  const assignments = keys.map((k) => `"${k}" = ?`).join(", ");
  const r = await db.run(`UPDATE "BuildRecord" SET ${assignments}${keys.length ? ", " : ""}"version" = "version" + 1, "updatedById" = ?, "updatedAt" = ? WHERE "id" = ? AND "version" = ?`, [
    ...keys.map((k) => set[k]!),
    actorId,
    at,
    id,
    version,
  ]);
  return r.changes === 1;
}

/** A source's version and quality override, or null when there is no such source. */
export async function getSourceOverride(db: SqlExecutor, id: number): Promise<{ version: number; qualityOverride: number | null; qualityOverrideReason: string | null } | null> {
  return (await db.get(`SELECT "version", "qualityOverride" AS "qualityOverride", "qualityOverrideReason" AS "qualityOverrideReason" FROM "Source" WHERE "id" = ?`, [id])) ?? null;
}

/** Sets (or clears, with null) a source's quality override only at `version`; false on a conflict. */
export async function setSourceQualityOverrideIfVersion(db: SqlExecutor, id: number, version: number, override: number | null, reason: string | null, actorId: number | null, at: string): Promise<boolean> {
  const r = await db.run(
    `UPDATE "Source" SET "qualityOverride" = ?, "qualityOverrideReason" = ?, "qualityOverrideById" = ?, "version" = "version" + 1, "updatedById" = ?, "updatedAt" = ? WHERE "id" = ? AND "version" = ?`,
    [override, reason, override === null ? null : actorId, actorId, at, id, version],
  );
  return r.changes === 1;
}

/** Ids of the records of a source. */
export async function recordIdsOfSource(db: SqlExecutor, sourceId: number): Promise<number[]> {
  return (await db.all<{ id: number }>(`SELECT "id" FROM "BuildRecord" WHERE "sourceId" = ? ORDER BY "id"`, [sourceId])).map((r) => r.id);
}

/** A record as the review queue shows it: every column, with its material's designation and its source. */
export interface QueueRecordRow {
  id: number;
  version: number;
  status: string;
  alloyKey: string;
  designation: string | null;
  outcome: string;
  outcomeText: string | null;
  machine: string | null;
  atmosphere: string | null;
  qualityScore: number | null;
  volumetricEnergyJMm3: number | null;
  sourceId: number;
  sourceTitle: string;
  sourceYear: number | null;
  sourceDoi: string | null;
  locationPage: number | null;
  locationLabel: string | null;
  importFile: string | null;
  importRow: number | null;
  enteredValues: string;
  [key: string]: unknown;
}

export async function queueRecord(db: SqlExecutor, id: number): Promise<QueueRecordRow | null> {
  return (
    (await db.get<QueueRecordRow>(
      `SELECT r.*, m."designation" AS "designation", s."title" AS "sourceTitle", s."year" AS "sourceYear", s."doi" AS "sourceDoi"
       FROM "BuildRecord" r JOIN "Source" s ON s."id" = r."sourceId" LEFT JOIN "Material" m ON m."id" = r."materialId" WHERE r."id" = ?`,
      [id],
    )) ?? null
  );
}
