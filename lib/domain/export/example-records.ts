/**
 * Invented records and sources for the export's tests and benchmarks: a seeded toy world where
 * the outcome follows the volumetric energy density (below a window lack of fusion, above it
 * keyhole), with some values missing the way papers leave them out.
 */
import { resolveAlloy } from "../alloys";
import type { Composition } from "../composition";
import { createPrng } from "../prng";
import type { ExportRecord, ExportSource } from "./types";

const WINDOWS: Record<string, [number, number]> = { "316L": [50, 110], "IN718": [60, 120], "Ti-6Al-4V": [45, 100] }; // toy windows, J/mm³ (invented)

function compositionOf(alloy: string): Composition | null {
  const r = resolveAlloy(alloy);
  return r.ok ? { basis: "wt", components: r.components } : null;
}

/**
 * `n` records from `sourceCount` invented sources (ids 1 …), seeded.
 *
 * @example exampleRecords(100, 6, 1).length; // 100
 */
export function exampleRecords(n: number, sourceCount: number, seed: number, options: { alloys?: readonly string[]; status?: string } = {}): ExportRecord[] {
  const rng = createPrng(seed);
  const alloys = options.alloys ?? Object.keys(WINDOWS);
  const compositions = new Map(alloys.map((a) => [a, compositionOf(a)]));
  const out: ExportRecord[] = [];
  for (let i = 0; i < n; i++) {
    const alloy = rng.pick(alloys);
    const [lo, hi] = WINDOWS[alloy] ?? [50, 110];
    const p = Math.round(rng.float(100, 400));
    const v = Math.round(rng.float(300, 2000));
    const h = rng.pick([60, 80, 100, 120]);
    const t = rng.pick([20, 30, 40]);
    const ev = p / (v * (h / 1000) * (t / 1000));
    const outcome = ev < lo ? "lack_of_fusion" : ev > hi * 1.6 ? "keyhole" : ev > hi ? (rng.chance(0.5) ? "keyhole" : "dense") : rng.chance(0.05) ? "balling" : "dense";
    const density = outcome === "dense" ? rng.float(98.5, 99.9) : rng.float(90, 98.9);
    const day = String(1 + (i % 28)).padStart(2, "0");
    out.push({
      id: i + 1,
      sourceId: 1 + (i % sourceCount),
      alloyKey: alloy,
      status: options.status ?? "accepted",
      outcome,
      relativeDensityPct: rng.chance(0.9) ? Math.round(density * 100) / 100 : null,
      laserPowerW: p,
      scanSpeedMmPerS: v,
      hatchSpacingUm: h,
      layerThicknessUm: t,
      spotDiameterUm: rng.chance(0.85) ? rng.pick([70, 80, 100]) : null,
      preheatC: rng.chance(0.3) ? rng.pick([80, 150, 200]) : null,
      powderD50Um: rng.chance(0.5) ? rng.pick([30, 35, 40]) : null,
      qualityScore: rng.chance(0.9) ? Math.round(rng.float(0.3, 1) * 1000) / 1000 : null,
      createdAt: `2026-03-${day}T10:00:00.000Z`,
      updatedAt: `2026-04-${day}T10:00:00.000Z`,
      composition: compositions.get(alloy) ?? null,
    });
  }
  return out;
}

/** Invented sources 1 … n with test DOIs. @example exampleSources(2)[1].doi; // "10.5555/export.2" */
export function exampleSources(n: number): ExportSource[] {
  return Array.from({ length: n }, (_, i) => ({
    id: i + 1,
    kind: i % 4 === 3 ? "thesis" : "journal_article",
    title: `Process windows of invented alloys, part ${i + 1}`,
    authors: [`A. Author${i + 1}`, "B. Example"],
    year: 2015 + (i % 9),
    venue: i % 4 === 3 ? null : "Journal of Invented Results",
    doi: `10.5555/export.${i + 1}`,
    url: null,
  }));
}

/** Options most tests start from. */
export function defaultExportOptions() {
  return {
    filters: { includeUnreviewed: false, minQuality: null, alloys: [], sourceIds: [], enteredFrom: null, enteredTo: null },
    label: { scheme: "binary" as const, densityThresholdPct: 99 },
    features: ["process", "energy", "meltpool", "mixture", "composition", "provenance"] as const,
    balance: { method: "none" as const, k: 5, maxSyntheticMultiple: 5 },
    split: { kind: "source" as const, train: 0.7, validation: 0.15, test: 0.15 },
    seed: 7,
  };
}
