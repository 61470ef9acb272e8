/**
 * Turns the before/after snapshots of an audit event into readable field changes. Snapshots are
 * JSON objects; nested objects are flattened with dotted keys, and the "as entered" values
 * ({ text, unit, provenance }) print as the user typed them.
 */

export interface FieldChange {
  key: string;
  label: string;
  before: string;
  after: string;
}

import { outcomeText, spotDefinitionShort, statusLabel } from "./labels";

/** Stored ids shown by their labels. */
const VALUE_LABEL: Record<string, (v: string) => string> = {
  status: statusLabel,
  outcome: outcomeText,
  spotDefinition: spotDefinitionShort,
  spotSizeDefinition: spotDefinitionShort,
};

/** Bookkeeping columns that change on every save and say nothing to a reader. */
const SKIPPED = new Set(["id", "version", "titleKey", "createdAt", "updatedAt", "createdById", "updatedById"]);

const LABELS: Record<string, string> = {
  sourceId: "Source",
  locationPage: "Page",
  locationLabel: "Location",
  materialId: "Material id",
  alloyKey: "Alloy",
  machine: "Machine",
  laserPowerW: "Laser power (W)",
  scanSpeedMmPerS: "Scan speed (mm/s)",
  hatchSpacingUm: "Hatch spacing (µm)",
  layerThicknessUm: "Layer thickness (µm)",
  spotDiameterUm: "Spot diameter, 1/e² (µm)",
  spotDefinition: "Spot definition",
  preheatC: "Preheat (°C)",
  atmosphere: "Atmosphere",
  scanStrategy: "Scan strategy",
  powderD10Um: "Powder D10 (µm)",
  powderD50Um: "Powder D50 (µm)",
  powderD90Um: "Powder D90 (µm)",
  outcome: "Outcome",
  outcomeText: "Outcome as written",
  relativeDensityPct: "Relative density (%)",
  volumetricEnergyJMm3: "E_v (J/mm³)",
  status: "Status",
  qualityScore: "Quality score",
  mergedIntoId: "Merged into",
  importRunId: "Import run",
  importFile: "Import file",
  importRow: "Import row",
  kind: "Kind",
  title: "Title",
  authors: "Authors",
  year: "Year",
  venue: "Venue",
  doi: "DOI",
  url: "Web address",
  notes: "Notes",
  densityMethod: "Density method",
  outcomeEvidence: "Outcome evidence",
  machineStated: "Machine stated",
  spotSizeDefinition: "Spot size definition",
  powderReported: "Powder size reported",
  atmosphereReported: "Atmosphere reported",
  qualityOverride: "Quality override",
  qualityOverrideReason: "Quality override reason",
};

const ENTERED_LABELS: Record<string, string> = {
  laserPower: "Laser power",
  scanSpeed: "Scan speed",
  hatchSpacing: "Hatch spacing",
  layerThickness: "Layer thickness",
  spotDiameter: "Spot diameter",
  preheat: "Preheat",
  powderD10: "Powder D10",
  powderD50: "Powder D50",
  powderD90: "Powder D90",
  relativeDensity: "Relative density",
};

function humanize(key: string): string {
  const spaced = key.replace(/([a-z0-9])([A-Z])/g, "$1 $2").replace(/[._]/g, " ").toLowerCase();
  return spaced.charAt(0).toUpperCase() + spaced.slice(1);
}

/** Label of a flattened key: "enteredValues.scanSpeed" -> "Scan speed as entered". */
export function fieldLabel(key: string): string {
  if (key.startsWith("enteredValues.")) {
    const field = key.slice("enteredValues.".length);
    return `${ENTERED_LABELS[field] ?? humanize(field)} as entered`;
  }
  return LABELS[key] ?? humanize(key);
}

function isPlainObject(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

function isEntered(v: unknown): v is { text: unknown; unit?: unknown; provenance?: unknown } {
  return isPlainObject(v) && "text" in v;
}

/** One value as text: "—" for nothing, yes/no for booleans, lists joined, entered values as typed. */
export function formatAuditValue(v: unknown): string {
  if (v === null || v === undefined || v === "") return "—";
  if (typeof v === "boolean") return v ? "yes" : "no";
  if (typeof v === "number") return Number.isFinite(v) ? v.toLocaleString("en-US", { maximumFractionDigits: 4 }) : String(v);
  if (typeof v === "string") return v;
  if (Array.isArray(v)) return v.length ? v.map(formatAuditValue).join("; ") : "—";
  if (isEntered(v)) {
    const text = [String(v.text ?? ""), String(v.unit ?? "")].filter(Boolean).join(" ");
    return v.provenance && v.provenance !== "reported" ? `${text} (${String(v.provenance)})` : text;
  }
  return JSON.stringify(v);
}

/** Flattens a snapshot to dotted keys, stopping at entered values and arrays. */
export function flattenSnapshot(snapshot: unknown, prefix = ""): Map<string, unknown> {
  const out = new Map<string, unknown>();
  if (!isPlainObject(snapshot)) return out;
  for (const [k, v] of Object.entries(snapshot)) {
    const key = prefix ? `${prefix}.${k}` : k;
    if (!prefix && SKIPPED.has(k)) continue;
    if (isPlainObject(v) && !isEntered(v)) for (const [k2, v2] of flattenSnapshot(v, key)) out.set(k2, v2);
    else out.set(key, v);
  }
  return out;
}

/** Fields whose value differs between the snapshots (a missing snapshot counts as all empty). */
export function diffSnapshots(before: unknown, after: unknown): FieldChange[] {
  const a = flattenSnapshot(before);
  const b = flattenSnapshot(after);
  const keys = [...new Set([...a.keys(), ...b.keys()])];
  const changes: FieldChange[] = [];
  for (const key of keys) {
    const label = VALUE_LABEL[key];
    const show = (v: unknown) => (label && typeof v === "string" ? label(v) : formatAuditValue(v));
    const x = show(a.get(key));
    const y = show(b.get(key));
    if (x !== y) changes.push({ key, label: fieldLabel(key), before: x, after: y });
  }
  return changes;
}
