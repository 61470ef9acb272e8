/**
 * Units of the process quantities of a build record: reading a value typed with its unit,
 * normalizing unit spellings, converting to and from the one canonical unit stored per quantity,
 * reading units out of spreadsheet headers, and the hard limits and plausible ranges.
 *
 * A small table-driven converter: every unit is either a linear factor to the canonical unit
 * (kept as a ratio num/den so factors such as 1000/60 stay exact until the last step) or, for
 * temperatures, an offset and a scale.
 *
 * Sources of the conversion factors (all exact by definition):
 * - SI prefixes k = 10³, m = 10⁻³, µ = 10⁻⁶: BIPM, The International System of Units (SI
 *   Brochure), 9th edition 2019, Table 7.
 * - 1 min = 60 s: SI Brochure, 9th edition, Table 8 (non-SI units accepted for use with the SI).
 * - 1 in = 25.4 mm (international inch of 1959), 1 mil = 0.001 in: NIST Special Publication 811
 *   (2008 edition), Appendix B.8 and B.9.
 * - t/°C = T/K − 273.15: SI Brochure, 9th edition, section 2.3.1.
 * - t/°F = (9/5)·t/°C + 32: NIST SP 811 (2008), Appendix B.9 and section B.8 "temperature".
 */

export type Quantity =
  | "laserPower"
  | "scanSpeed"
  | "hatchSpacing"
  | "layerThickness"
  | "spotDiameter"
  | "preheat"
  | "powderSize"
  | "relativeDensity";

/** Every quantity, in the order forms show them. */
export const QUANTITIES: readonly Quantity[] = [
  "laserPower",
  "scanSpeed",
  "hatchSpacing",
  "layerThickness",
  "spotDiameter",
  "preheat",
  "powderSize",
  "relativeDensity",
];

/**
 * The unit each quantity is stored in.
 *
 * @example
 * CANONICAL_UNIT.scanSpeed; // "mm/s"
 */
export const CANONICAL_UNIT: Record<Quantity, string> = {
  laserPower: "W",
  scanSpeed: "mm/s",
  hatchSpacing: "µm",
  layerThickness: "µm",
  spotDiameter: "µm",
  preheat: "°C",
  powderSize: "µm",
  relativeDensity: "%",
};

export interface UnitOption {
  id: string;
  label: string;
}

type Conversion =
  | { kind: "ratio"; num: number; den: number } // canonical = value · num / den
  | { kind: "affine"; scale: number; offset: number }; // canonical = value · scale + offset

interface UnitDef {
  id: string;
  label: string;
  conversion: Conversion;
}

const ratio = (num: number, den = 1): Conversion => ({ kind: "ratio", num, den });

/** 1 in = 25.4 mm = 25,400 µm exactly (NIST SP 811, Appendix B.8). */
const UM_PER_INCH = 25_400;
/** 1 mil = 0.001 in = 25.4 µm exactly (NIST SP 811, Appendix B.8). */
const UM_PER_MIL = 25.4;
/** 0 °C = 273.15 K exactly (SI Brochure, 9th edition, section 2.3.1). */
const KELVIN_AT_ZERO_CELSIUS = 273.15;

