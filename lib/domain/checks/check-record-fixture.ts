/**
 * A plausible 316L record for tests of the checks, with overrides. Invented values.
 */
import type { CheckRecord } from "./types";

const NOMINAL_316L = Object.freeze([
  { element: "Fe", amount: 65.4, isBalance: true },
  { element: "Cr", amount: 17, isBalance: false },
  { element: "Ni", amount: 12, isBalance: false },
  { element: "Mo", amount: 2.5, isBalance: false },
  { element: "Mn", amount: 1, isBalance: false },
  { element: "Si", amount: 0.5, isBalance: false },
  { element: "C", amount: 0.015, isBalance: false },
  { element: "N", amount: 0.05, isBalance: false },
  { element: "Cu", amount: 1.535, isBalance: false },
]);

/**
 * @example
 * checkRecordOf({ id: 2, laserPowerW: 250 }).scanSpeedMmPerS; // 800
 */
export function checkRecordOf(overrides: Partial<CheckRecord> = {}): CheckRecord {
  return {
    id: 1,
    sourceId: 1,
    alloyKey: "316L",
    components: NOMINAL_316L,
    compositionBasis: "wt",
    laserPowerW: 200,
    scanSpeedMmPerS: 800,
    hatchSpacingUm: 100,
    layerThicknessUm: 30,
    spotDiameterUm: 80,
    preheatC: null,
    powderD10Um: null,
    powderD50Um: 35,
    powderD90Um: null,
    relativeDensityPct: 99.5,
    volumetricEnergyJMm3: 200 / (800 * 0.1 * 0.03),
    outcome: "dense",
    machine: "Bench unit A",
    atmosphere: "argon",
    spotDefinition: "one_over_e2",
    entered: {
      laserPower: { text: "200", unit: "W", provenance: "reported" },
      scanSpeed: { text: "800", unit: "mm/s", provenance: "reported" },
      hatchSpacing: { text: "100", unit: "µm", provenance: "reported" },
      layerThickness: { text: "30", unit: "µm", provenance: "reported" },
      spotDiameter: { text: "80", unit: "µm", provenance: "reported" },
      powderD50: { text: "35", unit: "µm", provenance: "reported" },
      relativeDensity: { text: "99.5", unit: "%", provenance: "reported" },
    },
    ...overrides,
  };
}
