import { writeFileSync } from "node:fs";
import { cliActor } from "../../server/actor";
import { createSuggestionSet, suggestionSetCsv, type SuggestionSetView } from "../../server/suggestions";
import { parseCommand, reportError } from "../args";
import type { CliCommand, CliIo } from "../types";

const USAGE = `meltledger suggest --alloy 316L --power 50-400W --speed 200-2000mm/s --hatch 100um --layer 30um
    [--n 12] [--seed 1] [--spot 80um] [--k 3] [--status accepted,needs_review] [--power-bins 12] [--speed-bins 12]
    [--power-scale auto|linear|log] [--speed-scale auto|linear|log] [--out FILE.csv] [--json]
  Suggests experiments that fill the thinnest cells inside the predicted process window and the
  machine limits given (--hatch and --layer take the values the machine can run: 80,100,120um).
  The set is stored with its seed and inputs; --out writes it as CSV with the safety caution at its head.`;

const OPTIONS = {
  alloy: { type: "string" },
  n: { type: "string" },
  seed: { type: "string" },
  power: { type: "string" },
  speed: { type: "string" },
  hatch: { type: "string" },
  layer: { type: "string" },
  spot: { type: "string" },
  k: { type: "string" },
  status: { type: "string" },
  "power-bins": { type: "string" },
  "speed-bins": { type: "string" },
  "power-scale": { type: "string" },
  "speed-scale": { type: "string" },
  out: { type: "string" },
  json: { type: "boolean" },
  help: { type: "boolean", short: "h" },
} as const;

function printTable(io: CliIo, s: SuggestionSetView): void {
  const lines = [
    `suggestion set ${s.id}: ${s.inputs.alloyName}, seed ${s.seed}, spot ${s.inputs.spotDiameterUm} µm (${s.inputs.spotBasis})`,
    "",
    "  #  power W  speed mm/s  hatch µm  layer µm  E_v J/mm³  regime   cell records",
    ...s.suggestions.map(
      (x) =>
        `${String(x.index).padStart(3)}  ${String(x.laserPowerW).padStart(7)}  ${String(x.scanSpeedMmPerS).padStart(10)}  ${String(x.hatchSpacingUm).padStart(8)}  ${String(x.layerThicknessUm).padStart(8)}  ${x.volumetricEnergyJMm3.toFixed(1).padStart(9)}  ${x.predictedRegime.padEnd(8)} ${x.cell.records}`,
    ),
    ...s.notes.map((n) => `note: ${n}`),
  ];
  io.stdout(`${lines.join("\n")}\n`);
}

/** `meltledger suggest`: suggested experiments for the thinnest cells, stored and optionally written as CSV. */
export const suggest: CliCommand = async (argv, io) => {
  const parsed = parseCommand(argv, OPTIONS, io, USAGE);
  if (!parsed.ok) return parsed.exitCode;
  const v = parsed.values as Record<string, string | boolean | undefined>;
  const json = parsed.json;
  const r = await createSuggestionSet(
    {
      alloy: v.alloy,
      n: v.n,
      seed: v.seed,
      power: v.power,
      speed: v.speed,
      hatch: v.hatch,
      layer: v.layer,
      spot: v.spot,
      k: v.k,
      status: v.status,
      powerBins: v["power-bins"],
      speedBins: v["speed-bins"],
      powerScale: v["power-scale"],
      speedScale: v["speed-scale"],
    },
    await cliActor(),
  );
  if (!r.ok) return reportError(io, r.error, json);
  const out = typeof v.out === "string" ? v.out : null;
  if (out) {
    try {
      writeFileSync(out, suggestionSetCsv(r.data));
    } catch (error) {
      io.stderr(`Could not write ${out}: ${(error as Error).message}\n`);
      return 1;
    }
  }
  if (json) {
    const { caution, ...set } = r.data;
    io.stdout(`${JSON.stringify({ caution, ...set, ...(out ? { csv: out } : {}) })}\n`);
  }
  else {
    // The caution comes first: people act on what follows.
    io.stdout(`${r.data.caution.join("\n")}\n\n`);
    printTable(io, r.data);
    if (out) io.stdout(`CSV written to ${out} (the caution is at its head).\n`);
  }
  return 0;
};
