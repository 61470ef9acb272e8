/**
 * The process parameters of a row: the space missing values are filled in, synthetic rows are
 * sampled in, and every derived feature (energy densities, melt-pool physics) is computed from.
 */
import { HARD_LIMITS, type HardLimit, type Quantity } from "../units";
import type { ExportRecord } from "./types";

export const PROCESS_FIELDS = ["laserPowerW", "scanSpeedMmPerS", "hatchSpacingUm", "layerThicknessUm", "spotDiameterUm", "preheatC", "powderD50Um"] as const;
export type ProcessField = (typeof PROCESS_FIELDS)[number];
export type ProcessPoint = Record<ProcessField, number | null>;

const QUANTITY: Record<ProcessField, Quantity> = {
  laserPowerW: "laserPower",
  scanSpeedMmPerS: "scanSpeed",
  hatchSpacingUm: "hatchSpacing",
  layerThicknessUm: "layerThickness",
  spotDiameterUm: "spotDiameter",
  preheatC: "preheat",
  powderD50Um: "powderSize",
};

/** The hard limit (lib/domain/units.ts) of a process field. @example hardLimitOf("laserPowerW").max; // 10000 */
export function hardLimitOf(field: ProcessField): HardLimit {
  return HARD_LIMITS[QUANTITY[field]];
}

/**
 * A value moved inside a field's hard limits; an exclusive lower bound of 0 becomes the smallest
 * step above it that the canonical unit can show (1e-6).
 *
 * @example clipToHardLimit("scanSpeedMmPerS", 25000); // 20000
 */
export function clipToHardLimit(field: ProcessField, value: number): number {
  const { min, minInclusive, max } = hardLimitOf(field);
  let v = value;
  if (max !== null && v > max) v = max;
  if (minInclusive ? v < min : v <= min) v = minInclusive ? min : min + 1e-6;
  return v;
}

/** The process point of a record. @example processPointOf(record).laserPowerW; // 200 */
export function processPointOf(r: ExportRecord): ProcessPoint {
  return {
    laserPowerW: r.laserPowerW,
    scanSpeedMmPerS: r.scanSpeedMmPerS,
    hatchSpacingUm: r.hatchSpacingUm,
    layerThicknessUm: r.layerThicknessUm,
    spotDiameterUm: r.spotDiameterUm,
    preheatC: r.preheatC,
    powderD50Um: r.powderD50Um,
  };
}