const UNIT_DEFS: Record<string, UnitDef> = {
  W: { id: "W", label: "W", conversion: ratio(1) },
  kW: { id: "kW", label: "kW", conversion: ratio(1000) }, // k = 10³ (SI Brochure Table 7)
  "mm/s": { id: "mm/s", label: "mm/s", conversion: ratio(1) },
  "m/s": { id: "m/s", label: "m/s", conversion: ratio(1000) }, // m = 10³ mm
  "mm/min": { id: "mm/min", label: "mm/min", conversion: ratio(1, 60) }, // 1 min = 60 s
  "m/min": { id: "m/min", label: "m/min", conversion: ratio(1000, 60) },
  "in/s": { id: "in/s", label: "in/s", conversion: ratio(25.4) }, // 1 in = 25.4 mm
  µm: { id: "µm", label: "µm", conversion: ratio(1) },
  mm: { id: "mm", label: "mm", conversion: ratio(1000) }, // 1 mm = 10³ µm
  in: { id: "in", label: "in", conversion: ratio(UM_PER_INCH) },
  mil: { id: "mil", label: "mil (0.001 in)", conversion: ratio(UM_PER_MIL) },
  "°C": { id: "°C", label: "°C", conversion: { kind: "affine", scale: 1, offset: 0 } },
  K: { id: "K", label: "K", conversion: { kind: "affine", scale: 1, offset: -KELVIN_AT_ZERO_CELSIUS } },
  // t/°C = (t/°F − 32) · 5/9 (NIST SP 811, Appendix B.9)
  "°F": { id: "°F", label: "°F", conversion: { kind: "affine", scale: 5 / 9, offset: -32 * (5 / 9) } },
  "%": { id: "%", label: "%", conversion: ratio(1) },
  fraction: { id: "fraction", label: "fraction (0–1)", conversion: ratio(100) },
};

const UNITS_OF: Record<Quantity, readonly string[]> = {
  laserPower: ["W", "kW"],
  scanSpeed: ["mm/s", "m/s", "mm/min", "m/min", "in/s"],
  hatchSpacing: ["µm", "mm", "in", "mil"],
  layerThickness: ["µm", "mm", "in", "mil"],
  spotDiameter: ["µm", "mm"],
  preheat: ["°C", "K", "°F"],
  powderSize: ["µm", "mm"],
  relativeDensity: ["%", "fraction"],
};

const OPTIONS_OF: Record<Quantity, readonly UnitOption[]> = Object.fromEntries(
  (Object.keys(UNITS_OF) as Quantity[]).map((q) => [
    q,
    Object.freeze(UNITS_OF[q].map((id) => Object.freeze({ id, label: unitDef(id).label }))),
  ]),
) as Record<Quantity, readonly UnitOption[]>;

const LABELS: Record<Quantity, string> = {
  laserPower: "laser power",
  scanSpeed: "scan speed",
  hatchSpacing: "hatch spacing",
  layerThickness: "layer thickness",
  spotDiameter: "spot diameter",
  preheat: "preheat temperature",
  powderSize: "powder particle size",
  relativeDensity: "relative density",
};

/** Example entries for messages: canonical first, then a common alternative. */
const EXAMPLES: Record<Quantity, string> = {
  laserPower: "200 W or 0.2 kW",
  scanSpeed: "800 mm/s or 0.8 m/s",
  hatchSpacing: "100 µm or 0.1 mm",
  layerThickness: "30 µm or 0.03 mm",
  spotDiameter: "80 µm or 0.08 mm",
  preheat: "80 °C or 353.15 K",
  powderSize: "35 µm or 0.035 mm",
  relativeDensity: "99.5 % or 0.995 fraction",
};

function unitDef(id: string): UnitDef {
  const def = UNIT_DEFS[id];
  if (!def) throw new RangeError(`units: no unit definition for '${id}'`);
  return def;
}

/**
 * Spellings people type, keyed after `spellingKey` (case folded, spaces, "·", "*" and "^" removed,
 * Greek mu and micro sign unified). Values are unit ids.
 */
