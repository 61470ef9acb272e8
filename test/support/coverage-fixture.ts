// A hand-built collection for the coverage tests: each record's cell on the 3 × 3 grid of
// FIXTURE_GRID (power 100–400 W, speed 500–2000 mm/s) is noted beside it.
import type { RecordInput } from "@/lib/schemas/record";
import type { Actor } from "@/lib/server/actor";
import { createSource } from "@/lib/server/sources";
import { sourceInput } from "./fixtures";

export interface FixtureRecord {
  alloy: string;
  powerW: number;
  speedMmPerS: number;
  hatchUm: number;
  layerUm: number;
  outcome: "dense" | "keyhole" | "lack_of_fusion" | "balling";
  status?: "draft" | "needs_review";
}

export const COVERAGE_RECORDS: readonly FixtureRecord[] = [
  { alloy: "316L", powerW: 150, speedMmPerS: 600, hatchUm: 100, layerUm: 30, outcome: "dense" }, // (0, 0)
  { alloy: "316L", powerW: 180, speedMmPerS: 700, hatchUm: 100, layerUm: 30, outcome: "dense" }, // (0, 0)
  { alloy: "316L", powerW: 199, speedMmPerS: 999, hatchUm: 100, layerUm: 30, outcome: "keyhole" }, // (0, 0)
  { alloy: "316L", powerW: 250, speedMmPerS: 1200, hatchUm: 100, layerUm: 30, outcome: "dense" }, // (1, 1)
  { alloy: "316L", powerW: 350, speedMmPerS: 1600, hatchUm: 100, layerUm: 30, outcome: "balling" }, // (2, 2)
  { alloy: "316L", powerW: 400, speedMmPerS: 2000, hatchUm: 100, layerUm: 30, outcome: "balling" }, // (2, 2): both upper edges
  { alloy: "316L", powerW: 250, speedMmPerS: 600, hatchUm: 100, layerUm: 30, outcome: "lack_of_fusion" }, // (1, 0)
  { alloy: "316L", powerW: 350, speedMmPerS: 1700, hatchUm: 100, layerUm: 30, outcome: "balling", status: "draft" }, // (2, 2)
  { alloy: "316L", powerW: 450, speedMmPerS: 800, hatchUm: 100, layerUm: 30, outcome: "dense" }, // outside the power range
  { alloy: "316L", powerW: 150, speedMmPerS: 600, hatchUm: 200, layerUm: 30, outcome: "dense" }, // out of a hatch 80–120 µm filter
  { alloy: "316L", powerW: 150, speedMmPerS: 600, hatchUm: 100, layerUm: 60, outcome: "dense" }, // out of a layer 30 µm filter
  { alloy: "IN718", powerW: 150, speedMmPerS: 600, hatchUm: 100, layerUm: 30, outcome: "dense" }, // another alloy
];

export const FIXTURE_GRID = { power: "100-400W", speed: "500-2000mm/s", powerBins: "3", speedBins: "3", powerScale: "linear", speedScale: "linear" } as const;

/** The records as a person keys them: every second one in kW, m/s (decimal comma) and mm. */
export function coverageFixture(sourceId: number): RecordInput[] {
  return COVERAGE_RECORDS.map((r, i) => {
    const odd = i % 2 === 1;
    return {
      sourceId,
      alloy: r.alloy === "316L" && odd ? "SS316L" : r.alloy,
      laserPower: odd ? { value: String(r.powerW / 1000), unit: "kW" } : { value: String(r.powerW), unit: "W" },
      scanSpeed: odd ? { value: String(r.speedMmPerS / 1000).replace(".", ","), unit: "m/s" } : { value: String(r.speedMmPerS), unit: "mm/s" },
      hatchSpacing: odd ? { value: String(r.hatchUm / 1000), unit: "mm" } : { value: String(r.hatchUm), unit: "µm" },
      layerThickness: { value: String(r.layerUm), unit: "µm" },
      spotDiameter: { value: "80", unit: "µm" },
      spotDefinition: "one_over_e2",
      outcome: r.outcome,
      status: r.status ?? "needs_review",
    };
  });
}

export async function createSourceOrThrow(actor: Actor): Promise<number> {
  const s = await createSource(sourceInput({ title: "Invented coverage study of a test steel", doi: "10.5555/coverage.0001" }), actor);
  if (!s.ok) throw new Error(s.error.message);
  return s.data.id;
}
