/**
 * DATASHEET.md of an export, organised by the questions of "Datasheets for Datasets" (Gebru et
 * al., CACM 64(12):86–92, 2021): motivation, composition, collection, preprocessing and labelling,
 * uses, distribution and maintenance — filled from what the export knows, with no clock time.
 */
import type { BuiltExport, ClassCounts } from "./build";
import { describeFilters } from "./filters";
import { describeLabelRule } from "./labels";
import type { ExportFileEntry } from "./manifest";
import type { ExportOptions } from "./types";

const md = (text: string) => text.replace(/\|/g, "\\|").replace(/\r?\n/g, " ");

function countsTable(counts: ClassCounts, partitions: readonly string[], classes: readonly string[]): string[] {
  const lines = [`| split | ${classes.map(md).join(" | ")} | total |`, `|---|${classes.map(() => "---:").join("|")}|---:|`];
  for (const p of partitions) {
    const row = counts[p] ?? {};
    const total = classes.reduce((s, c) => s + (row[c] ?? 0), 0);
    lines.push(`| ${p.replace("_", " ")} | ${classes.map((c) => String(row[c] ?? 0)).join(" | ")} | ${total} |`);
  }
  return lines;
}

const BALANCE_TEXT: Record<string, string> = {
  none: "none: the classes are as the records give them",
  weights: "class weights: each row's sample_weight is n/(C·n_c) from the training rows; no rows added or removed",
  over: "random over-sampling: copies of real training rows drawn with replacement, within class and alloy",
  under: "random under-sampling: real training rows of the larger classes left out at random, within alloy, down to the smallest class",
  smote: "SMOTE (Chawla et al., JAIR 16:321–357, 2002): points on segments between a real training row and one of its k nearest neighbours of the same class and alloy, in the process-parameter space (standardized per alloy); derived features recomputed from the new parameters",
  gaussian: "Gaussian sampling: process parameters drawn from the per-class, per-alloy mean and spread of the real training rows, clipped to the hard limits; derived features recomputed",
};

/**
 * The datasheet text.
 *
 * @example renderDatasheet(built, options, "0.1.0", files).startsWith("# Datasheet"); // true
 */