const SPELLINGS: Record<string, string> = {
  w: "W",
  watt: "W",
  watts: "W",
  kw: "kW",
  kilowatt: "kW",
  kilowatts: "kW",
  "mm/s": "mm/s",
  "mm/sec": "mm/s",
  "mm/second": "mm/s",
  "mms-1": "mm/s",
  "m/s": "m/s",
  "m/sec": "m/s",
  "m/second": "m/s",
  "ms-1": "m/s",
  "mm/min": "mm/min",
  "mmmin-1": "mm/min",
  "m/min": "m/min",
  "mmin-1": "m/min",
  "in/s": "in/s",
  "in/sec": "in/s",
  "inch/s": "in/s",
  "inches/s": "in/s",
  "ins-1": "in/s",
  ips: "in/s",
  µm: "µm",
  um: "µm",
  micron: "µm",
  microns: "µm",
  micrometer: "µm",
  micrometers: "µm",
  micrometre: "µm",
  micrometres: "µm",
  mm: "mm",
  millimeter: "mm",
  millimeters: "mm",
  millimetre: "mm",
  millimetres: "mm",
  in: "in",
  inch: "in",
  inches: "in",
  '"': "in",
  mil: "mil",
  mils: "mil",
  thou: "mil",
  "°c": "°C",
  degc: "°C",
  c: "°C",
  celsius: "°C",
  degcelsius: "°C",
  k: "K",
  kelvin: "K",
  "°f": "°F",
  degf: "°F",
  f: "°F",
  fahrenheit: "°F",
  "%": "%",
  pct: "%",
  percent: "%",
  fraction: "fraction",
  frac: "fraction",
};

function spellingKey(text: string): string {
  return (
    text
      // ordinal indicator º and ring above ˚ are common stand-ins for the degree sign
      .replace(/[\u00BA\u02DA]/g, "°")
      .normalize("NFKC") // ℃ -> °C, ℉ -> °F, ⁻¹ -> -1, micro sign -> Greek mu
      .replace(/\u03BC/g, "µ")
      .replace(/\u2212/g, "-")
      .toLowerCase()
      .replace(/[\s·*^]+/g, "")
  );
}

/**
 * The normalized spelling of a unit, or null when the text is no unit this module knows.
 * Case-insensitive; the Greek mu (U+03BC) and the micro sign (U+00B5) both give "µm" (micro sign).
 *
 * @example
 * normalizeUnit("μm");     // "µm"
 * normalizeUnit("mm/sec"); // "mm/s"
 * normalizeUnit("deg C");  // "°C"
 * normalizeUnit("kg");     // null
 */
export function normalizeUnit(text: string): string | null {
  if (Object.hasOwn(UNIT_DEFS, text)) return text; // already normalized: the common case
  const key = spellingKey(text);
  if (key === "") return null;
  return SPELLINGS[key] ?? null;
}

/**
 * The units a form offers for a quantity, canonical first.
 *
 * @example
 * unitOptions("laserPower").map((o) => o.id); // ["W", "kW"]
 */
export function unitOptions(quantity: Quantity): readonly UnitOption[] {
  return OPTIONS_OF[quantity];
}

/**
 * Whether a unit (any accepted spelling) applies to a quantity.
 *
 * @example
 * isUnitFor("um", "hatchSpacing"); // true
 * isUnitFor("mil", "spotDiameter"); // false
 */
export function isUnitFor(unit: string, quantity: Quantity): boolean {
  const id = normalizeUnit(unit);
  return id !== null && UNITS_OF[quantity].includes(id);
}

/** Human name of a quantity for messages and labels. @example quantityLabel("scanSpeed"); // "scan speed" */
export function quantityLabel(quantity: Quantity): string {
  return LABELS[quantity];
}

function unitList(quantity: Quantity): string {
  const ids = UNITS_OF[quantity];
  if (ids.length === 1) return ids[0] ?? "";
  return `${ids.slice(0, -1).join(", ")} or ${ids[ids.length - 1]}`;
}

function requireUnit(fn: string, unit: string, quantity: Quantity): UnitDef {
  const id = normalizeUnit(unit);
  if (id === null || !UNITS_OF[quantity].includes(id)) {
    throw new RangeError(`${fn}: '${unit}' is not a unit of ${LABELS[quantity]} (use ${unitList(quantity)})`);
  }
  return unitDef(id);
}

function requireFinite(fn: string, value: number): void {
  if (!Number.isFinite(value)) throw new RangeError(`${fn}: value must be a finite number, got ${value}`);
}

/**
 * Removes binary floating-point noise from a converted value (0.07 mm -> 70 µm, not
 * 70.00000000000001). 15 significant digits is the precision a double always holds.
 */
