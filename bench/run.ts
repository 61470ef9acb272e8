// `npm run bench`: every figure beside its target and its ratio to a baseline measured in the
// same run. Benchmarks are measurements, not timed tests: a miss is reported, not failed.
import { mkdirSync, writeFileSync } from "node:fs";
import type { BenchFigure, BenchSuite } from "./types";

const SUITES: Record<string, () => Promise<BenchSuite>> = {
  records: async () => (await import("./records.bench")).recordsBench,
  import: async () => (await import("./import.bench")).importBench,
  meltpool: async () => (await import("./meltpool.bench")).meltpoolBench,
  checks: async () => (await import("./checks.bench")).checksBench,
  export: async () => (await import("./export.bench")).exportBench,
  coverage: async () => (await import("./coverage.bench")).coverageBench,
  load: async () => (await import("./load.bench")).loadBench,
};

function fmt(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  return a >= 1000 ? x.toFixed(0) : a >= 10 ? x.toFixed(1) : a >= 0.1 ? x.toFixed(3) : x.toPrecision(3);
}

async function main() {
  const only = process.argv.slice(2);
  const all: (BenchFigure & { suite: string })[] = [];
  for (const [name, load] of Object.entries(SUITES)) {
    if (only.length && !only.includes(name)) continue;
    process.stderr.write(`[bench] ${name}…\n`);
    let figures: BenchFigure[];
    try {
      figures = await (await load())();
    } catch (error) {
      process.stderr.write(`[bench] ${name} failed: ${(error as Error).stack}\n`);
      continue;
    }
    for (const f of figures) {
      all.push({ ...f, suite: name });
      const base = f.baseline ? ` | baseline ${f.baseline.name}: ${fmt(f.baseline.value)} ${f.baseline.unit}` : "";
      const ratio = f.ratio ? ` | ratio ${fmt(f.ratio.value)}${f.ratio.target ? ` (target ${f.ratio.target}${f.ratio.pass === false ? ", missed" : ""})` : ""}` : "";
      // A figure with a ratio target is met only when both its value and its ratio are.
      const met = f.pass && f.ratio?.pass !== false;
      console.log(`${met ? "MET " : "MISS"} [${name}] ${f.name}: ${fmt(f.value)} ${f.unit} (target ${f.target})${base}${ratio}${f.notes ? ` — ${f.notes}` : ""}`);
    }
  }
  mkdirSync("bench-results", { recursive: true });
  writeFileSync("bench-results/latest.json", JSON.stringify({ at: new Date().toISOString(), figures: all }, null, 2));
}

await main();
