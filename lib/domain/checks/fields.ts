/**
 * The entered quantity fields of a record, the quantity each one is, and its canonical column.
 */
import { quantityLabel, type Quantity } from "../units";
import type { CheckedField, CheckRecord } from "./types";

export interface FieldInfo {
  field: CheckedField;
  quantity: Quantity;
  /** Canonical column of CheckRecord. */
  key: "laserPowerW" | "scanSpeedMmPerS" | "hatchSpacingUm" | "layerThicknessUm" | "spotDiameterUm" | "preheatC" | "powderD10Um" | "powderD50Um" | "powderD90Um" | "relativeDensityPct";
  /** Part of rule codes: "range.scan_speed". */
  slug: string;
  label: string;
}

const f = (field: CheckedField, quantity: Quantity, key: FieldInfo["key"], slug: string, label = quantityLabel(quantity)): FieldInfo => ({ field, quantity, key, slug, label });

/** Every entered quantity field, in form order. */
export const CHECKED_FIELDS: readonly FieldInfo[] = [
  f("laserPower", "laserPower", "laserPowerW", "laser_power"),
  f("scanSpeed", "scanSpeed", "scanSpeedMmPerS", "scan_speed"),
  f("hatchSpacing", "hatchSpacing", "hatchSpacingUm", "hatch_spacing"),
  f("layerThickness", "layerThickness", "layerThicknessUm", "layer_thickness"),
  f("spotDiameter", "spotDiameter", "spotDiameterUm", "spot_diameter"),
  f("preheat", "preheat", "preheatC", "preheat"),
  f("powderD10", "powderSize", "powderD10Um", "powder_d10", "powder D10"),
  f("powderD50", "powderSize", "powderD50Um", "powder_d50", "powder D50"),
  f("powderD90", "powderSize", "powderD90Um", "powder_d90", "powder D90"),
  f("relativeDensity", "relativeDensity", "relativeDensityPct", "relative_density"),
];

/** The canonical value of a field, or null. @example canonicalValue(record, CHECKED_FIELDS[0]); // record.laserPowerW */
export function canonicalValue(record: CheckRecord, info: FieldInfo): number | null {
  const v = record[info.key];
  return typeof v === "number" && Number.isFinite(v) ? v : null;
}

/** Number formatting for messages: up to 5 significant digits, thousands separated. @example fmt(1234.567); // "1,234.6" */
export function fmt(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  const text = String(Number(value.toPrecision(5)));
  if (text.includes("e")) return text;
  const [whole = "", fraction] = text.split(".");
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  return fraction === undefined ? grouped : `${grouped}.${fraction}`;
}

/** Sentence case. @example capitalize("scan speed"); // "Scan speed" */
export function capitalize(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