function clean(value: number): number {
  return value === 0 ? 0 : Number(value.toPrecision(15));
}

/**
 * Converts a value in `unit` to the canonical unit of the quantity.
 * Throws RangeError for a unit that does not apply or a value that is not finite.
 *
 * @example
 * toCanonical(0.8, "m/s", "scanSpeed");   // 800
 * toCanonical(2, "mil", "layerThickness"); // 50.8
 * toCanonical(300, "K", "preheat");        // 26.85
 */
export function toCanonical(value: number, unit: string, quantity: Quantity): number {
  requireFinite("toCanonical", value);
  const { conversion: c } = requireUnit("toCanonical", unit, quantity);
  if (c.kind === "ratio") return c.num === c.den ? value : clean((value * c.num) / c.den);
  return c.scale === 1 && c.offset === 0 ? value : clean(value * c.scale + c.offset);
}

/**
 * Converts a canonical value of the quantity to `unit`.
 * Throws RangeError for a unit that does not apply or a value that is not finite.
 *
 * @example
 * fromCanonical(800, "m/s", "scanSpeed"); // 0.8
 * fromCanonical(20, "°F", "preheat");     // 68
 */
export function fromCanonical(value: number, unit: string, quantity: Quantity): number {
  requireFinite("fromCanonical", value);
  const { conversion: c } = requireUnit("fromCanonical", unit, quantity);
  if (c.kind === "ratio") return c.num === c.den ? value : clean((value * c.den) / c.num);
  return c.scale === 1 && c.offset === 0 ? value : clean((value - c.offset) / c.scale);
}

export type ParsedQuantity =
  | { ok: true; value: number; unit: string; text: string }
  | { ok: false; message: string };

// sign, mantissa of digits with dots and commas, optional exponent; the rest is the unit
const NUMBER_AT_START = /^([+\-\u2212]?)([\d.,]+)(?:[eE]([+\-\u2212]?\d+))?(.*)$/s;

/**
 * Reads the mantissa under the decimal-comma rule (see parseQuantity). Returns the mantissa in
 * JavaScript syntax or null when it cannot be read without guessing.
 */
function readMantissa(m: string): string | null {
  const commas = (m.match(/,/g) ?? []).length;
  const dots = (m.match(/\./g) ?? []).length;
  if (dots > 1) return null;
  if (commas > 0 && dots === 1) {
    // "1,234.5": commas are thousands separators and must group by three
    return /^\d{1,3}(,\d{3})+\.\d*$/.test(m) ? m.replace(/,/g, "") : null;
  }
  if (commas === 1) return /^\d*,\d+$/.test(m) ? m.replace(",", ".") : null; // decimal comma
  if (commas > 1) return null;
  return /^(\d+\.?\d*|\.\d+)$/.test(m) ? m : null;
}

/**
 * Reads a value typed with its unit and converts it to the quantity's canonical unit.
 *
 * - A bare number takes `defaultUnit` (e.g. the unit from a column header), else the canonical unit.
 * - Decimal commas: a single comma without a dot is a decimal comma ("0,1 mm" is 0.1 mm, and so
 *   "1,000 mm/s" is 1 mm/s, which the plausibility checks then flag). Commas together with one dot
 *   are thousands separators and must group by three ("1,234.5" is 1234.5). Anything else
 *   ("1,000,000", "1.234.5", "1 000") is refused rather than guessed.
 * - Limits are not checked here: a negative power parses; `checkHardLimit` judges it.
 *
 * @example
 * parseQuantity("0.8 m/s", "scanSpeed");        // { ok: true, value: 800, unit: "m/s", text: "0.8 m/s" }
 * parseQuantity("0,1", "hatchSpacing", "mm");   // { ok: true, value: 100, unit: "mm", text: "0,1" }
 * parseQuantity("200 kg", "laserPower").ok;     // false
 */
