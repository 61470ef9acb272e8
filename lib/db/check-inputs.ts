import type { CheckRecord } from "../domain/checks/types";
import type { PropertyOverrides, PropertyName } from "../domain/alloy-properties";
import type { SourceAttributes } from "../domain/source-quality";
import type { SqliteDatabase } from "./connection";

/** A record as the checks read it, with the columns the run needs beside the check itself. */
export interface CheckInputRow extends CheckRecord {
  status: string;
  version: number;
  qualityScore: number | null;
}


/** The columns read, in the order CheckInput's constructor takes them. */
const COLUMNS = `id, sourceId, materialId, alloyKey, laserPowerW, scanSpeedMmPerS, hatchSpacingUm, layerThicknessUm, spotDiameterUm, preheatC,
  powderD10Um, powderD50Um, powderD90Um, relativeDensityPct, volumetricEnergyJMm3, outcome, machine, atmosphere, spotDefinition, enteredValues,
  status, version, qualityScore`;

/** Records that take part in checks: everything but rejected records and those merged into another. */
const ACTIVE = `status NOT IN ('rejected', 'merged')`;

type Components = CheckRecord["components"];

/** Components per material, one shared frozen array per material (records of a grade share it). */
function materialComponents(db: SqliteDatabase, materialIds: Iterable<number>): Map<number, { basis: string; components: Components }> {
  const ids = [...new Set(materialIds)];
  const out = new Map<number, { basis: string; components: { element: string; amount: number; isBalance: boolean }[] }>();
  for (let i = 0; i < ids.length; i += 500) {
    const part = ids.slice(i, i + 500);
    const ph = part.map(() => "?").join(",");
    for (const m of db.prepare(`SELECT id, basis FROM Material WHERE id IN (${ph})`).all(...part) as { id: number; basis: string }[]) out.set(m.id, { basis: m.basis, components: [] });
    for (const c of db.prepare(`SELECT materialId, element, amount, isBalance FROM MaterialComponent WHERE materialId IN (${ph}) ORDER BY materialId, element`).all(...part) as { materialId: number; element: string; amount: number; isBalance: number }[]) {
      out.get(c.materialId)?.components.push({ element: c.element, amount: c.amount, isBalance: c.isBalance === 1 });
    }
  }
  for (const v of out.values()) Object.freeze(v.components);
  return out;
}

function parseEntered(text: string): CheckRecord["entered"] {
  if (text === "{}" || text === "") return {};
  try {
    const v: unknown = JSON.parse(text);
    return v && typeof v === "object" ? (v as CheckRecord["entered"]) : {};
  } catch {
    return {};
  }
}

const NO_COMPONENTS: Components = Object.freeze([]);

/**
 * A loaded record. What was entered is parsed on first use only: most checks never need it, and
 * parsing 100k JSON columns is a good part of a full run.
 */
class CheckInput implements CheckInputRow {
  id: number;
  sourceId: number;
  alloyKey: string;
  components: Components;
  compositionBasis: string;
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
  outcome: string;
  machine: string | null;
  atmosphere: string | null;
  spotDefinition: string | null;
  status: string;
  version: number;
  qualityScore: number | null;
  enteredAllReported: boolean;
  private enteredText: string;
  private parsed: CheckRecord["entered"] | null = null;

  /** `r` is a row of COLUMNS in raw (array) form: no object per row from the driver. */
  constructor(r: unknown[], materials: Map<number, { basis: string; components: Components }>) {
    const material = materials.get(r[2] as number);
    this.id = r[0] as number;
    this.sourceId = r[1] as number;
    this.alloyKey = r[3] as string;
    this.components = material?.components ?? NO_COMPONENTS;
    this.compositionBasis = material?.basis ?? "wt";
    this.laserPowerW = r[4] as number | null;
    this.scanSpeedMmPerS = r[5] as number | null;
    this.hatchSpacingUm = r[6] as number | null;
    this.layerThicknessUm = r[7] as number | null;
    this.spotDiameterUm = r[8] as number | null;
    this.preheatC = r[9] as number | null;
    this.powderD10Um = r[10] as number | null;
    this.powderD50Um = r[11] as number | null;
    this.powderD90Um = r[12] as number | null;
    this.relativeDensityPct = r[13] as number | null;
    this.volumetricEnergyJMm3 = r[14] as number | null;
    this.outcome = r[15] as string;
    this.machine = r[16] as string | null;
    this.atmosphere = r[17] as string | null;
    this.spotDefinition = r[18] as string | null;
    this.enteredText = r[19] as string;
    this.status = r[20] as string;
    this.version = r[21] as number;
    this.qualityScore = r[22] as number | null;
    this.enteredAllReported = !this.enteredText.includes('"assumed"') && !this.enteredText.includes('"derived"');
  }

  get entered(): CheckRecord["entered"] {
    return (this.parsed ??= parseEntered(this.enteredText));
  }
}

function toInputs(db: SqliteDatabase, rows: unknown[][]): CheckInputRow[] {
  const materials = materialComponents(db, rows.map((r) => r[2] as number));
  return rows.map((r) => new CheckInput(r, materials));
}

