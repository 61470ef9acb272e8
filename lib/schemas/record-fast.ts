/**
 * A fast path of `recordInputSchema` for bulk writes (imports, figure readings, the bulk API).
 *
 * It accepts only inputs that are plainly well formed — strings where the schema wants strings,
 * known enum values, every quantity readable and inside its hard limit — and returns exactly what
 * the schema would (a property test holds the two equal). Anything else gives null, and the caller
 * runs the schema itself, whose messages name every problem. So the schema stays the one
 * definition of a valid record; this only skips its generic machinery on the rows that need none.
 * It also hands back the parsed quantities, so normalization does not read each value twice.
 */
import { OUTCOMES } from "../domain/outcomes";
import { withinHardLimit, type ParsedQuantity } from "../domain/units";
import {
  PROVENANCE,
  RECORD_QUANTITY_FIELD_NAMES,
  RECORD_QUANTITY_FIELDS,
  RECORD_SPOT_DEFINITIONS,
  REQUIRED_QUANTITIES,
  parseEnteredQuantity,
  type RecordQuantityField,
  type RecordValues,
} from "./record";

export type ParsedQuantities = Partial<Record<RecordQuantityField, Extract<ParsedQuantity, { ok: true }>>>;

export interface FastRecordInput {
  values: RecordValues;
  parsed: ParsedQuantities;
}

const OUTCOME_SET: ReadonlySet<string> = new Set(OUTCOMES);
const SPOT_SET: ReadonlySet<string> = new Set(RECORD_SPOT_DEFINITIONS);
const PROVENANCE_SET: ReadonlySet<string> = new Set(PROVENANCE);
const FIELD_SET: ReadonlySet<string> = new Set(RECORD_QUANTITY_FIELD_NAMES);
const STATUS_SET: ReadonlySet<string> = new Set(["draft", "needs_review"]);
const REQUIRED_SET: ReadonlySet<string> = new Set(REQUIRED_QUANTITIES);
/** Marks a field the fast path cannot judge. */
const NOT_SIMPLE = Symbol("not simple");

function isPlainObject(v: unknown): v is Record<string, unknown> {
  if (typeof v !== "object" || v === null || Array.isArray(v)) return false;
  const proto = Object.getPrototypeOf(v);
  return proto === Object.prototype || proto === null;
}

/** optionalText(max): absent, null or blank → null; a string trimmed to at most `max` characters. */
function optionalText(v: unknown, max: number): string | null | typeof NOT_SIMPLE {
  if (v === undefined || v === null) return null;
  if (typeof v !== "string") return NOT_SIMPLE;
  const t = v.trim();
  if (t.length > max) return NOT_SIMPLE;
  return t === "" ? null : t;
}

function positiveInt(v: unknown, max: number): number | typeof NOT_SIMPLE {
  if (typeof v === "number") return Number.isInteger(v) && v > 0 && v <= max ? v : NOT_SIMPLE;
  if (typeof v === "string" && /^[1-9]\d{0,8}$/.test(v)) {
    const n = Number(v);
    return n <= max ? n : NOT_SIMPLE;
  }
  return NOT_SIMPLE;
}

const EMPTY_QUANTITY = Object.freeze({ value: "", unit: "" });

/**
 * The schema's output and the parsed quantities, or null when the input needs the schema itself
 * (any problem at all, or a form the fast path does not take, such as a number for a value).
 *
 * @example
 * parseRecordInputFast({ sourceId: 1, alloy: "316L", laserPower: { value: "200", unit: "W" }, scanSpeed: { value: "0,8", unit: "m/s" } })?.parsed.scanSpeed?.value; // 800
 * parseRecordInputFast({ sourceId: 1, alloy: "316L", laserPower: { value: "200 kg" } }); // null (the schema explains)
 */
export function parseRecordInputFast(input: unknown): FastRecordInput | null {
  if (!isPlainObject(input)) return null;
  const sourceId = positiveInt(input.sourceId, 2 ** 31 - 1);
  if (sourceId === NOT_SIMPLE) return null;
  const page = input.locationPage;
  const locationPage = page === undefined || page === null || page === "" ? null : positiveInt(page, 100_000);
  if (locationPage === NOT_SIMPLE) return null;
  const locationLabel = optionalText(input.locationLabel, 100);
  const composition = optionalText(input.composition, 1000);
  const machine = optionalText(input.machine, 200);
  const atmosphere = optionalText(input.atmosphere, 100);
  const scanStrategy = optionalText(input.scanStrategy, 200);
  const outcomeText = optionalText(input.outcomeText, 500);
  if (locationLabel === NOT_SIMPLE || composition === NOT_SIMPLE || machine === NOT_SIMPLE || atmosphere === NOT_SIMPLE || scanStrategy === NOT_SIMPLE || outcomeText === NOT_SIMPLE) return null;
  if (typeof input.alloy !== "string") return null;
  const alloy = input.alloy.trim();
  if (alloy.length < 1 || alloy.length > 200) return null;

  const spot = input.spotDefinition;
  if (spot !== undefined && spot !== null && !(typeof spot === "string" && SPOT_SET.has(spot))) return null;
  const outcome = input.outcome === undefined ? "unknown" : input.outcome;
  if (typeof outcome !== "string" || !OUTCOME_SET.has(outcome)) return null;
  const status = input.status === undefined ? "needs_review" : input.status;
  if (typeof status !== "string" || !STATUS_SET.has(status)) return null;

  let provenance: Partial<Record<RecordQuantityField, (typeof PROVENANCE)[number]>> = {};
  if (input.provenance !== undefined) {
    if (!isPlainObject(input.provenance)) return null;
    for (const [k, v] of Object.entries(input.provenance)) {
      if (!FIELD_SET.has(k) || typeof v !== "string" || !PROVENANCE_SET.has(v)) return null;
    }
    provenance = { ...(input.provenance as typeof provenance) };
  }

  const quantities = {} as Record<RecordQuantityField, { value: string; unit: string }>;
  const parsed: ParsedQuantities = {};
  for (const field of RECORD_QUANTITY_FIELD_NAMES) {
    const q = input[field];
    let value = "";
    let unit = "";
    if (q === undefined) {
      quantities[field] = { ...EMPTY_QUANTITY };
    } else {
      if (!isPlainObject(q)) return null;
      const v = q.value;
      const u = q.unit;
      if (v !== undefined) {
        if (typeof v !== "string") return null;
        value = v.trim();
        if (value.length > 64) return null;
      }
      if (u !== undefined) {
        if (typeof u !== "string") return null;
        unit = u.trim();
        if (unit.length > 32) return null;
      }
      quantities[field] = { value, unit };
    }
    if (value === "") {
      if (REQUIRED_SET.has(field)) return null;
      continue;
    }
    const quantity = RECORD_QUANTITY_FIELDS[field];
    const p = parseEnteredQuantity(value, unit, quantity);
    if (!p.ok || !withinHardLimit(p.value, quantity)) return null;
    parsed[field] = p;
  }

  const values: RecordValues = {
    sourceId,
    locationPage,
    locationLabel,
    alloy,
    composition,
    machine,
    ...quantities,
    spotDefinition: (spot ?? null) as RecordValues["spotDefinition"],
    atmosphere,
    scanStrategy,
    outcome: outcome as RecordValues["outcome"],
    outcomeText,
    provenance,
    status: status as RecordValues["status"],
  };
  return { values, parsed };
}
