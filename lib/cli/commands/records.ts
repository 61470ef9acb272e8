import { listRecords } from "../../server/records";
import { toRecordJson } from "../../server/record-json";
import { parseCli, reportError } from "../args";
import type { CliCommand } from "../types";

const USAGE =
  "meltledger records list --json [--alloy A[,B]] [--source ID[,ID]] [--status S[,S]] [--outcome O[,O]] [--power MIN-MAX] [--speed MIN-MAX] [--hatch MIN-MAX] [--layer MIN-MAX] [--sort FIELD] [--desc] [--limit N]";

function range(text: string | undefined, flag: string): { min: number | null; max: number | null } | string | undefined {
  if (text === undefined) return undefined;
  const m = /^\s*(-?[\d.]*)\s*-\s*(-?[\d.]*)\s*$/.exec(text);
  if (!m || (m[1] === "" && m[2] === "")) return `--${flag} takes MIN-MAX in canonical units, e.g. --${flag} 100-300 (either side may be empty).`;
  return { min: m[1] === "" ? null : Number(m[1]), max: m[2] === "" ? null : Number(m[2]) };
}

/** `meltledger records list`: every matching record as a JSON array (canonical snake_case keys with units). */
export const records: CliCommand = async (argv, io) => {
  const [sub, ...rest] = argv;
  if (sub !== "list") {
    io.stderr(`Unknown or missing subcommand.\n\nUsage: ${USAGE}\n`);
    return 2;
  }
  const parsed = parseCli(
    rest,
    {
      json: { type: "boolean" }, alloy: { type: "string" }, source: { type: "string" }, status: { type: "string" }, outcome: { type: "string" },
      power: { type: "string" }, speed: { type: "string" }, hatch: { type: "string" }, layer: { type: "string" },
      sort: { type: "string" }, desc: { type: "boolean" }, limit: { type: "string" },
    },
    io,
    USAGE,
  );
  if (!parsed.ok) return 2;
  const v = parsed.values as Record<string, string | undefined>;
  const ranges: Record<string, { min: number | null; max: number | null }> = {};
  for (const [flag, key] of [["power", "laserPowerW"], ["speed", "scanSpeedMmPerS"], ["hatch", "hatchSpacingUm"], ["layer", "layerThicknessUm"]] as const) {
    const r = range(v[flag], flag);
    if (typeof r === "string") {
      io.stderr(`${r}\n`);
      return 2;
    }
    if (r) ranges[key] = r;
  }
  let limit: number | null = null;
  if (v.limit !== undefined) {
    limit = Number(v.limit);
    if (!Number.isInteger(limit) || limit < 1) {
      io.stderr(`--limit takes a whole number from 1 up, got "${v.limit}".\n`);
      return 2;
    }
  }
  const json = parsed.values.json === true;
  const out: unknown[] = [];
  const pageSize = 1000;
  for (let page = 0; ; page++) {
    const r = await listRecords({ alloy: v.alloy, sourceId: v.source, status: v.status, outcome: v.outcome, ranges, sort: v.sort ?? "id", direction: parsed.values.desc ? "desc" : "asc", page, pageSize });
    if (!r.ok) return reportError(io, r.error, json);
    for (const row of r.data.rows) {
      out.push(toRecordJson(row));
      if (limit !== null && out.length >= limit) break;
    }
    if ((limit !== null && out.length >= limit) || r.data.rows.length < pageSize) break;
  }
  if (json) io.stdout(`${JSON.stringify(out)}\n`);
  else {
    io.stdout(`${out.length} record(s)\n`);
    for (const r of out as Record<string, unknown>[]) {
      io.stdout(`#${r.id}\t${r.alloy}\tP=${r.laser_power_w ?? "-"} W\tv=${r.scan_speed_mm_s ?? "-"} mm/s\th=${r.hatch_spacing_um ?? "-"} µm\tt=${r.layer_thickness_um ?? "-"} µm\t${r.outcome}\t${r.status}\n`);
    }
  }
  return 0;
};