export function renderDatasheet(built: BuiltExport, options: ExportOptions, toolVersion: string, files: readonly ExportFileEntry[]): string {
  const classes = built.classes ? built.classes.filter((c) => built.partitions.some((p) => (built.counts.before[p]?.[c] ?? 0) + (built.counts.after[p]?.[c] ?? 0) > 0)) : ["all"];
  const split = options.split.kind === "source" ? `by source into train ${options.split.train}, validation ${options.split.validation}, test ${options.split.test} (fractions of rows aimed at; whole sources are placed, stratified by class as far as they allow)` : `${options.split.k} group folds by source, stratified by class as far as whole sources allow`;
  const realRows = Object.values(built.counts.before).reduce((s, m) => s + Object.values(m).reduce((a, n) => a + n, 0), 0);
  const synth = Object.values(built.counts.synthetic).reduce((s, m) => s + Object.values(m).reduce((a, n) => a + n, 0), 0);
  const out: string[] = [];
  out.push("# Datasheet: LPBF printability training set", "");
  out.push(`Made by meltledger ${toolVersion} with seed ${options.seed}. Records as of ${built.dataAsOf ?? "—"}. The same records, options and seed give byte-identical files.`, "");

  out.push("## Motivation", "");
  out.push("For training and evaluating models that predict the outcome of laser powder bed fusion (LPBF) builds from process parameters, alloy and physics-based features. The records were compiled from papers, theses, reports and shop trials and curated in Meltledger: normalized to one unit per quantity, checked for duplicates, unit slips and implausible values, and reviewed.", "");

  out.push("## Composition", "");
  out.push(`Each row is one build record (a parameter set and its outcome) or, where marked is_synthetic = 1, a row made by balancing. ${realRows} real row(s)${synth ? ` and ${synth} synthetic row(s)` : ""}${built.counts.underSampled && Object.keys(built.counts.underSampled).length ? ", after under-sampling" : ""}; ${built.sources.length} source(s).`, "");
  out.push(`Label: ${describeLabelRule(options.label)}.`, "");
  out.push("Real rows per split and class, before balancing:", "", ...countsTable(built.counts.before, built.partitions, classes), "");
  out.push("Rows per split and class in the files, after balancing:", "", ...countsTable(built.counts.after, built.partitions, classes), "");
  if (built.classWeights) out.push(`Class weights: ${Object.entries(built.classWeights).map(([c, w]) => `${c} ${w}`).join(", ")}.`, "");
  out.push("### Columns", "", "| column | unit | group | definition | empty in real rows |", "|---|---|---|---|---:|");
  for (const c of built.columns) out.push(`| ${c.name} | ${md(c.unit) || "—"} | ${c.group} | ${md(c.definition)} | ${c.missing} |`);
  out.push("");

  out.push("## Collection process", "");
  out.push("Records were keyed in or imported from the sources below, each value kept as entered beside its canonical form. Record quality is the source's score (kind, density method, outcome evidence, parameters reported) times the completeness of the record's own fields.", "");
  const q = built.quality;
  out.push(`Quality of the real rows: ${q.scored} scored (min ${q.min ?? "—"}, median ${q.median ?? "—"}, mean ${q.mean ?? "—"}, max ${q.max ?? "—"}), ${q.unscored} not yet scored.`, "");
  out.push("### Sources", "", "| id | citation | real rows per split |", "|---:|---|---|");
  for (const s of built.sources) out.push(`| ${s.id} | ${md(s.citation)} | ${Object.entries(s.rows).map(([p, n]) => `${p.replace("_", " ")} ${n}`).join(", ")} |`);
  out.push("");

  out.push("## Preprocessing, cleaning and labelling", "");
  out.push("Filters:", "", ...describeFilters(options.filters).map((f) => `- ${f}`), "");
  const d = built.counts.dropped;
  out.push(`Of ${built.counts.records} record(s) in the collection, left out: ${d.status} by status, ${d.alloy} by alloy, ${d.source} by source, ${d.date} by date, ${d.quality} by quality, ${d.no_label} without a label${Object.keys(built.counts.noLabelReasons).length ? ` (${Object.entries(built.counts.noLabelReasons).map(([r, n]) => `${r}: ${n}`).join("; ")})` : ""}. Nothing else is left out${options.balance.method === "under" ? " except by under-sampling" : ""}.`, "");
  out.push(`Split: ${split}. The records of one source are never in two splits.`, "");
  out.push(`Balancing: ${BALANCE_TEXT[options.balance.method]}.${["over", "smote", "gaussian"].includes(options.balance.method) ? ` Synthetic rows are made only from real training rows of one class and one alloy${options.split.kind === "folds" ? " and one fold" : ""}, never enter validation or test, and stay at or below ${options.balance.maxSyntheticMultiple}× the real rows of their class and alloy.` : ""}${options.balance.method === "smote" ? ` k = ${options.balance.k}.` : ""}`, "");
  const fills = built.fills.filter((f) => f.missing > 0);
  if (fills.length) {
    out.push("Missing process values (needed by the physics and the sampling) were filled:", "");
    for (const f of fills) out.push(`- ${f.field}: ${f.missing} row(s), ${f.method}${Object.keys(f.values).length ? `: ${Object.entries(f.values).map(([a, v]) => `${a === "*" ? "all alloys" : a} ${v}`).join(", ")}` : ""}${f.leftEmpty ? `; ${f.leftEmpty} left empty` : ""}`);
    out.push("");
  }

  out.push("## Warnings", "");
  if (built.warnings.length) out.push(...built.warnings.map((w) => `- ${md(w)}`));
  else out.push("None.");
  out.push("");

  out.push("## Uses", "");
  out.push("Intended for printability and density models and for comparing physics criteria with outcomes. Not a process specification: the physics is conduction-mode only and the outcome labels come from the sources' own judgement. Do not evaluate on synthetic rows, and keep splits by source. Nothing here is safety-checked: LPBF machines use Class 4 lasers (IEC 60825-1) and fine metal powders are combustible (NFPA 484); stay inside the machine maker's limits and your site's procedures.", "");

  out.push("## Distribution", "");
  out.push("| file | rows | bytes | SHA-256 |", "|---|---:|---:|---|");
  for (const f of files) out.push(`| ${f.name} | ${f.rows ?? "—"} | ${f.bytes} | ${f.sha256} |`);
  out.push("", "CSV text cells that start with = + - @, a tab or a carriage return are prefixed with a single quote (OWASP CSV injection); numbers are written as numbers.", "");

  out.push("## Maintenance", "");
  out.push(`Saved as an export run in Meltledger with its options and seed; running it again on the same records gives the same files. manifest.json holds the same facts for programs. Tool: meltledger ${toolVersion}.`, "");
  return out.join("\n");
}
