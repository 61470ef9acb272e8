import { createPrng } from "../seed/prng";
import type { RecordInput } from "../lib/schemas/record";

const ALLOYS = ["316L", "Ti-6Al-4V", "AlSi10Mg", "IN718"] as const;
const OUTCOMES = ["dense", "keyhole", "lack_of_fusion", "balling", "cracking", "unknown"] as const;

/**
 * `n` varied, valid record inputs as a form or importer would send them (mixed units), seeded.
 * Used by the benchmarks only; the demo scenario lives in seed/.
 */
export function benchRecordInputs(n: number, sourceIds: readonly number[], seed = 7): RecordInput[] {
  const rng = createPrng(seed);
  const out: RecordInput[] = new Array(n);
  for (let i = 0; i < n; i++) {
    const mmUnits = rng.chance(0.3);
    const hatchUm = rng.float(50, 160);
    const layerUm = rng.pick([20, 30, 40, 50, 60]);
    out[i] = {
      sourceId: rng.pick(sourceIds),
      locationPage: rng.int(1, 20),
      locationLabel: `Table ${rng.int(1, 6)}`,
      alloy: rng.pick(ALLOYS),
      machine: rng.pick(["Bench unit A", "Bench unit B", "Rig 3"]),
      laserPower: rng.chance(0.2) ? { value: (rng.float(80, 400) / 1000).toFixed(4), unit: "kW" } : { value: rng.float(80, 400).toFixed(1), unit: "W" },
      scanSpeed: rng.chance(0.3) ? { value: (rng.float(200, 2500) / 1000).toFixed(4), unit: "m/s" } : { value: rng.float(200, 2500).toFixed(0), unit: "mm/s" },
      hatchSpacing: mmUnits ? { value: (hatchUm / 1000).toFixed(4), unit: "mm" } : { value: hatchUm.toFixed(1), unit: "µm" },
      layerThickness: mmUnits ? { value: (layerUm / 1000).toFixed(3), unit: "mm" } : { value: String(layerUm), unit: "µm" },
      spotDiameter: { value: rng.float(50, 120).toFixed(0), unit: "um" },
      spotDefinition: "one_over_e2",
      outcome: rng.pick(OUTCOMES),
      relativeDensity: { value: rng.float(90, 99.9).toFixed(2), unit: "%" },
    };
  }
  return out;
}
