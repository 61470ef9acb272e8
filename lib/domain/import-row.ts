/**
 * One imported row as a record input: cells placed in their fields with the column's unit, the
 * cell text kept as written, outcome words mapped to the vocabulary, the DOI cell normalized.
 * Validation of values (units, limits) is the record schema's job downstream; this step reports
 * only what it alone can see (a DOI cell that is no DOI, an outcome word it does not know).
 */
import { quantityOfField, type ImportDefaults, type ImportQuantityField, type ResolvedColumn } from "./column-mapping";
import { normalizeDoi } from "./doi";
import { mapOutcome } from "./outcomes";

/** A record's fields as cells give them; the shape the record input schema reads (less source and status). */
export interface RowRecordInput {
  alloy: string;
  composition: string | null;
  machine: string | null;
  atmosphere: string | null;
  scanStrategy: string | null;
  outcome: string;
  outcomeText: string | null;
  spotDefinition: string | null;
  locationPage: string | null;
  locationLabel: string | null;
  laserPower?: { value: string; unit: string };
  scanSpeed?: { value: string; unit: string };
  hatchSpacing?: { value: string; unit: string };
  layerThickness?: { value: string; unit: string };
  spotDiameter?: { value: string; unit: string };
  preheat?: { value: string; unit: string };
  powderD10?: { value: string; unit: string };
  powderD50?: { value: string; unit: string };
  powderD90?: { value: string; unit: string };
  relativeDensity?: { value: string; unit: string };
}

export interface RowProblem {
  /** 1-based data row (the first row after the header is 1). */
  row: number;
  field: string;
  severity: "error" | "warning";
  message: string;
}

export interface MappedRow {
  input: RowRecordInput;
  /** Normalized DOI from the row's DOI cell; null when there is no DOI column or the cell is empty. */
  doi: string | null;
  /** A web address found in the DOI column instead of a DOI: the source is known by it. */
  sourceUrl: string | null;
  problems: RowProblem[];
  /** Every cell of the row was empty. */
  blank: boolean;
}

// cells that mean "not reported" in a numeric column
const NOT_REPORTED = /^(-+|–|—|n\/?a|n\.a\.|nr|n\.r\.|not reported|\?|none)$/i;
// a cell that carries its own unit after the number ("200 W", "0.1mm", "99.5 %")
const CELL_HAS_UNIT = /\d\s*[^\d\s.,+\-eE]\S*$/;

const SPOT_DEFINITIONS: Record<string, string> = {
  "1/e2": "one_over_e2", "1/e^2": "one_over_e2", "1/e²": "one_over_e2", one_over_e2: "one_over_e2",
  d4sigma: "d4sigma", "d4σ": "d4sigma", "second moment": "d4sigma", fwhm: "fwhm",
};

const tidy = (s: string) => s.replace(/\s+/g, " ").trim();

/**
 * Places one row's cells into a record input.
 *
 * @example
 * const cols = resolveMapping(["Alloy", "P (W)", "v (m/s)"], null).columns;
 * mapImportRow(["316L", "200", "0,8"], cols, {}, 1).input.scanSpeed; // { value: "0,8", unit: "m/s" }
 */
export function mapImportRow(cells: readonly string[], columns: readonly ResolvedColumn[], defaults: ImportDefaults, row: number): MappedRow {
  const input: RowRecordInput = {
    alloy: tidy(defaults.alloy ?? ""),
    composition: null,
    machine: defaults.machine?.trim() || null,
    atmosphere: defaults.atmosphere?.trim() || null,
    scanStrategy: null,
    outcome: "unknown",
    outcomeText: null,
    spotDefinition: null,
    locationPage: null,
    locationLabel: defaults.locationLabel?.trim() || null,
  };
  const problems: RowProblem[] = [];
  let doi: string | null = null;
  let sourceUrl: string | null = null;
  let outcomeText = defaults.outcome?.trim() || null;
  let blank = true;

  for (const col of columns) {
    const raw = cells[col.index];
    const text = raw === undefined ? "" : String(raw).trim();
    if (text !== "") blank = false;
    if (!col.field) continue;
    const quantity = quantityOfField(col.field);
    if (quantity) {
      if (text === "" || NOT_REPORTED.test(text)) continue;
      input[col.field as ImportQuantityField] = CELL_HAS_UNIT.test(text) ? { value: text, unit: "" } : { value: text, unit: col.unit ?? "" };
      continue;
    }
    if (text === "") continue;
    switch (col.field) {
      case "alloy":
        input.alloy = tidy(text);
        break;
      case "composition":
      case "machine":
      case "atmosphere":
      case "scanStrategy":
      case "locationLabel":
        // kept exactly as entered: spelling variants are for review to see, not for import to hide
        input[col.field] = text;
        break;
      case "locationPage":
        input.locationPage = text;
        break;
      case "outcome":
        outcomeText = text;
        break;
      case "spotDefinition": {
        const d = SPOT_DEFINITIONS[text.toLowerCase().replace(/\s+/g, "")] ?? SPOT_DEFINITIONS[text.toLowerCase()];
        if (d) input.spotDefinition = d;
        else problems.push({ row, field: "spotDefinition", severity: "error", message: `Column "${col.header}": "${text}" is not a spot size definition (use 1/e2, D4sigma or FWHM).` });
        break;
      }
      case "doi": {
        const n = normalizeDoi(text);
        if (n) doi = n;
        else if (/^https?:\/\/[^\s/]+\.[^\s]+$/i.test(text)) {
          // compiled datasets sometimes give a publisher's page where the DOI belongs
          sourceUrl = text;
          problems.push({ row, field: "doi", severity: "warning", message: `Column "${col.header}": "${text}" is a web address, not a DOI; the row is assigned to the source with that address.` });
        } else problems.push({ row, field: "doi", severity: "error", message: `Column "${col.header}": "${text.length > 80 ? `${text.slice(0, 79)}…` : text}" is not a DOI (it should look like 10.5555/abc).` });
        break;
      }
    }
  }

  if (outcomeText) {
    const mapped = mapOutcome(outcomeText);
    input.outcome = mapped.outcome;
    input.outcomeText = outcomeText;
    if (!mapped.matched) {
      problems.push({ row, field: "outcome", severity: "warning", message: `The outcome "${outcomeText}" is not a word this workbench knows; it is kept as written and the outcome set to unknown.` });
    }
  }
  return { input, doi, sourceUrl, problems, blank };
}