export function parseQuantity(text: string, quantity: Quantity, defaultUnit?: string): ParsedQuantity {
  const label = LABELS[quantity];
  const howTo = `enter a number with a unit such as ${EXAMPLES[quantity]}`;
  const trimmed = text.trim();
  if (trimmed === "") return { ok: false, message: `No ${label} entered: ${howTo}.` };

  const match = NUMBER_AT_START.exec(trimmed);
  const mantissa = match ? readMantissa(match[2] ?? "") : null;
  if (!match || mantissa === null) {
    return { ok: false, message: `Cannot read '${trimmed}' as a ${label}: ${howTo}.` };
  }
  const sign = match[1] === "\u2212" ? "-" : (match[1] ?? "");
  const exponent = (match[3] ?? "").replace("\u2212", "-");
  const number = Number(`${sign}${mantissa}${exponent === "" ? "" : `e${exponent}`}`);
  if (!Number.isFinite(number)) {
    return { ok: false, message: `Cannot read '${trimmed}' as a ${label}: the number is too large; ${howTo}.` };
  }

  const unitText = (match[4] ?? "").trim();
  if (/^\d/.test(unitText)) {
    return {
      ok: false,
      message: `Cannot read '${trimmed}' as a ${label}: write the number without spaces or thousands separators, e.g. ${EXAMPLES[quantity]}.`,
    };
  }
  const given = unitText !== "" ? unitText : (defaultUnit ?? CANONICAL_UNIT[quantity]);
  const unit = normalizeUnit(given);
  if (unit === null || !UNITS_OF[quantity].includes(unit)) {
    return { ok: false, message: `'${given}' is not a unit of ${label}: use ${unitList(quantity)}.` };
  }
  const value = toCanonical(number, unit, quantity);
  if (!Number.isFinite(value)) {
    return { ok: false, message: `Cannot read '${trimmed}' as a ${label}: the number is too large; ${howTo}.` };
  }
  return { ok: true, value, unit, text };
}

export interface HeaderUnit {
  name: string;
  unit: string | null;
}

// "Name (unit)" or "Name [unit]"
const BRACKETED = /^(.*?)\s*[([]\s*([^()[\]]+?)\s*[)\]]\s*$/s;
// "Name unit", "Name_unit", "Name, unit"
const TRAILING = /^(.*?\S)(\s+|\s*_\s*|\s*,\s*)([^\s_,]+)$/s;
// "speed_mm_s" -> "mm/s"
const TRAILING_PER = /^(.*?\S)_([a-zA-Zµμ]+)_([a-zA-Z]+)$/s;

/**
 * Splits a spreadsheet header into a name and a normalized unit.
 * Recognized: a unit in round or square brackets at the end, a unit after an underscore or comma,
 * a unit after a space (single-letter spellings such as "C" or "W" only in brackets or after an
 * underscore or comma, so "Sample C" keeps its name), and "speed_mm_s" for per-second units.
 * A header without a known unit gives unit null (the importer then asks).
 *
 * @example
 * parseHeaderUnit("Speed [m/s]");      // { name: "Speed", unit: "m/s" }
 * parseHeaderUnit("D50 μm");           // { name: "D50", unit: "µm" }
 * parseHeaderUnit("Power");            // { name: "Power", unit: null }
 */
export function parseHeaderUnit(header: string): HeaderUnit {
  const trimmed = header.trim().replace(/\s+/g, " ");

  const bracketed = BRACKETED.exec(trimmed);
  if (bracketed) {
    const unit = normalizeUnit(bracketed[2] ?? "");
    const name = (bracketed[1] ?? "").trim();
    if (unit !== null && name !== "") return { name, unit };
  }

  const per = TRAILING_PER.exec(trimmed);
  if (per) {
    const unit = normalizeUnit(`${per[2]}/${per[3]}`);
    if (unit !== null) return { name: (per[1] ?? "").trim(), unit };
  }

  const trailing = TRAILING.exec(trimmed);
  if (trailing) {
    const token = trailing[3] ?? "";
    const separatedBySpace = (trailing[2] ?? "").trim() === "";
    const unit = normalizeUnit(token);
    const singleLetter = /^[a-zA-Z]$/.test(token);
    if (unit !== null && !(singleLetter && separatedBySpace)) {
      return { name: (trailing[1] ?? "").trim(), unit };
    }
  }
  return { name: trimmed, unit: null };
}

