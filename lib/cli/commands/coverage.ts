import { coverageJson, getCoverage, type CoverageReport } from "../../server/coverage";
import { parseCommand, reportError } from "../args";
import type { CliCommand, CliIo } from "../types";

const USAGE = `meltledger coverage [--alloy 316L] [--status accepted,needs_review] [--hatch 80-120um] [--layer 30um] [--spot 60-100um]
    [--power 50-400W] [--speed 200-2000mm/s] [--power-bins 12] [--speed-bins 12] [--power-scale auto|linear|log] [--speed-scale auto|linear|log]
    [--window-hatch 100um] [--window-layer 30um] [--window-spot 80um] [--k 3] [--json]
  Counts of records over the power–speed plane, the cells holding fewer than k, and the share of
  cells inside the predicted process window (for one alloy) that hold at least k records.
  Ranges take units and either side may be open (80-); one value matches within ±1 µm (±2 µm for spot).`;

const OPTIONS = {
  alloy: { type: "string" },
  status: { type: "string" },
  hatch: { type: "string" },
  layer: { type: "string" },
  spot: { type: "string" },
  power: { type: "string" },
  speed: { type: "string" },
  "power-bins": { type: "string" },
  "speed-bins": { type: "string" },
  "power-scale": { type: "string" },
  "speed-scale": { type: "string" },
  "window-hatch": { type: "string" },
  "window-layer": { type: "string" },
  "window-spot": { type: "string" },
  k: { type: "string" },
  json: { type: "boolean" },
  help: { type: "boolean", short: "h" },
} as const;

function pct(x: number | null): string {
  return x === null ? "—" : `${(100 * x).toFixed(0)} %`;
}

function printSummary(io: CliIo, r: CoverageReport): void {
  if (r.empty) {
    io.stdout(`${r.emptyReason}\n`);
    return;
  }
  const lines = [
    `records          ${r.nRecords} (${r.nOnGrid} on the grid, ${r.nOutsideGrid} outside it, ${r.nWithoutPowerOrSpeed} without power or speed)`,
    `grid             power ${r.powerEdgesW[0]}–${r.powerEdgesW.at(-1)} W in ${r.powerEdgesW.length - 1} ${r.powerAxis?.scale} bins × speed ${r.speedEdgesMmPerS[0]}–${r.speedEdgesMmPerS.at(-1)} mm/s in ${r.speedEdgesMmPerS.length - 1} ${r.speedAxis?.scale} bins`,
    r.window
      ? `window           ${r.window.alloyName} at h ${r.window.hatchSpacingUm} µm, t ${r.window.layerThicknessUm} µm, d ${r.window.spotDiameterUm} µm: ${r.score.windowCells} cells`
      : `window           none: ${r.windowUnavailable}`,
    `score            ${pct(r.score.share)} of ${r.window ? "window" : "grid"} cells hold at least k = ${r.score.k} records`,
    ...Object.entries(r.score.byOutcome).map(([o, s]) => `  ${o.padEnd(15)}${pct(s.share)}`),
    `sparse cells     ${r.sparseCells.length} (${r.sparseCells.filter((c) => c.count === 0).length} empty)${r.window ? `, ${r.sparseCells.filter((c) => c.inWindow).length} inside the window` : ""}`,
  ];
  io.stdout(`${lines.join("\n")}\n`);
}

/** `meltledger coverage`: the count grid, sparse cells and coverage score of a selection. */
export const coverage: CliCommand = async (argv, io) => {
  const parsed = parseCommand(argv, OPTIONS, io, USAGE);
  if (!parsed.ok) return parsed.exitCode;
  const v = parsed.values as Record<string, string | boolean | undefined>;
  const json = parsed.json;
  const r = await getCoverage({
    alloy: v.alloy,
    status: v.status,
    hatch: v.hatch,
    layer: v.layer,
    spot: v.spot,
    power: v.power,
    speed: v.speed,
    powerBins: v["power-bins"],
    speedBins: v["speed-bins"],
    powerScale: v["power-scale"],
    speedScale: v["speed-scale"],
    windowHatch: v["window-hatch"],
    windowLayer: v["window-layer"],
    windowSpot: v["window-spot"],
    k: v.k,
  });
  if (!r.ok) return reportError(io, r.error, json);
  if (json) io.stdout(`${JSON.stringify(coverageJson(r.data))}\n`);
  else printSummary(io, r.data);
  return 0;
};
