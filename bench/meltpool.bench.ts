// Melt-pool solves per second with the precomputed Eagar–Tsai surface against direct numerical
// integration as the same-run baseline, and the largest deviation between the two.
import { CURATED_PROPERTY_SETS } from "../lib/domain/alloy-properties";
import { eagarTsaiMeltPool, type MeltPoolInputs } from "../lib/domain/meltpool";
import type { BenchFigure, BenchSuite } from "./types";

const SURFACE_BATCH = 20_000;
const SURFACE_BATCHES = 5;
const DIRECT_SAMPLE = 150;

/** Park–Miller generator: the same varied inputs in every run. */
function generator(seed: number): () => number {
  let state = seed;
  return () => {
    state = (state * 16807) % 2147483647;
    return state / 2147483647;
  };
}

/** Varied LPBF inputs: curated alloys, P 50–500 W, v 200–3000 mm/s, d 40–200 µm, preheat to 200 °C. */
export function variedInputs(count: number, seed: number): MeltPoolInputs[] {
  const next = generator(seed);
  const alloys = Object.values(CURATED_PROPERTY_SETS);
  const logUniform = (lo: number, hi: number): number => Math.exp(Math.log(lo) + next() * Math.log(hi / lo));
  return Array.from({ length: count }, () => {
    const a = alloys[Math.floor(next() * alloys.length)] ?? alloys[0];
    if (!a) throw new Error("no curated alloys");
    return {
      laserPowerW: logUniform(50, 500),
      scanSpeedMmPerS: logUniform(200, 3000),
      spotDiameterUm: logUniform(40, 200),
      absorptivity: a.absorptivity.value * (0.8 + 0.4 * next()),
      densityKgPerM3: a.densityKgPerM3.value,
      specificHeatJPerKgK: a.specificHeatJPerKgK.value,
      thermalConductivityWPerMK: a.thermalConductivityWPerMK.value * (0.7 + 0.6 * next()),
      meltingTemperatureK: a.liquidusK.value,
      ambientTemperatureK: 298 + 200 * next(),
    };
  });
}

function median(values: number[]): number {
  const sorted = [...values].sort((x, y) => x - y);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? (sorted[mid] as number) : ((sorted[mid - 1] as number) + (sorted[mid] as number)) / 2;
}

export const meltpoolBench: BenchSuite = async () => {
  // Warm-up (JIT and the surface table), not counted.
  for (const p of variedInputs(5_000, 99)) eagarTsaiMeltPool(p);

  const rates: number[] = [];
  let fallbacks = 0;
  let total = 0;
  for (let b = 0; b < SURFACE_BATCHES; b++) {
    const batch = variedInputs(SURFACE_BATCH, 1000 + b); // fresh inputs: no memo hits
    const started = performance.now();
    for (const p of batch) {
      const r = eagarTsaiMeltPool(p);
      if (r.method === "direct") fallbacks++;
    }
    rates.push(batch.length / ((performance.now() - started) / 1000));
    total += batch.length;
  }

  const sample = variedInputs(DIRECT_SAMPLE, 7);
  const started = performance.now();
  const direct = sample.map((p) => eagarTsaiMeltPool(p, { method: "direct" }));
  const directRate = sample.length / ((performance.now() - started) / 1000);

  let maxDeviation = 0;
  let melted = 0;
  sample.forEach((p, i) => {
    const d = direct[i];
    const s = eagarTsaiMeltPool(p);
    if (!d) return;
    if (d.melted !== s.melted) {
      maxDeviation = Infinity;
      return;
    }
    if (!d.melted) return;
    melted++;
    for (const key of ["widthUm", "depthUm", "lengthUm", "peakTemperatureK"] as const) {
      maxDeviation = Math.max(maxDeviation, Math.abs(s[key] / d[key] - 1));
    }
  });

  const surfaceRate = median(rates);
  const figures: BenchFigure[] = [
    {
      name: "melt-pool solves per second (surface)",
      value: surfaceRate,
      unit: "solves/s",
      target: ">= 20000",
      pass: surfaceRate >= 20_000,
      baseline: { name: "direct integration", value: directRate, unit: "solves/s" },
      ratio: { value: surfaceRate / directRate },
      notes: `median of ${SURFACE_BATCHES} batches of ${SURFACE_BATCH} distinct varied inputs; ${((100 * fallbacks) / total).toFixed(2)} % answered by the direct fallback`,
    },
    {
      name: "melt-pool solves per second (direct integration)",
      value: directRate,
      unit: "solves/s",
      target: "baseline",
      pass: true,
      notes: `${DIRECT_SAMPLE} varied inputs`,
    },
    {
      name: "max relative deviation surface vs direct",
      value: 100 * maxDeviation,
      unit: "%",
      target: "<= 1",
      pass: maxDeviation <= 0.01,
      notes: `width, depth, length and peak temperature over ${melted} melting cases of the direct sample`,
    },
  ];
  return figures;
};
