/**
 * Ranges and lists of a process quantity typed as text, as filters and machine limits are entered
 * on the coverage page and the command line: "50-400W", "0.2–2 m/s", "80um-0.12mm", "30um",
 * "80-" (from 80 up), "80, 100, 120 µm". Each value is read by parseQuantity (units.ts), so every
 * unit spelling and the decimal-comma rule of the entry form apply here too.
 */
import { checkHardLimit, parseQuantity, quantityLabel, type Quantity } from "./units";

/** A range in the quantity's canonical unit; null means open on that side. */
export interface QuantityRange {
  min: number | null;
  max: number | null;
}

export type ParsedRange = { ok: true; range: QuantityRange; text: string } | { ok: false; message: string };
export type ParsedList = { ok: true; values: number[]; text: string } | { ok: false; message: string };

// One separator between two values: a hyphen, en or em dash, "..", or the word "to".
// A leading sign is never a separator: "-120" is "up to 120"; negative values are refused anyway.
const SEPARATOR = /^(.*?[^\s\-\u2013\u2014])?\s*(?:-|\u2013|\u2014|\.\.|\bto\b)\s*(.*)$/s;

function unitOf(text: string, quantity: Quantity): string | null {
  const parsed = parseQuantity(text, quantity);
  if (!parsed.ok) return null;
  return /[a-zA-Zµμ%°"]/.test(text) ? parsed.unit : null;
}

function sentence(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

function readValue(text: string, quantity: Quantity, defaultUnit: string | undefined): { ok: true; value: number } | { ok: false; message: string } {
  const parsed = parseQuantity(text, quantity, defaultUnit);
  if (!parsed.ok) return parsed;
  const limit = checkHardLimit(parsed.value, quantity);
  return limit ? { ok: false, message: limit } : { ok: true, value: parsed.value };
}

/**
 * Reads a range "MIN-MAX" (either side may be empty), or a single value, which gives a range of
 * that one value. A unit written on one side only applies to both ("80-120um"); a bare number is
 * in the canonical unit. Values outside the quantity's hard limits (a negative power, say) and a
 * minimum above the maximum are refused with a message naming the quantity.
 *
 * @example
 * parseQuantityRange("50-400W", "laserPower");        // { ok: true, range: { min: 50, max: 400 }, ... }
 * parseQuantityRange("0.2-2 m/s", "scanSpeed");        // { ok: true, range: { min: 200, max: 2000 }, ... }
 * parseQuantityRange("30um", "layerThickness");        // { ok: true, range: { min: 30, max: 30 }, ... }
 * parseQuantityRange("80-", "hatchSpacing");           // { ok: true, range: { min: 80, max: null }, ... }
 * parseQuantityRange("400-50W", "laserPower").ok;      // false: the minimum is above the maximum
 */
export function parseQuantityRange(text: string, quantity: Quantity): ParsedRange {
  const label = quantityLabel(quantity);
  const trimmed = text.trim();
  if (trimmed === "") return { ok: false, message: `No ${label} range entered: write MIN-MAX with a unit, e.g. ${example(quantity)}.` };
  const m = SEPARATOR.exec(trimmed);
  const [left, right] = m ? [(m[1] ?? "").trim(), (m[2] ?? "").trim()] : [trimmed, null];
  if (right === null) {
    const v = readValue(left, quantity, undefined);
    return v.ok ? { ok: true, range: { min: v.value, max: v.value }, text } : v;
  }
  if (left === "" && right === "") return { ok: false, message: `Cannot read '${trimmed}' as a ${label} range: write MIN-MAX, e.g. ${example(quantity)}.` };
  if (/^[-\u2013\u2014]/.test(right)) return { ok: false, message: `${sentence(label)} cannot be negative: '${trimmed}' is not a range of ${label}. Write MIN-MAX, e.g. ${example(quantity)}.` };
  // "80-120um": the unit of the side that has one applies to a bare number on the other side.
  const shared = (right !== "" ? unitOf(right, quantity) : null) ?? (left !== "" ? unitOf(left, quantity) : null) ?? undefined;
  let min: number | null = null;
  let max: number | null = null;
  if (left !== "") {
    const v = readValue(left, quantity, shared);
    if (!v.ok) return v;
    min = v.value;
  }
  if (right !== "") {
    const v = readValue(right, quantity, shared);
    if (!v.ok) return v;
    max = v.value;
  }
  if (min !== null && max !== null && min > max) {
    return { ok: false, message: `The minimum ${label} (${min}) is above the maximum (${max}): swap them.` };
  }
  return { ok: true, range: { min, max }, text };
}

/**
 * Reads a list of values separated by commas or semicolons ("80, 100, 120 µm"; a unit on the last
 * value applies to bare numbers before it). Because a comma separates values here, decimals are
 * written with a point. Duplicates are dropped and the values sorted.
 *
 * @example
 * parseQuantityList("80, 100, 120um", "hatchSpacing"); // { ok: true, values: [80, 100, 120], ... }
 * parseQuantityList("0.03mm; 40um", "layerThickness"); // { ok: true, values: [30, 40], ... }
 */
export function parseQuantityList(text: string, quantity: Quantity): ParsedList {
  const label = quantityLabel(quantity);
  const parts = text.split(/[,;]/).map((s) => s.trim()).filter((s) => s !== "");
  if (parts.length === 0) return { ok: false, message: `No ${label} entered: give one or more values, e.g. ${listExample(quantity)}.` };
  const last = parts[parts.length - 1]!;
  const shared = unitOf(last, quantity) ?? undefined;
  const values = new Set<number>();
  for (const part of parts) {
    const v = readValue(part, quantity, shared);
    if (!v.ok) return v;
    values.add(v.value);
  }
  return { ok: true, values: [...values].sort((a, b) => a - b), text };
}

const EXAMPLES: Partial<Record<Quantity, string>> = {
  laserPower: "50-400W",
  scanSpeed: "200-2000mm/s",
  hatchSpacing: "80-120um",
  layerThickness: "20-40um",
  spotDiameter: "60-100um",
};

function example(quantity: Quantity): string {
  return EXAMPLES[quantity] ?? "10-20";
}

function listExample(quantity: Quantity): string {
  return quantity === "layerThickness" ? "30, 40um" : quantity === "hatchSpacing" ? "80, 100, 120um" : example(quantity);
}
