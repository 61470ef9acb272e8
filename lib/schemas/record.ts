import { z } from "zod";
import { checkHardLimit, parseQuantity, quantityLabel, type Quantity } from "../domain/units";
import { OUTCOMES } from "../domain/outcomes";
import { energyDensities } from "../domain/energy-density";
import { toOneOverE2Diameter, type SpotDefinition } from "../domain/spot-definition";
import { MAX_ROW_ID, rowIdSchema } from "./ids";

/** Record fields entered as text with a unit, and the quantity each one is. */
export const RECORD_QUANTITY_FIELDS = {
  laserPower: "laserPower",
  scanSpeed: "scanSpeed",
  hatchSpacing: "hatchSpacing",
  layerThickness: "layerThickness",
  spotDiameter: "spotDiameter",
  preheat: "preheat",
  powderD10: "powderSize",
  powderD50: "powderSize",
  powderD90: "powderSize",
  relativeDensity: "relativeDensity",
} as const satisfies Record<string, Quantity>;

export type RecordQuantityField = keyof typeof RECORD_QUANTITY_FIELDS;
export const RECORD_QUANTITY_FIELD_NAMES = Object.keys(RECORD_QUANTITY_FIELDS) as RecordQuantityField[];

/** Fields without which a build record says nothing about printability. */
export const REQUIRED_QUANTITIES: readonly RecordQuantityField[] = ["laserPower", "scanSpeed"];

export const PROVENANCE = ["reported", "derived", "assumed"] as const;
export type Provenance = (typeof PROVENANCE)[number];

export const RECORD_STATUSES = ["draft", "needs_review", "accepted", "rejected", "merged"] as const;
export type RecordStatus = (typeof RECORD_STATUSES)[number];

export const RECORD_SPOT_DEFINITIONS = ["one_over_e2", "d4sigma", "fwhm"] as const;

const quantityText = z
  .object({
    value: z.union([z.string(), z.number()]).transform((v) => String(v).trim()).pipe(z.string().max(64, { message: "Keep the value under 64 characters." })).default(""),
    unit: z.string().trim().max(32).default(""),
  })
  .default({ value: "", unit: "" });

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, { message: `Keep this under ${max} characters.` })
    .nullish()
    .transform((v) => (v ? v : null));

const optionalPositiveInt = z.preprocess(
  (v) => (v === "" || v === null || v === undefined ? null : Number(v)),
  z.number({ message: "Enter a whole number." }).int({ message: "Enter a whole number." }).positive({ message: "Enter a number from 1 up." }).max(100_000).nullable(),
);

const quantityShape = Object.fromEntries(RECORD_QUANTITY_FIELD_NAMES.map((f) => [f, quantityText])) as Record<RecordQuantityField, typeof quantityText>;

/** The fields of a build record as a person or an importer enters them. */
export const recordFieldsSchema = z.object({
  sourceId: z.coerce.number({ message: "Choose the source this record comes from." }).int().positive({ message: "Choose the source this record comes from." }).max(MAX_ROW_ID, { message: "Choose the source this record comes from." }),
  locationPage: optionalPositiveInt.default(null),
  locationLabel: optionalText(100),
  alloy: z.string().trim().min(1, { message: "Enter the alloy, e.g. 316L or Ti-6Al-4V." }).max(200),
  composition: optionalText(1000),
  machine: optionalText(200),
  ...quantityShape,
  spotDefinition: z.enum(RECORD_SPOT_DEFINITIONS).nullish().transform((v) => v ?? null),
  atmosphere: optionalText(100),
  scanStrategy: optionalText(200),
  outcome: z.enum(OUTCOMES, { message: "Choose an outcome (unknown if the source does not say)." }).default("unknown"),
  outcomeText: optionalText(500),
  provenance: z.partialRecord(z.enum(RECORD_QUANTITY_FIELD_NAMES as [RecordQuantityField, ...RecordQuantityField[]]), z.enum(PROVENANCE)).default({}),
  status: z.enum(["draft", "needs_review"]).default("needs_review"),
});

type RecordFields = z.output<typeof recordFieldsSchema>;

// Imports repeat the same few values ("30 µm", "argon") thousands of times, and every value is
// read twice (validation, then normalization): a bounded memo of parse results keeps that cheap.
// Results are plain immutable data, so sharing them is safe.
const PARSE_MEMO_LIMIT = 20_000;
/** quantity → unit → value text → result: nested maps, so a lookup builds no key string. */
const parseMemo = new Map<Quantity, Map<string, Map<string, ReturnType<typeof parseQuantity>>>>();
let parseMemoSize = 0;

/**
 * Reads one entered value with its unit (memoized). The one reading shared by validation,
 * normalization and the bulk fast path.
 */
export function parseEnteredQuantity(value: string, unit: string, quantity: Quantity): ReturnType<typeof parseQuantity> {
  return parseEntered(value, unit, quantity);
}

function parseEntered(value: string, unit: string, quantity: Quantity): ReturnType<typeof parseQuantity> {
  let byUnit = parseMemo.get(quantity);
  if (!byUnit) parseMemo.set(quantity, (byUnit = new Map()));
  let byValue = byUnit.get(unit);
  if (!byValue) byUnit.set(unit, (byValue = new Map()));
  let parsed = byValue.get(value);
  if (parsed === undefined) {
    parsed = parseQuantity(unit ? `${value} ${unit}` : value, quantity);
    if (parseMemoSize >= PARSE_MEMO_LIMIT) {
      for (const m of parseMemo.values()) for (const v of m.values()) v.clear();
      parseMemoSize = 0;
    }
    byValue.set(value, parsed);
    parseMemoSize++;
  }
  return parsed;
}

