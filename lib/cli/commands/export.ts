import path from "node:path";
import { cliActor } from "../../server/actor";
import { createExport, rerunExport, type ExportRunSummary } from "../../server/exports";
import type { Result } from "../../server/result";

type Rerun = ExportRunSummary & { original?: string; identical?: boolean; changed?: string[] };
import { parseCli, reportError } from "../args";
import type { CliCommand } from "../types";

const USAGE = `meltledger export --label binary|multiclass|density [--density-threshold 99] --balance none|weights|over|under|smote|gaussian [--k 5]
    --split source:0.7,0.15,0.15|folds:5 [--features process,energy,meltpool,mixture,composition,provenance] [--min-quality Q]
    [--include-unreviewed] [--alloy A,B] [--source ID,ID] [--from YYYY-MM-DD] [--to YYYY-MM-DD] [--max-synthetic 5] [--name NAME]
    --seed N --out DIR [--json]
  meltledger export --rerun NAME [--out DIR] [--json]`;

/** `meltledger export`: writes a training set (CSV, Parquet, DATASHEET.md, manifest.json) to --out and saves the run. */
export const exportCommand: CliCommand = async (argv, io) => {
  const parsed = parseCli(
    argv,
    {
      label: { type: "string" }, "density-threshold": { type: "string" }, balance: { type: "string" }, k: { type: "string" }, split: { type: "string" },
      features: { type: "string" }, "min-quality": { type: "string" }, "include-unreviewed": { type: "boolean" }, alloy: { type: "string" }, source: { type: "string" },
      from: { type: "string" }, to: { type: "string" }, "max-synthetic": { type: "string" }, name: { type: "string" }, seed: { type: "string" }, out: { type: "string" },
      rerun: { type: "string" }, json: { type: "boolean" },
    },
    io,
    USAGE,
  );
  if (!parsed.ok) return 2;
  const v = parsed.values as Record<string, string | boolean | undefined>;
  const json = v.json === true;
  if (parsed.positionals.length) {
    io.stderr(`Unexpected argument "${parsed.positionals[0]}".\n\nUsage: ${USAGE}\n`);
    return 2;
  }
  const outDir = typeof v.out === "string" ? path.resolve(v.out) : undefined;
  const actor = await cliActor();
  let result: Result<Rerun>;
  if (typeof v.rerun === "string") {
    result = await rerunExport(v.rerun, actor);
  } else {
    const missing = ["seed", "out"].filter((f) => v[f] === undefined);
    if (missing.length) {
      io.stderr(`${missing.map((f) => `--${f}`).join(" and ")} ${missing.length > 1 ? "are" : "is"} required: the seed makes the export reproducible, --out names the folder to write.\n\nUsage: ${USAGE}\n`);
      return 2;
    }
    result = await createExport(
      {
        name: v.name, label: v.label, densityThreshold: v["density-threshold"], balance: v.balance, k: v.k, split: v.split, features: v.features,
        minQuality: v["min-quality"], includeUnreviewed: v["include-unreviewed"] === true, alloys: v.alloy, sources: v.source, enteredFrom: v.from, enteredTo: v.to,
        maxSyntheticMultiple: v["max-synthetic"], seed: v.seed,
      },
      actor,
      { outDir },
    );
  }
  if (!result.ok) return reportError(io, result.error, json);
  const s = result.data;
  if (json) {
    io.stdout(`${JSON.stringify({ name: s.name, folder: s.folder, out: outDir ?? null, files: s.files, counts: s.counts, warnings: s.warnings, ms: Math.round(s.ms), ...(s.original !== undefined ? { rerun_of: s.original, identical: s.identical, changed: s.changed } : {}) })}\n`);
    return 0;
  }
  io.stdout(`Export "${s.name}" written${outDir ? ` to ${outDir}` : ""} (saved in ${s.folder}) in ${(s.ms / 1000).toFixed(1)} s.\n`);
  for (const p of s.counts.partitions) {
    const before = s.counts.before[p] ?? {};
    const after = s.counts.after[p] ?? {};
    const classes = [...new Set([...Object.keys(before), ...Object.keys(after)])].sort();
    io.stdout(`  ${p.padEnd(10)} ${classes.map((c) => `${c} ${before[c] ?? 0}${(after[c] ?? 0) !== (before[c] ?? 0) ? `→${after[c] ?? 0}` : ""}`).join(", ")}\n`);
  }
  for (const f of s.files) io.stdout(`  ${f.name.padEnd(20)} ${String(f.rows ?? "").padStart(8)} rows  ${f.sha256}\n`);
  for (const w of s.warnings) io.stdout(`warning: ${w}\n`);
  if (s.original !== undefined) io.stdout(s.identical ? `Every file is byte-identical to "${s.original}".\n` : `Files that differ from "${s.original}" (the records changed since): ${(s.changed ?? []).join(", ")}\n`);
  return 0;
};
