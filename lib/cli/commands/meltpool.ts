import { computeMeltpool, type MeltpoolReport } from "../../server/meltpool";
import { parseCommand, reportError } from "../args";
import type { CliCommand, CliIo } from "../types";

const USAGE = `meltledger meltpool --power 200W --speed 800mm/s --spot 80um [--alloy 316L]
    [--spot-definition 1/e2|d4sigma|fwhm] [--hatch 100um --layer 30um]
    [--absorptivity 0.35 --density 7900 --cp 500 --k 20 --t-melt 1700 --t-boil 3090 --t0 300]
    [--method surface|direct] [--json]
  Power, speed, spot, hatch and layer take units (W, kW; mm/s, m/s; um, mm). Property flags are SI
  (kg/m³, J/(kg·K), W/(m·K), K) and override the alloy's set; with all of them no alloy is needed.`;

const OPTIONS = {
  alloy: { type: "string" },
  power: { type: "string" },
  speed: { type: "string" },
  spot: { type: "string" },
  "spot-definition": { type: "string" },
  hatch: { type: "string" },
  layer: { type: "string" },
  absorptivity: { type: "string" },
  density: { type: "string" },
  cp: { type: "string" },
  k: { type: "string" },
  "t-melt": { type: "string" },
  "t-boil": { type: "string" },
  t0: { type: "string" },
  method: { type: "string" },
  json: { type: "boolean" },
  help: { type: "boolean", short: "h" },
} as const;

function fixed(value: number | null, digits: number): string {
  return value === null ? "—" : value.toFixed(digits);
}

function printTable(io: CliIo, r: MeltpoolReport): void {
  const alloy = r.alloy ? `${r.alloy.display_name}${r.alloy.standard ? ` (${r.alloy.standard})` : ""}` : "(properties given)";
  const lines = [
    `alloy                ${alloy}; properties: ${r.properties_source.basis}`,
    `melt pool            width ${fixed(r.width_um, 1)} µm, depth ${fixed(r.depth_um, 1)} µm, length ${fixed(r.length_um, 1)} µm`,
    `peak temperature     ${fixed(r.peak_temperature_k, 0)} K`,
    `normalized enthalpy  ${fixed(r.normalized_enthalpy, 2)} (keyhole above ${fixed(r.keyhole_enthalpy_threshold, 2)})`,
    `energy density       ${fixed(r.energy_density_j_mm3, 1)} J/mm³`,
    "",
    "criterion                      value     threshold  margin   fired",
    ...r.criteria.map(
      (c) =>
        `${c.name.padEnd(30)} ${fixed(c.value, 3).padStart(8)}  ${`${c.comparison} ${fixed(c.threshold, 2)}`.padStart(9)}  ${(c.margin === null ? "—" : `${(100 * c.margin).toFixed(0)} %`).padStart(6)}   ${c.fired ? "yes" : "no"}${c.note ? `  (${c.note})` : ""}`,
    ),
    "",
    `regime               ${r.regime.label}: ${r.regime.summary}`,
    ...r.notes.map((n) => `note                 ${n}`),
  ];
  io.stdout(`${lines.join("\n")}\n`);
}

/** `meltledger meltpool`: Eagar–Tsai melt pool, criteria and regime for one parameter set. */
export const meltpool: CliCommand = async (argv, io) => {
  const parsed = parseCommand(argv, OPTIONS, io, USAGE);
  if (!parsed.ok) return parsed.exitCode;
  const v = parsed.values;
  const json = parsed.json;
  const str = (name: keyof typeof OPTIONS): string | null => (typeof v[name] === "string" ? (v[name] as string) : null);
  const r = computeMeltpool({
    alloy: str("alloy"),
    power: str("power"),
    speed: str("speed"),
    spot: str("spot"),
    spotDefinition: str("spot-definition"),
    hatch: str("hatch"),
    layer: str("layer"),
    absorptivity: str("absorptivity"),
    density: str("density"),
    cp: str("cp"),
    k: str("k"),
    tMelt: str("t-melt"),
    tBoil: str("t-boil"),
    t0: str("t0"),
    method: str("method"),
  });
  if (!r.ok) return reportError(io, r.error, json);
  if (json) io.stdout(`${JSON.stringify(r.data)}\n`);
  else printTable(io, r.data);
  return 0;
};
