import { createWriteStream } from "node:fs";
import { createPrng } from "../seed/prng";

const ALLOYS = ["316L", "Ti6Al4V", "AlSi10Mg", "IN718", "18Ni300", "CuCrZr"] as const;
const OUTCOMES = ["dense", "LOF", "keyhole", "balling", "cracks", "porous", "desirable", ""] as const;
const MACHINES = ["Bench unit A", "Bench unit B", "Rig 3", "Rig-3 "] as const;

export const IMPORT_BENCH_HEADER = "Alloy;Laser power (W);Scan speed (mm/s);Hatch space (mm);Layer thickness (µm);Spot size (um);Outcome;RD (%);Printer;DOI";

/**
 * Writes an invented `n`-row CSV the way a compiled dataset looks: semicolons, decimal commas, units
 * in headers, outcome words to map, DOIs of `doiCount` invented sources (10.5555), seeded. Streams
 * to disk so the fixture itself never holds the whole file.
 */
export async function writeImportBenchCsv(file: string, n: number, doiCount = 40, seed = 11): Promise<void> {
  const rng = createPrng(seed);
  const out = createWriteStream(file);
  const write = (s: string) => (out.write(s) ? Promise.resolve() : new Promise<void>((r) => out.once("drain", () => r())));
  await write(`\uFEFF${IMPORT_BENCH_HEADER}\n`);
  let buf = "";
  for (let i = 0; i < n; i++) {
    const p = rng.float(80, 400).toFixed(1).replace(".", ",");
    const v = rng.float(200, 2500).toFixed(0);
    const h = (rng.float(50, 160) / 1000).toFixed(3).replace(".", ",");
    const t = String(rng.pick([20, 30, 40, 50, 60]));
    const d = rng.float(50, 120).toFixed(0);
    const rd = rng.float(90, 99.9).toFixed(2).replace(".", ",");
    buf += `${rng.pick(ALLOYS)};${p};${v};${h};${t};${d};${rng.pick(OUTCOMES)};${rd};${rng.pick(MACHINES)};https://doi.org/10.5555/BENCH.${rng.int(1, doiCount)}\n`;
    if (buf.length > 1 << 16) {
      await write(buf);
      buf = "";
    }
  }
  await write(buf);
  await new Promise<void>((resolve) => out.end(() => resolve()));
}
