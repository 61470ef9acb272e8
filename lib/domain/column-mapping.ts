/**
 * Mapping the columns of an imported table (CSV, XLSX, pasted text, a table read from a PDF) to
 * the fields of a build record: guessing from header names, reading units out of headers, and
 * checking a mapping before any row is read (a field mapped twice, a unit that cannot apply).
 */
import { CANONICAL_UNIT, isUnitFor, normalizeUnit, parseHeaderUnit, quantityLabel, unitOptions, type Quantity } from "./units";

/** Record fields entered as a number with a unit, and the quantity each one is. */
export const IMPORT_QUANTITY_FIELDS = {
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

export type ImportQuantityField = keyof typeof IMPORT_QUANTITY_FIELDS;

/** Record fields taken as text, plus `doi`, which assigns the row to a source. */
export const IMPORT_TEXT_FIELDS = ["alloy", "composition", "machine", "atmosphere", "scanStrategy", "outcome", "spotDefinition", "locationPage", "locationLabel", "doi"] as const;
export type ImportTextField = (typeof IMPORT_TEXT_FIELDS)[number];

export type ImportField = ImportQuantityField | ImportTextField;

export const IMPORT_FIELDS: readonly ImportField[] = [...(Object.keys(IMPORT_QUANTITY_FIELDS) as ImportQuantityField[]), ...IMPORT_TEXT_FIELDS];

const FIELD_LABELS: Record<ImportField, string> = {
  laserPower: "laser power",
  scanSpeed: "scan speed",
  hatchSpacing: "hatch spacing",
  layerThickness: "layer thickness",
  spotDiameter: "spot diameter",
  preheat: "preheat",
  powderD10: "powder D10",
  powderD50: "powder D50",
  powderD90: "powder D90",
  relativeDensity: "relative density",
  alloy: "alloy",
  composition: "composition",
  machine: "machine",
  atmosphere: "atmosphere",
  scanStrategy: "scan strategy",
  outcome: "outcome",
  spotDefinition: "spot size definition",
  locationPage: "page",
  locationLabel: "location (table or figure)",
  doi: "source DOI",
};

/** Human name of an import field. @example importFieldLabel("powderD50"); // "powder D50" */
export function importFieldLabel(field: ImportField): string {
  return FIELD_LABELS[field];
}

/** Whether a string names an import field. @example isImportField("hatchSpacing"); // true */
export function isImportField(value: string): value is ImportField {
  return (IMPORT_FIELDS as readonly string[]).includes(value);
}

/** The quantity of a field, or null for a text field. @example quantityOfField("powderD90"); // "powderSize" */
export function quantityOfField(field: ImportField): Quantity | null {
  return Object.hasOwn(IMPORT_QUANTITY_FIELDS, field) ? IMPORT_QUANTITY_FIELDS[field as ImportQuantityField] : null;
}

/** One column's rule in a saved mapping: the field it fills (null: leave the column out) and its unit. */
export interface ColumnRule {
  field: ImportField | null;
  unit?: string | null;
}

/** Values applied to every row when no column carries them (e.g. the alloy named in a caption). */
export interface ImportDefaults {
  alloy?: string | null;
  machine?: string | null;
  atmosphere?: string | null;
  outcome?: string | null;
  locationLabel?: string | null;
}

/**
 * A column mapping as saved per source, as a named preset, or in a --mapping file. Columns are keyed
 * by their header text, or by "#N" (N from 1) for a table whose headers repeat or are missing.
 */
export interface ImportMapping {
  columns: Record<string, ColumnRule | null>;
  defaults?: ImportDefaults;
}

export interface ResolvedColumn {
  /** 0-based position in the row. */
  index: number;
  header: string;
  field: ImportField | null;
  /** Normalized unit for a quantity field; null for text fields and left-out columns. */
  unit: string | null;
  /** Where the unit came from. */
  unitFrom: "mapping" | "header" | "assumed" | null;
}

export interface MappingIssue {
  severity: "error" | "warning";
  /** The record field concerned, or "mapping" for the mapping as a whole. */
  field: string;
  /** The header of the column concerned, if one. */
  column: string | null;
  message: string;
}

export interface ResolvedMapping {
  columns: ResolvedColumn[];
  defaults: ImportDefaults;
  issues: MappingIssue[];
  /** Headers of columns that fill no field. */
  unmapped: string[];
  /** The mapping in saved form (what a preset stores). */
  mapping: ImportMapping;
}

const fold = (s: string) =>
  s
    .normalize("NFKD")
    .replace(/\p{M}/gu, "")
    .toLowerCase()
    .replace(/[^\p{L}\p{N}]+/gu, " ")
    .trim();

/**
 * Header names papers and datasets use, tried in order on the folded name (lower case, punctuation
 * as spaces, unit removed). Anchored where a loose match would catch another column ("Density
 * Measurement Method" is not a relative density).
 */
const HEADER_RULES: readonly [ImportField, RegExp][] = [
  ["doi", /^(source )?doi( link| url)?$|^digital object identifier$/],
  ["powderD10", /^(powder )?d ?10$/],
  ["powderD50", /^(powder )?d ?50$|^(median|mean) (particle|powder) size$|^particle size$|^powder size$/],
  ["powderD90", /^(powder )?d ?90$/],
  ["relativeDensity", /^(rd|rel density|relative density|density|relative density rd|rd relative density|densification|relative density measured)$/],
  ["laserPower", /^(laser )?power( p)?$|^p$|^lp$|^power w$/],
  ["scanSpeed", /^(laser )?(scan(ning)? )?(speed|velocity)( v)?$|^v$|^vs$/],
  ["hatchSpacing", /^hatch( spacing| space| distance)?( h)?$|^h$|^hs$/],
  ["layerThickness", /^(powder )?layer( thickness| height)?( t)?$|^t$|^lt$/],
  ["spotDiameter", /^(laser )?(spot|beam)( size| diameter)?( d)?$|^d$/],
  ["preheat", /^pre ?heat(ing)?( temperature)?$|^(platform|plate|baseplate|build plate|substrate) (temperature|temp|preheat)$/],
  ["alloy", /^(material|alloy|alloy name|powder|powder material|grade|alloy grade)$/],
  ["composition", /^(composition|chemical composition|measured composition)$/],
  ["machine", /^(printer|machine|system)( model| name| type)?$|^(lpbf|slm|am) (machine|system|printer)$/],
  ["atmosphere", /^(atmosphere|shielding gas|inert gas|gas|process gas|build atmosphere)$/],
  ["scanStrategy", /^(scan(ning)? )?(strategy|pattern)$/],
  ["outcome", /^(outcome|label|class|result|defect|defect type|defect mode|melt mode|quality|category|printability)$/],
  ["spotDefinition", /^spot (size )?definition$/],
  ["locationPage", /^page$/],
  ["locationLabel", /^(location|table|figure|fig)$/],
];

/**
 * The field a header names, or null. The unit is read separately (see `parseHeaderUnit`).
 *
 * @example
 * guessField("Hatch space (mm)"); // "hatchSpacing"
 * guessField("Density Measurement Method"); // null
 */
export function guessField(header: string): ImportField | null {
  const name = fold(parseHeaderUnit(header).name);
  for (const [field, pattern] of HEADER_RULES) if (pattern.test(name)) return field;
  return null;
}

/**
 * The key a mapping uses for a column: its header, or "#N" when the header is empty or repeated.
 *
 * @example columnKey(["P", "P", "v"], 1); // "#2"
 */
export function columnKey(headers: readonly string[], index: number): string {
  const h = headers[index]?.trim() ?? "";
  const repeated = headers.filter((x) => x.trim() === h).length > 1;
  return h === "" || repeated ? `#${index + 1}` : h;
}

/**
 * A first mapping from the headers alone: fields from header names, units from headers. Two
 * columns that name the same field are both mapped to it, so that `resolveMapping` reports the
 * ambiguity instead of silently choosing one.
 *
 * @example
 * guessMapping(["Laser Power (W)", "DOI"]).columns; // { "Laser Power (W)": { field: "laserPower", unit: "W" }, DOI: { field: "doi" } }
 */
export function guessMapping(headers: readonly string[]): ImportMapping {
  const columns: Record<string, ColumnRule | null> = {};
  headers.forEach((header, index) => {
    const key = columnKey(headers, index);
    const field = guessField(header);
    if (!field) {
      columns[key] = null;
      return;
    }
    const quantity = quantityOfField(field);
    const unit = quantity ? parseHeaderUnit(header).unit : null;
    columns[key] = quantity ? { field, unit } : { field };
  });
  return { columns };
}

function unitList(quantity: Quantity): string {
  return unitOptions(quantity)
    .map((o) => o.id)
    .join(", ");
}

/**
 * Checks a mapping against a table's headers and resolves every column to a field and unit. Errors
 * stop the import before any row is read: a column the mapping names that the table lacks, an
 * unknown field, a field mapped from two columns, a unit that cannot apply to the field's quantity,
 * no column or default for the alloy, laser power or scan speed. A quantity column with no unit
 * anywhere is a warning and is read in the canonical unit. With `mapping` null, the mapping is
 * guessed from the headers.
 *
 * @example
 * resolveMapping(["P (W)", "v (m/s)", "Alloy"], null).columns.map((c) => c.unit); // ["W", "m/s", null]
 * resolveMapping(["P", "Q"], { columns: { P: { field: "laserPower" }, Q: { field: "laserPower" } } }).issues[0].message;
 * // 'Laser power is mapped from two columns ("P" and "Q"); map it once.'
 */
export function resolveMapping(headers: readonly string[], mapping: ImportMapping | null, options: { requireSource?: boolean } = {}): ResolvedMapping {
  const saved: ImportMapping = mapping ?? guessMapping(headers);
  const defaults = saved.defaults ?? {};
  const issues: MappingIssue[] = [];
  const keys = headers.map((_, i) => columnKey(headers, i));
  const columns: ResolvedColumn[] = headers.map((header, index) => ({ index, header, field: null, unit: null, unitFrom: null }));

  for (const [key, rule] of Object.entries(saved.columns)) {
    const byNumber = /^#(\d+)$/.exec(key);
    const index = byNumber ? Number(byNumber[1]) - 1 : keys.indexOf(key);
    if (index < 0 || index >= headers.length) {
      if (rule?.field) {
        const repeated = headers.filter((h) => h.trim() === key).length > 1;
        issues.push({
          severity: "error",
          field: rule.field,
          column: key,
          message: repeated
            ? `The header "${key}" appears more than once; name the column by its position instead (e.g. "#${headers.findIndex((h) => h.trim() === key) + 1}").`
            : `The mapping names a column "${key}" that this table does not have.`,
        });
      }
      continue;
    }
    const col = columns[index]!;
    if (!rule || rule.field === null) continue;
    if (typeof rule.field !== "string" || !isImportField(rule.field)) {
      issues.push({ severity: "error", field: String(rule.field), column: col.header, message: `Column "${col.header}": "${String(rule.field)}" is not a field of a build record.` });
      continue;
    }
    col.field = rule.field;
    const quantity = quantityOfField(rule.field);
    const given = rule.unit?.trim() ? rule.unit.trim() : null;
    if (!quantity) {
      if (given) issues.push({ severity: "error", field: rule.field, column: col.header, message: `Column "${col.header}": ${importFieldLabel(rule.field)} takes no unit, but the mapping gives "${given}".` });
      continue;
    }
    const fromHeader = parseHeaderUnit(col.header).unit;
    const unit = given ?? fromHeader;
    if (unit === null) {
      col.unit = CANONICAL_UNIT[quantity];
      col.unitFrom = "assumed";
      issues.push({
        severity: "warning",
        field: rule.field,
        column: col.header,
        message: `Column "${col.header}" states no unit; its values are read as ${CANONICAL_UNIT[quantity]}. Choose the unit if the table uses another (${unitList(quantity)}).`,
      });
      continue;
    }
    if (!isUnitFor(unit, quantity)) {
      const known = normalizeUnit(unit) !== null;
      issues.push({
        severity: "error",
        field: rule.field,
        column: col.header,
        message: `Column "${col.header}": ${known ? `${unit} cannot apply to ${quantityLabel(quantity)}` : `"${unit}" is not a unit this workbench knows`}; use ${unitList(quantity)}.`,
      });
      continue;
    }
    col.unit = normalizeUnit(unit);
    col.unitFrom = given ? "mapping" : "header";
  }

  const byField = new Map<ImportField, ResolvedColumn[]>();
  for (const c of columns) if (c.field) byField.set(c.field, [...(byField.get(c.field) ?? []), c]);
  for (const [field, cols] of byField) {
    if (cols.length < 2) continue;
    const label = importFieldLabel(field);
    issues.push({
      severity: "error",
      field,
      column: cols.map((c) => c.header).join(", "),
      message: `${label.charAt(0).toUpperCase()}${label.slice(1)} is mapped from ${cols.length === 2 ? "two" : cols.length} columns (${cols.map((c) => `"${c.header}"`).join(" and ")}); map it once.`,
    });
  }

  const has = (f: ImportField) => byField.has(f);
  if (!has("alloy") && !defaults.alloy?.trim()) {
    issues.push({ severity: "error", field: "alloy", column: null, message: "No column is mapped to the alloy; map one or give the alloy for every row." });
  }
  for (const f of ["laserPower", "scanSpeed"] as const) {
    if (!has(f)) issues.push({ severity: "error", field: f, column: null, message: `No column is mapped to ${importFieldLabel(f)}; every build record needs it.` });
  }
  if (options.requireSource && !has("doi")) {
    issues.push({ severity: "error", field: "doi", column: null, message: "Choose the source these rows come from, or map a column of DOIs." });
  }

  return {
    columns,
    defaults,
    issues,
    unmapped: columns.filter((c) => c.field === null).map((c) => c.header),
    mapping: saved,
  };
}

/** Whether any issue stops the import. @example hasMappingErrors([{ severity: "warning", field: "x", column: null, message: "" }]); // false */
export function hasMappingErrors(issues: readonly MappingIssue[]): boolean {
  return issues.some((i) => i.severity === "error");
}