/** Parses every quantity with its unit; a value that cannot be read or breaks a hard limit is a field error. */
function checkQuantities(r: Pick<RecordFields, RecordQuantityField>, ctx: z.RefinementCtx): void {
  for (const field of RECORD_QUANTITY_FIELD_NAMES) {
    const { value, unit } = r[field];
    const quantity = RECORD_QUANTITY_FIELDS[field];
    if (value === "") {
      if (REQUIRED_QUANTITIES.includes(field)) {
        ctx.addIssue({ code: "custom", path: [field, "value"], message: `Enter the ${quantityLabel(quantity)}.` });
      }
      continue;
    }
    const parsed = parseEntered(value, unit, quantity);
    if (!parsed.ok) {
      ctx.addIssue({ code: "custom", path: [field, "value"], message: parsed.message });
      continue;
    }
    const limit = checkHardLimit(parsed.value, quantity);
    if (limit) ctx.addIssue({ code: "custom", path: [field, "value"], message: limit });
  }
}

export const recordInputSchema = recordFieldsSchema.superRefine(checkQuantities);
export type RecordInput = z.input<typeof recordInputSchema>;
export type RecordValues = z.output<typeof recordInputSchema>;

export const recordUpdateSchema = recordFieldsSchema
  .extend({
    id: rowIdSchema,
    version: z.coerce.number().int().positive({ message: "The form lost its version; reload the page." }).max(MAX_ROW_ID, { message: "Ids and versions are whole numbers up to 2,147,483,647." }),
    reason: optionalText(1000),
  })
  .superRefine(checkQuantities);
export type RecordUpdateInput = z.input<typeof recordUpdateSchema>;

export interface EnteredValue {
  text: string;
  unit: string;
  provenance: Provenance;
}

/** Canonical values of a validated record, as stored. */
export interface NormalizedQuantities {
  laserPowerW: number | null;
  scanSpeedMmPerS: number | null;
  hatchSpacingUm: number | null;
  layerThicknessUm: number | null;
  /** Always the 1/e² diameter; `spotDefinition` keeps what the source used. */
  spotDiameterUm: number | null;
  preheatC: number | null;
  powderD10Um: number | null;
  powderD50Um: number | null;
  powderD90Um: number | null;
  relativeDensityPct: number | null;
  volumetricEnergyJMm3: number | null;
  enteredValues: Partial<Record<RecordQuantityField, EnteredValue>>;
}

const CANONICAL_KEY: Record<RecordQuantityField, keyof Omit<NormalizedQuantities, "enteredValues" | "volumetricEnergyJMm3">> = {
  laserPower: "laserPowerW",
  scanSpeed: "scanSpeedMmPerS",
  hatchSpacing: "hatchSpacingUm",
  layerThickness: "layerThicknessUm",
  spotDiameter: "spotDiameterUm",
  preheat: "preheatC",
  powderD10: "powderD10Um",
  powderD50: "powderD50Um",
  powderD90: "powderD90Um",
  relativeDensity: "relativeDensityPct",
};

/** The canonical column of each entered field (laserPower -> laserPowerW). */
export function canonicalKeyOf(field: RecordQuantityField): keyof NormalizedQuantities {
  return CANONICAL_KEY[field];
}

/**
 * Converts entered text to canonical units (W, mm/s, µm, °C, %) and derives E_v.
 * Input must have passed `recordInputSchema`; unreadable values become null.
 * @example normalizeQuantities({ ...blank, laserPower: { value: "0.2", unit: "kW" } }).laserPowerW // 200
 */
export function normalizeQuantities(
  r: Pick<RecordValues, RecordQuantityField | "spotDefinition" | "provenance">,
  /** Values already read (the bulk fast path hands them over), so none is parsed twice. */
  known?: Partial<Record<RecordQuantityField, Extract<ReturnType<typeof parseQuantity>, { ok: true }>>>,
): NormalizedQuantities {
  const out: NormalizedQuantities = {
    laserPowerW: null, scanSpeedMmPerS: null, hatchSpacingUm: null, layerThicknessUm: null, spotDiameterUm: null,
    preheatC: null, powderD10Um: null, powderD50Um: null, powderD90Um: null, relativeDensityPct: null,
    volumetricEnergyJMm3: null, enteredValues: {},
  };
  for (const field of RECORD_QUANTITY_FIELD_NAMES) {
    const { value, unit } = r[field];
    if (value === "") continue;
    const parsed = known?.[field] ?? parseEntered(value, unit, RECORD_QUANTITY_FIELDS[field]);
    if (!parsed.ok) continue;
    let canonical = parsed.value;
    if (field === "spotDiameter" && r.spotDefinition) canonical = toOneOverE2Diameter(canonical, r.spotDefinition as SpotDefinition);
    out[CANONICAL_KEY[field]] = canonical;
    out.enteredValues[field] = { text: value, unit: unit || parsed.unit, provenance: r.provenance[field] ?? "reported" };
  }
  out.volumetricEnergyJMm3 = energyDensities({
    laserPowerW: out.laserPowerW,
    scanSpeedMmPerS: out.scanSpeedMmPerS,
    hatchSpacingUm: out.hatchSpacingUm,
    layerThicknessUm: out.layerThicknessUm,
  }).volumetricJPerMm3;
  return out;
}
