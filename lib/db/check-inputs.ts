import type { CheckRecord } from "../domain/checks/types";
import type { PropertyOverrides, PropertyName } from "../domain/alloy-properties";
import type { SourceAttributes } from "../domain/source-quality";
import type { SqlExecutor } from "./sql";

/** A record as the checks read it, with the columns the run needs beside the check itself. */
export interface CheckInputRow extends CheckRecord {
  status: string;
  version: number;
  qualityScore: number | null;
}


/** The columns read, as arrays of values (CheckInput's constructor reads them by position). */
const COLUMNS = `"id", "sourceId", "materialId", "alloyKey", "laserPowerW", "scanSpeedMmPerS", "hatchSpacingUm", "layerThicknessUm", "spotDiameterUm", "preheatC",
  "powderD10Um", "powderD50Um", "powderD90Um", "relativeDensityPct", "volumetricEnergyJMm3", "outcome", "machine", "atmosphere", "spotDefinition", "enteredValues",
  "status", "version", "qualityScore"`;

/** Records that take part in checks: everything but rejected records and those merged into another. */
const ACTIVE = `"status" NOT IN ('rejected', 'merged')`;

type Components = CheckRecord["components"];

/** Components per material, one shared frozen array per material (records of a grade share it). */
async function materialComponents(db: SqlExecutor, materialIds: Iterable<number>): Promise<Map<number, { basis: string; components: Components }>> {
  const ids = [...new Set(materialIds)];
  const out = new Map<number, { basis: string; components: { element: string; amount: number; isBalance: boolean }[] }>();
  for (let i = 0; i < ids.length; i += 500) {
    const part = ids.slice(i, i + 500);
    const ph = part.map(() => "?").join(",");
    for (const m of await db.all<{ id: number; basis: string }>(`SELECT "id", "basis" FROM "Material" WHERE "id" IN (${ph})`, part)) out.set(m.id, { basis: m.basis, components: [] });
    const components = await db.all<{ materialId: number; element: string; amount: number; isBalance: boolean }>(
      `SELECT "materialId" AS "materialId", "element", "amount", "isBalance" AS "isBalance" FROM "MaterialComponent" WHERE "materialId" IN (${ph}) ORDER BY "materialId", "element"`,
      part,
    );
    for (const c of components) out.get(c.materialId)?.components.push({ element: c.element, amount: c.amount, isBalance: c.isBalance === true });
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

/** A row of COLUMNS as an array of values, in COLUMNS' order: no object per row from the driver. */
type RecordRow = unknown[];
const ID = 0;
const MATERIAL_ID = 2;
const ALLOY_KEY = 3;

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

  constructor(r: RecordRow, materials: Materials) {
    const material = materials.get(r[MATERIAL_ID] as number);
    this.id = r[ID] as number;
    this.sourceId = r[1] as number;
    this.alloyKey = r[ALLOY_KEY] as string;
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

  setMaterial(material: { basis: string; components: Components } | undefined) {
    this.components = material?.components ?? NO_COMPONENTS;
    this.compositionBasis = material?.basis ?? "wt";
  }

  get entered(): CheckRecord["entered"] {
    return (this.parsed ??= parseEntered(this.enteredText));
  }
}

type Materials = Map<number, { basis: string; components: Components }>;

/** The materials of the given alloys (or all), with their components. */
async function materialsOfAlloys(db: SqlExecutor, alloyKeys: readonly string[] | "all"): Promise<Materials> {
  const rows =
    alloyKeys === "all"
      ? await db.all<{ id: number }>(`SELECT "id" FROM "Material" ORDER BY "id"`)
      : await db.all<{ id: number }>(`SELECT "id" FROM "Material" WHERE "alloyKey" IN (${alloyKeys.map(() => "?").join(",")}) ORDER BY "id"`, alloyKeys);
  return materialComponents(db, rows.map((r) => r.id));
}

/** Records read per query by a full scan. */
const SCAN_CHUNK = 4096;

/**
 * Turns rows into check inputs. A record whose material is not among `materials` (its alloy key
 * and its material's disagree) gets it looked up at the end.
 */
class InputBuilder {
  readonly inputs: CheckInput[] = [];
  private readonly missing: [CheckInput, number][] = [];
  constructor(private readonly materials: Materials) {}

  add(r: RecordRow) {
    const input = new CheckInput(r, this.materials);
    const materialId = r[MATERIAL_ID] as number;
    if (!this.materials.has(materialId)) this.missing.push([input, materialId]);
    this.inputs.push(input);
  }

  async done(db: SqlExecutor): Promise<CheckInputRow[]> {
    if (this.missing.length) {
      const more = await materialComponents(db, this.missing.map(([, id]) => id));
      for (const [input, id] of this.missing) input.setMaterial(more.get(id));
    }
    return this.inputs;
  }
}

/**
 * Every active record (those of `keep`'s alloys only, when given), in id order, read a chunk at a
 * time: the driver's row objects then die young instead of all 100k of them living through a
 * full garbage collection before they are copied into check inputs.
 */
async function scanInputs(db: SqlExecutor, materials: Materials, keep: ((alloyKey: string) => boolean) | null): Promise<CheckInputRow[]> {
  const builder = new InputBuilder(materials);
  for (let after = 0; ; ) {
    const rows = await db.values<RecordRow>(`SELECT ${COLUMNS} FROM "BuildRecord" WHERE ${ACTIVE} AND "id" > ? ORDER BY "id" LIMIT ?`, [after, SCAN_CHUNK]);
    for (const r of rows) if (!keep || keep(r[ALLOY_KEY] as string)) builder.add(r);
    if (rows.length < SCAN_CHUNK) break;
    after = rows[rows.length - 1]![ID] as number;
  }
  return builder.done(db);
}

/** Every active record, or the active records of the given alloys, in id order. */
export async function loadCheckRecords(db: SqlExecutor, alloyKeys: readonly string[] | "all"): Promise<CheckInputRow[]> {
  if (alloyKeys === "all") return scanInputs(db, await materialsOfAlloys(db, "all"), null);
  if (!alloyKeys.length) return [];
  // When the alloys asked for hold most records (a large import, say), one scan of the table in id
  // order beats index lookups followed by a sort; the count per alloy comes from an index.
  const counts = await db.all<{ alloyKey: string; n: number }>(`SELECT "alloyKey" AS "alloyKey", COUNT(*) AS n FROM "BuildRecord" WHERE ${ACTIVE} GROUP BY "alloyKey"`);
  const wanted = new Set(alloyKeys);
  let total = 0;
  let inWanted = 0;
  for (const { alloyKey, n } of counts) {
    total += n;
    if (wanted.has(alloyKey)) inWanted += n;
  }
  const materials = await materialsOfAlloys(db, alloyKeys);
  if (inWanted >= 0.6 * total) return scanInputs(db, materials, inWanted === total ? null : (alloy) => wanted.has(alloy));
  const builder = new InputBuilder(materials);
  for (const r of await db.values<RecordRow>(`SELECT ${COLUMNS} FROM "BuildRecord" WHERE ${ACTIVE} AND "alloyKey" IN (${alloyKeys.map(() => "?").join(",")}) ORDER BY "id"`, alloyKeys)) builder.add(r);
  return builder.done(db);
}

type RecordKey = { id: number; alloyKey: string; status: string };

/** Alloy and status of the given records (any status), in id order, for choosing what to load. */
export async function recordKeys(db: SqlExecutor, ids: readonly number[]): Promise<RecordKey[]> {
  const columns = `"id", "alloyKey" AS "alloyKey", "status"`;
  // An import's records have consecutive ids: one range query instead of hundreds of IN lists.
  if (ids.length > 500 && isConsecutive(ids)) {
    return db.all<RecordKey>(`SELECT ${columns} FROM "BuildRecord" WHERE "id" BETWEEN ? AND ? ORDER BY "id"`, [ids[0]!, ids[ids.length - 1]!]);
  }
  const out: RecordKey[] = [];
  for (let i = 0; i < ids.length; i += 500) {
    const part = ids.slice(i, i + 500);
    out.push(...(await db.all<RecordKey>(`SELECT ${columns} FROM "BuildRecord" WHERE "id" IN (${part.map(() => "?").join(",")}) ORDER BY "id"`, part)));
  }
  return out;
}

function isConsecutive(ids: readonly number[]): boolean {
  for (let i = 1; i < ids.length; i++) if (ids[i] !== ids[i - 1]! + 1) return false;
  return true;
}

export type SourceAttributeRow = SourceAttributes & { id: number; title: string; version: number };

const SOURCE_COLUMNS = `"id", "title", "version", "kind", "densityMethod", "outcomeEvidence", "machineStated", "spotSizeDefinition", "powderReported", "atmosphereReported",
  "qualityOverride", "qualityOverrideReason"`;

type RawSource = Omit<SourceAttributeRow, "machineStated" | "powderReported" | "atmosphereReported"> & { machineStated: unknown; powderReported: unknown; atmosphereReported: unknown };

// BOOLEAN columns come back as true/false through sql.ts; a 1 (SQLite's stored form) counts as true too
const truthy = (v: unknown) => v === true || v === 1;

function sourceAttributes(rows: RawSource[]): Map<number, SourceAttributeRow> {
  return new Map(rows.map((s) => [s.id, { ...s, machineStated: truthy(s.machineStated), powderReported: truthy(s.powderReported), atmosphereReported: truthy(s.atmosphereReported) }]));
}

/** The attributes the source score reads, per source id. */
export async function loadSourceAttributes(db: SqlExecutor, ids: readonly number[] | "all"): Promise<Map<number, SourceAttributeRow>> {
  const query = `SELECT ${SOURCE_COLUMNS} FROM "Source"`;
  if (ids === "all") return sourceAttributes(await db.all<RawSource>(query));
  const rows: RawSource[] = [];
  for (let i = 0; i < ids.length; i += 500) {
    const part = ids.slice(i, i + 500);
    rows.push(...(await db.all<RawSource>(`${query} WHERE "id" IN (${part.map(() => "?").join(",")})`, part)));
  }
  return sourceAttributes(rows);
}

/** How many records a source has, their mean quality, and who set its quality override. */
export async function sourceQualityStats(db: SqlExecutor, sourceId: number): Promise<{ records: number; meanQuality: number | null; overriddenBy: string | null }> {
  const stats = (await db.get<{ n: number; mean: number | null }>(`SELECT COUNT(*) AS n, AVG("qualityScore") AS mean FROM "BuildRecord" WHERE "sourceId" = ?`, [sourceId]))!;
  const by = await db.get<{ name: string | null }>(`SELECT u."name" AS name FROM "Source" s LEFT JOIN "User" u ON u."id" = s."qualityOverrideById" WHERE s."id" = ?`, [sourceId]);
  return { records: stats.n, meanQuality: stats.mean, overriddenBy: by?.name ?? null };
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

type OverrideRow = { alloyKey: string; property: string; value: number; source: string };

function propertyOverrides(rows: OverrideRow[]): Map<string, PropertyOverrides> {
  const out = new Map<string, PropertyOverrides>();
  const known = new Set<string>(Object.values(PROPERTY_COLUMN));
  for (const r of rows) {
    const name = PROPERTY_COLUMN[r.property] ?? (known.has(r.property) ? (r.property as PropertyName) : undefined);
    if (!name || !(r.value > 0) || (name === "absorptivity" && r.value > 1)) continue;
    const o = out.get(r.alloyKey) ?? {};
    o[name] = { value: r.value, source: r.source };
    out.set(r.alloyKey, o);
  }
  return out;
}

const OVERRIDES = `SELECT "alloyKey" AS "alloyKey", "property", "value", "source" FROM "AlloyPropertyOverride" ORDER BY "id"`;

/** Reviewer overrides of alloy properties, per alloy key; unknown property names and unusable values are skipped. */
export async function loadPropertyOverrides(db: SqlExecutor): Promise<Map<string, PropertyOverrides>> {
  return propertyOverrides(await db.all<OverrideRow>(OVERRIDES));
}

/**
 * Writes quality scores (caller's transaction). Does not touch version or updatedAt: a derived
 * value, not an edit. One prepared UPDATE per row on SQLite; `UPDATE … FROM (VALUES …)` in chunks
 * on PostgreSQL, where a round trip per record would take minutes over a whole collection.
 */
export async function writeQualityScores(db: SqlExecutor, scores: readonly (readonly [number, number])[]): Promise<void> {
  if (db.engine === "sqlite") {
    for (const [id, q] of scores) await db.run(`UPDATE "BuildRecord" SET "qualityScore" = ? WHERE "id" = ?`, [q, id]);
    return;
  }
  for (let i = 0; i < scores.length; i += 1000) {
    const part = scores.slice(i, i + 1000);
    await db.run(
      `UPDATE "BuildRecord" SET "qualityScore" = v.column2 FROM (VALUES ${part.map(() => "(CAST(? AS INTEGER), CAST(? AS DOUBLE PRECISION))").join(", ")}) AS v WHERE "BuildRecord"."id" = v.column1`,
      part.flatMap(([id, q]) => [id, q]),
    );
  }
}

/** Sends accepted records back to review (a new error flag opened on them); caller's transaction. The ids changed. */
export async function reopenAcceptedRecords(db: SqlExecutor, ids: readonly number[], at: string): Promise<number[]> {
  const out: number[] = [];
  for (let i = 0; i < ids.length; i += 500) {
    const part = ids.slice(i, i + 500);
    const rows = await db.all<{ id: number }>(
      `UPDATE "BuildRecord" SET "status" = 'needs_review', "version" = "version" + 1, "updatedAt" = ? WHERE "id" IN (${part.map(() => "?").join(",")}) AND "status" = 'accepted' RETURNING "id"`,
      [at, ...part],
    );
    out.push(...rows.map((r) => r.id));
  }
  return out.sort((a, b) => a - b);
}