/** Every active record, or the active records of the given alloys. */
export function loadCheckRecords(db: SqliteDatabase, alloyKeys: readonly string[] | "all"): CheckInputRow[] {
  if (alloyKeys === "all") return toInputs(db, db.prepare(`SELECT ${COLUMNS} FROM BuildRecord WHERE ${ACTIVE} ORDER BY id`).raw(true).all() as unknown[][]);
  if (!alloyKeys.length) return [];
  // When the alloys asked for hold most records (a large import, say), one scan of the table in id
  // order beats index lookups followed by a sort; the count per alloy comes from an index.
  const counts = db.prepare(`SELECT alloyKey, COUNT(*) AS n FROM BuildRecord WHERE ${ACTIVE} GROUP BY alloyKey`).raw(true).all() as [string, number][];
  const wanted = new Set(alloyKeys);
  let total = 0;
  let inWanted = 0;
  for (const [alloy, n] of counts) {
    total += n;
    if (wanted.has(alloy)) inWanted += n;
  }
  if (inWanted >= 0.6 * total) {
    const rows = db.prepare(`SELECT ${COLUMNS} FROM BuildRecord WHERE ${ACTIVE} ORDER BY id`).raw(true).all() as unknown[][];
    return toInputs(db, inWanted === total ? rows : rows.filter((r) => wanted.has(r[3] as string)));
  }
  return toInputs(db, db.prepare(`SELECT ${COLUMNS} FROM BuildRecord WHERE ${ACTIVE} AND alloyKey IN (${alloyKeys.map(() => "?").join(",")}) ORDER BY id`).raw(true).all(...alloyKeys) as unknown[][]);
}

/** Alloy and status of the given records (any status), for choosing what to load. */
export function recordKeys(db: SqliteDatabase, ids: readonly number[]): { id: number; alloyKey: string; status: string }[] {
  const out: { id: number; alloyKey: string; status: string }[] = [];
  // An import's records have consecutive ids: one range query instead of hundreds of IN lists.
  if (ids.length > 500 && isConsecutive(ids)) {
    return db.prepare(`SELECT id, alloyKey, status FROM BuildRecord WHERE id BETWEEN ? AND ?`).all(ids[0], ids[ids.length - 1]) as { id: number; alloyKey: string; status: string }[];
  }
  for (let i = 0; i < ids.length; i += 500) {
    const part = ids.slice(i, i + 500);
    out.push(...(db.prepare(`SELECT id, alloyKey, status FROM BuildRecord WHERE id IN (${part.map(() => "?").join(",")})`).all(...part) as { id: number; alloyKey: string; status: string }[]));
  }
  return out;
}

function isConsecutive(ids: readonly number[]): boolean {
  for (let i = 1; i < ids.length; i++) if (ids[i] !== ids[i - 1]! + 1) return false;
  return true;
}

/** The attributes the source score reads, per source id. */
export function loadSourceAttributes(db: SqliteDatabase, ids: readonly number[] | "all"): Map<number, SourceAttributes & { id: number; title: string; version: number }> {
  const sql = `SELECT id, title, version, kind, densityMethod, outcomeEvidence, machineStated, spotSizeDefinition, powderReported, atmosphereReported, qualityOverride, qualityOverrideReason FROM Source`;
  const rows = (ids === "all" ? db.prepare(sql).all() : ids.length ? db.prepare(`${sql} WHERE id IN (${ids.map(() => "?").join(",")})`).all(...ids) : []) as {
    id: number; title: string; version: number; kind: string; densityMethod: string; outcomeEvidence: string; machineStated: number; spotSizeDefinition: string | null;
    powderReported: number; atmosphereReported: number; qualityOverride: number | null; qualityOverrideReason: string | null;
  }[];
  return new Map(
    rows.map((s) => [
      s.id,
      { ...s, machineStated: s.machineStated === 1, powderReported: s.powderReported === 1, atmosphereReported: s.atmosphereReported === 1 },
    ]),
  );
}

/** Column spellings of AlloyPropertyOverride.property (schema comment) and the domain's names. */
const PROPERTY_COLUMN: Record<string, PropertyName> = {
  density_kg_m3: "densityKgPerM3",
  cp_j_kg_k: "specificHeatJPerKgK",
  k_w_m_k: "thermalConductivityWPerMK",
  solidus_k: "solidusK",
  liquidus_k: "liquidusK",
  boiling_k: "boilingK",
  latent_heat_j_kg: "latentHeatJPerKg",
  absorptivity: "absorptivity",
};

/** Reviewer overrides of alloy properties, per alloy key; unknown property names and unusable values are skipped. */
export function loadPropertyOverrides(db: SqliteDatabase): Map<string, PropertyOverrides> {
  const out = new Map<string, PropertyOverrides>();
  const known = new Set<string>(Object.values(PROPERTY_COLUMN));
  for (const r of db.prepare(`SELECT alloyKey, property, value, source FROM AlloyPropertyOverride`).all() as { alloyKey: string; property: string; value: number; source: string }[]) {
    const name = PROPERTY_COLUMN[r.property] ?? (known.has(r.property) ? (r.property as PropertyName) : undefined);
    if (!name || !(r.value > 0) || (name === "absorptivity" && r.value > 1)) continue;
    const o = out.get(r.alloyKey) ?? {};
    o[name] = { value: r.value, source: r.source };
    out.set(r.alloyKey, o);
  }
  return out;
}

/** Writes quality scores (caller's transaction). Does not touch version or updatedAt: a derived value, not an edit. */
export function writeQualityScores(db: SqliteDatabase, scores: readonly (readonly [number, number])[]): void {
  const s = db.prepare(`UPDATE BuildRecord SET qualityScore = ? WHERE id = ?`);
  for (const [id, q] of scores) s.run(q, id);
}

/** Sends accepted records back to review (a new error flag opened on them); caller's transaction. */
export function reopenAcceptedRecords(db: SqliteDatabase, ids: readonly number[], at: string): number[] {
  const s = db.prepare(`UPDATE BuildRecord SET status = 'needs_review', version = version + 1, updatedAt = ? WHERE id = ? AND status = 'accepted'`);
  return ids.filter((id) => s.run(at, id).changes === 1);
}
