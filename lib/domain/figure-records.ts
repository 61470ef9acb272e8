/**
 * Turning points read off a figure into record inputs: each point's two axis values, the
 * parameters the figure holds fixed (alloy, hatch, layer, spot, or one from the caption) and the
 * outcome its marker kind stands for, with the provenance kept in the record's location: the
 * figure label, the point's pixel position and the reading uncertainty in data units.
 *
 * Values are written as text with their unit, like any typed record, to as many decimals as the
 * reading supports (one digit below the uncertainty), so the record schema checks them the same way.
 */

import { readPoint, type FigureCalibration, type PixelPoint } from "./figure-calibration";
import type { Outcome } from "./outcomes";

/** Record quantities an axis or a fixed parameter can hold (the record schema's quantity fields). */
export const FIGURE_QUANTITY_FIELDS = ["laserPower", "scanSpeed", "hatchSpacing", "layerThickness", "spotDiameter", "preheat", "relativeDensity"] as const;
export type FigureQuantityField = (typeof FIGURE_QUANTITY_FIELDS)[number];

export interface FigureAxisQuantity {
  field: FigureQuantityField;
  /** A unit id of units.ts for the quantity (W, kW, mm/s, m/s, µm, mm, …), as the axis is labelled. */
  unit: string;
}

export interface FigureMarkerKind {
  /** The kind's key, as points name it ("red-square"). */
  id: string;
  outcome: Outcome;
  /** How the figure's legend names it, kept as the record's outcome text. */
  legend: string;
}

export interface FigurePointInput {
  pixel: PixelPoint;
  kind: string;
  /** Pixel placement error of this point (a detected centroid is better than a click). */
  pixelUncertaintyPx?: number;
}

export interface FigureSetup {
  sourceId: number;
  page: number | null;
  /** "Fig. 3", "Figure 2b". */
  figureLabel: string;
  alloy: string;
  x: FigureAxisQuantity;
  y: FigureAxisQuantity;
  /** Values the figure holds constant, as typed with their unit. */
  fixed: Partial<Record<FigureQuantityField, { value: string; unit: string }>>;
  kinds: readonly FigureMarkerKind[];
}

export interface FigureRecordInput {
  sourceId: number;
  locationPage: number | null;
  locationLabel: string;
  alloy: string;
  outcome: Outcome;
  outcomeText: string;
  provenance: Partial<Record<FigureQuantityField, "reported" | "derived">>;
  [field: string]: unknown;
}

export interface FigurePointProblem {
  /** 1-based position among the points; 0 for a problem of the setup. */
  point: number;
  message: string;
}

/** The record's location label holds at most this many characters (record schema). */
export const LOCATION_LABEL_MAX = 100;

/**
 * Decimals for a value read with a given half-width: one digit finer than the uncertainty's
 * leading digit, never negative, at most 6.
 *
 * @example
 * decimalsFor(2.1); // 1
 * decimalsFor(0.031); // 3
 */
export function decimalsFor(uncertainty: number): number {
  if (!(uncertainty > 0) || !Number.isFinite(uncertainty)) return 6;
  return Math.min(6, Math.max(0, -Math.floor(Math.log10(uncertainty)) + 1));
}

/** Rounds to the digits of `decimalsFor`, without a trailing "-0". @example formatReading(412.345, 2.1); // "412.3" */
export function formatReading(value: number, uncertainty: number): string {
  const s = value.toFixed(decimalsFor(uncertainty));
  return /^-0(\.0*)?$/.test(s) ? s.slice(1) : s;
}

/** An uncertainty to two significant digits. @example formatUncertainty(9.04); // "9" ; formatUncertainty(0.0123); // "0.012" */
export function formatUncertainty(u: number): string {
  if (!(u > 0) || !Number.isFinite(u)) return "0";
  return String(Number(u.toPrecision(2)));
}

/**
 * The provenance label of one point: "Fig. 3 · px (412, 233) · ±2.1 W, ±9 mm/s", the figure
 * label shortened if the whole would not fit the record's location field.
 *
 * @example
 * figureLocationLabel("Fig. 3", { x: 412.2, y: 233.4 }, "±2.1 W", "±9 mm/s"); // "Fig. 3 · px (412, 233) · ±2.1 W, ±9 mm/s"
 */
