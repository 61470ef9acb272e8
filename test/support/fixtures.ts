import type { RecordInput } from "@/lib/schemas/record";
import type { SourceInput } from "@/lib/schemas/source";

/** An invented source, as a user would key it in. */
export function sourceInput(overrides: Partial<SourceInput> = {}): SourceInput {
  return {
    kind: "journal_article",
    title: "Process windows for a test alloy in a fictional study",
    authors: ["A. Placeholder", "B. Example"],
    year: 2022,
    venue: "Journal of Invented Results",
    doi: "https://doi.org/10.5555/TEST.0001",
    densityMethod: "archimedes",
    outcomeEvidence: "micrographs",
    machineStated: true,
    ...overrides,
  };
}

/** A record keyed in with mixed units: 0.2 kW, 0.8 m/s, 0.1 mm, 30 µm, 80 um. */
export function mixedUnitRecord(sourceId: number, overrides: Partial<RecordInput> = {}): RecordInput {
  return {
    sourceId,
    locationPage: 4,
    locationLabel: "Table 2",
    alloy: "SS316L",
    machine: "Bench unit A",
    laserPower: { value: "0.2", unit: "kW" },
    scanSpeed: { value: "0,8", unit: "m/s" },
    hatchSpacing: { value: "0.1", unit: "mm" },
    layerThickness: { value: "30", unit: "µm" },
    spotDiameter: { value: "80", unit: "um" },
    spotDefinition: "one_over_e2",
    outcome: "dense",
    relativeDensity: { value: "99.6", unit: "%" },
    ...overrides,
  };
}