export interface HardLimit {
  min: number;
  minInclusive: boolean;
  max: number | null;
}

/**
 * Values outside these are errors, in canonical units (DOMAIN.md, "Quantities and units").
 * Relative density up to 101 % passes here; 100–101 % is a warning raised elsewhere (a
 * reference-density issue).
 */
export const HARD_LIMITS: Record<Quantity, HardLimit> = {
  laserPower: { min: 0, minInclusive: false, max: 10_000 },
  scanSpeed: { min: 0, minInclusive: false, max: 20_000 },
  hatchSpacing: { min: 0, minInclusive: false, max: 2_000 },
  layerThickness: { min: 0, minInclusive: false, max: 1_000 },
  spotDiameter: { min: 0, minInclusive: false, max: 2_000 },
  preheat: { min: -KELVIN_AT_ZERO_CELSIUS, minInclusive: true, max: null }, // absolute zero
  powderSize: { min: 0, minInclusive: false, max: null },
  relativeDensity: { min: 0, minInclusive: true, max: 101 },
};

/**
 * Ranges outside which a value earns a warning, in canonical units. Common practice, from
 * memory (DOMAIN.md, "Quantities and units"): defaults only, so a check that uses them should
 * accept ranges of its own.
 */
export const PLAUSIBLE_RANGES: Record<Quantity, { min: number; max: number }> = {
  laserPower: { min: 20, max: 1_000 },
  scanSpeed: { min: 50, max: 5_000 },
  hatchSpacing: { min: 20, max: 300 },
  layerThickness: { min: 10, max: 150 },
  spotDiameter: { min: 20, max: 300 },
  preheat: { min: 20, max: 500 },
  powderSize: { min: 5, max: 150 },
  relativeDensity: { min: 80, max: 100 },
};

function formatNumber(value: number): string {
  return value.toLocaleString("en-US", { maximumFractionDigits: 6 });
}

function sentenceCase(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/**
 * Whether a canonical value is inside the quantity's hard limits (checkHardLimit without the message).
 *
 * @example
 * withinHardLimit(200, "laserPower"); // true
 */
export function withinHardLimit(value: number, quantity: Quantity): boolean {
  const { min, minInclusive, max } = HARD_LIMITS[quantity];
  if (!Number.isFinite(value)) return false;
  if (minInclusive ? value < min : value <= min) return false;
  return max === null || value <= max;
}

/**
 * Null when a canonical value is inside the quantity's hard limits, else a message that names
 * the limit and the canonical unit.
 *
 * @example
 * checkHardLimit(200, "laserPower");    // null
 * checkHardLimit(12000, "laserPower");  // "Laser power must be at most 10,000 W; got 12,000 W."
 */
export function checkHardLimit(value: number, quantity: Quantity): string | null {
  if (withinHardLimit(value, quantity)) return null;
  const { min, minInclusive, max } = HARD_LIMITS[quantity];
  const unit = CANONICAL_UNIT[quantity];
  const name = sentenceCase(LABELS[quantity]);
  const show = (x: number) => `${formatNumber(x)} ${unit}`;
  if (!Number.isFinite(value)) return `${name} must be a finite number of ${unit}; got ${value}.`;
  if (minInclusive ? value < min : value <= min) {
    const bound = minInclusive ? "at least" : "greater than";
    const why = quantity === "preheat" ? " (absolute zero)" : "";
    return `${name} must be ${bound} ${show(min)}${why}; got ${show(value)}.`;
  }
  if (max !== null && value > max) return `${name} must be at most ${show(max)}; got ${show(value)}.`;
  return null;
}