export function figureLocationLabel(figureLabel: string, pixel: PixelPoint, xUncertainty: string, yUncertainty: string): string {
  const tail = ` · px (${Math.round(pixel.x)}, ${Math.round(pixel.y)}) · ${xUncertainty}, ${yUncertainty}`;
  const room = LOCATION_LABEL_MAX - tail.length;
  const label = figureLabel.trim() || "Figure";
  return (label.length <= room ? label : `${label.slice(0, Math.max(1, room - 1))}…`) + tail;
}

/**
 * Builds one record input per point, or lists every problem (a point outside the marked axes, a
 * marker kind with no outcome, an axis quantity also given as fixed, the two axes on one quantity).
 * Nothing is half-built: either every point becomes a record input or none does.
 *
 * @example
 * figureRecordInputs(calibration, setup, [{ pixel: { x: 300, y: 200 }, kind: "dense" }]);
 * // { ok: true, records: [{ laserPower: { value: "200.0", unit: "W" }, scanSpeed: …, locationLabel: "Fig. 3 · px (300, 200) · …" }] }
 */
export function figureRecordInputs(
  calibration: FigureCalibration,
  setup: FigureSetup,
  points: readonly FigurePointInput[],
): { ok: true; records: FigureRecordInput[] } | { ok: false; problems: FigurePointProblem[] } {
  const problems: FigurePointProblem[] = [];
  if (setup.x.field === setup.y.field) problems.push({ point: 0, message: `Both axes are set to the same quantity (${setup.x.field}); choose a different one for one axis.` });
  for (const axis of [setup.x, setup.y]) {
    if (setup.fixed[axis.field]) problems.push({ point: 0, message: `${axis.field} is on an axis and also given as a fixed parameter; keep only one.` });
  }
  if (!setup.alloy.trim()) problems.push({ point: 0, message: "Enter the alloy the figure is about." });
  if (points.length === 0) problems.push({ point: 0, message: "Place at least one point on the figure." });
  const kinds = new Map(setup.kinds.map((k) => [k.id, k]));
  const records: FigureRecordInput[] = [];
  points.forEach((p, i) => {
    const kind = kinds.get(p.kind);
    if (!kind) {
      problems.push({ point: i + 1, message: `Point ${i + 1} has marker kind "${p.kind}", which has no outcome set.` });
      return;
    }
    const read = readPoint(calibration, p.pixel, p.pixelUncertaintyPx === undefined ? {} : { pixelUncertaintyPx: p.pixelUncertaintyPx });
    if (!read.ok) {
      problems.push({ point: i + 1, message: `Point ${i + 1}: ${read.message}` });
      return;
    }
    const { value, uncertainty } = read.point;
    const ux = `±${formatUncertainty(uncertainty.x)} ${setup.x.unit}`;
    const uy = `±${formatUncertainty(uncertainty.y)} ${setup.y.unit}`;
    const record: FigureRecordInput = {
      sourceId: setup.sourceId,
      locationPage: setup.page,
      locationLabel: figureLocationLabel(setup.figureLabel, p.pixel, ux, uy),
      alloy: setup.alloy.trim(),
      outcome: kind.outcome,
      outcomeText: kind.legend.trim() || kind.id,
      // axis values are read off a plot, not printed as numbers by the source
      provenance: { [setup.x.field]: "derived", [setup.y.field]: "derived" },
      [setup.x.field]: { value: formatReading(value.x, uncertainty.x), unit: setup.x.unit },
      [setup.y.field]: { value: formatReading(value.y, uncertainty.y), unit: setup.y.unit },
    };
    for (const [field, v] of Object.entries(setup.fixed)) {
      if (!v || v.value.trim() === "") continue;
      record[field] = { value: v.value.trim(), unit: v.unit };
      record.provenance[field as FigureQuantityField] = "reported";
    }
    records.push(record);
  });
  return problems.length ? { ok: false, problems } : { ok: true, records };
}
