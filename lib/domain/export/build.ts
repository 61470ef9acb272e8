/**
 * The training-set export, end to end and pure: filter → label → split by source → fill missing
 * process values → features → balance the training rows → tables, counts and warnings. The same
 * records, options and seed give the same tables, row for row.
 *
 * Rules kept here: synthetic rows are marked, are made only from real training rows of one class
 * and one alloy (and one fold), never enter validation or test, and stay at or below a multiple of
 * the real rows they come from; the records of one source never straddle splits.
 */
import { createPrng, type Prng } from "../prng";
import { balancedClassWeights, overSampleIndices, underSampleIndices } from "./balancing/random-sampling";
import { gaussianSample, meanAndSpread } from "./balancing/gaussian";
import { smote } from "./balancing/smote";
import { formatCitation } from "./citation";
import type { Cell, TableColumn } from "./csv-writer";
import { createFeatureComputer, materialContext, roundSig, type FeatureDef, type MaterialContext, type RowProvenance } from "./features";
import { fillMissing, type FillReport } from "./fill";
import { applyFilters, type DropReason } from "./filters";
import { labelClasses, labelOf } from "./labels";
import { clipToHardLimit, PROCESS_FIELDS, processPointOf, type ProcessPoint } from "./process-point";
import { groupFolds, splitBySource } from "./splits";
import { ColumnarTable } from "./table";
import type { ExportOptions, ExportProblem, ExportRecord, ExportSource } from "./types";

/** Fewer real rows than this in a class earns a warning (a common rule of thumb for a class to be learnable). */
export const SMALL_CLASS_ROWS = 20;

export interface BuildInput {
  records: readonly ExportRecord[];
  sources: readonly ExportSource[];
  options: ExportOptions;
  /**
   * When the caller read only part of the collection (e.g. the database query already applied the
   * status, alloy and source filters): the collection's size and what that left out, by reason.
   */
  narrowed?: { total: number; dropped: Partial<Record<DropReason, number>> };
  /** A clock in ms (e.g. performance.now) to time the stages; without it no timings are taken. */
  clock?: () => number;
}

export interface OutputTable {
  /** train | validation | test, or folds. */
  name: string;
  table: ColumnarTable;
}

export interface ColumnDoc extends TableColumn {
  group: "row" | FeatureDef["group"];
  unit: string;
  definition: string;
  /** Real rows without a value in the files. */
  missing: number;
}

export interface SourceSummary {
  id: number;
  citation: string;
  /** Real rows per partition. */
  rows: Record<string, number>;
}

export interface QualitySummary {
  scored: number;
  unscored: number;
  min: number | null;
  median: number | null;
  mean: number | null;
  max: number | null;
}

export type ClassCounts = Record<string, Record<string, number>>;

export interface BuiltExport {
  columns: ColumnDoc[];
  tables: OutputTable[];
  /** Partitions in output order: train, validation, test, or fold_0 … fold_{k−1}. */
  partitions: string[];
  classes: string[] | null;
  counts: {
    records: number;
    dropped: Record<DropReason | "no_label", number>;
    noLabelReasons: Record<string, number>;
    labelled: number;
    /** Real rows per partition and class, before balancing. */
    before: ClassCounts;
    /** Rows per partition and class in the files (real kept + synthetic). */
    after: ClassCounts;
    synthetic: ClassCounts;
    /** Real training rows left out by under-sampling, per partition and class. */
    underSampled: ClassCounts;
  };
  classWeights: Record<string, number> | null;
  fills: FillReport[];
  sources: SourceSummary[];
  quality: QualitySummary;
  warnings: string[];
  /** Latest update among the real rows written (the data's "as of" time). */
  dataAsOf: string | null;
  /** Distinct melt-pool parameter sets solved. */
  physicsSolves: number;
  /** Milliseconds per stage when a clock was given. */
  timings: Record<string, number>;
}

export type BuildResult = { ok: true; built: BuiltExport } | { ok: false; problem: ExportProblem };

interface Row {
  rec: ExportRecord;
  cls: string;
  label: number | string;
  partition: string;
  split: string;
  fold: number | null;
  point: ProcessPoint;
  ctx: MaterialContext;
}

interface Synthetic {
  partition: string;
  split: string;
  fold: number | null;
  alloy: string;
  cls: string;
  label: number | string;
  point: ProcessPoint;
  ctx: MaterialContext;
  parents: string;
}

const CLASS_ALL = "all";
const inc = (o: ClassCounts, p: string, c: string, by = 1) => {
  const m = (o[p] ??= {});
  m[c] = (m[c] ?? 0) + by;
};
const sortedKeys = <T>(m: Map<string, T>) => [...m.keys()].sort();

/** Seeds for the independent streams: changing the balancing never moves a source to another split. */
function streams(seed: number): { split: Prng; balance: Prng } {
  return { split: createPrng(seed), balance: createPrng((Math.trunc(seed) + 0x9e3779b9) >>> 0) };
}

/**
 * Builds the training set.
 *
 * @example
 * const r = buildTrainingSet({ records, sources, options });
 * if (r.ok) r.built.tables.map((t) => [t.name, t.rows.length]); // [["train", 812], ["validation", 160], ["test", 171]]
 */
export function buildTrainingSet(input: BuildInput): BuildResult {
  const { options } = input;
  const timings: Record<string, number> = {};
  let last = input.clock?.() ?? 0;
  const lap = (stage: string) => {
    if (!input.clock) return;
    const now = input.clock();
    timings[stage] = (timings[stage] ?? 0) + now - last;
    last = now;
  };
  const classesOfRule = labelClasses(options.label);
  const method = options.balance.method;
  if (classesOfRule === null && method !== "none") {
    return { ok: false, problem: { code: "balance_needs_classes", message: `Balancing (${method}) needs classes; relative density is a regression label. Choose balance "none", or a binary or multi-class label.` } };
  }
  if (options.split.kind === "source" && Math.abs(options.split.train + options.split.validation + options.split.test - 1) > 1e-6) {
    const s = options.split;
    return { ok: false, problem: { code: "bad_split", message: `Split fractions must sum to 1; ${s.train} + ${s.validation} + ${s.test} = ${Math.round((s.train + s.validation + s.test) * 1e6) / 1e6}.` } };
  }

  const records = [...input.records].sort((a, b) => a.id - b.id);
  const filtered = applyFilters(records, options.filters);
  const noLabelReasons: Record<string, number> = {};
  const labelled: { rec: ExportRecord; cls: string; label: number | string }[] = [];
  for (const rec of filtered.kept) {
    const l = labelOf(rec, options.label);
    if (l.ok) labelled.push({ rec, cls: l.className ?? CLASS_ALL, label: l.label });
    else noLabelReasons[l.reason] = (noLabelReasons[l.reason] ?? 0) + 1;
  }
  const noLabel = Object.values(noLabelReasons).reduce((s, n) => s + n, 0);
  const dropped = { ...filtered.dropped, no_label: noLabel };
  for (const [reason, n] of Object.entries(input.narrowed?.dropped ?? {})) dropped[reason as DropReason] += n ?? 0;
  const collectionSize = input.narrowed?.total ?? records.length;
  if (!labelled.length) {
    const why = Object.entries(dropped).filter(([, n]) => n > 0).map(([k, n]) => `${n} by ${k.replace("_", " ")}`).join(", ");
    return { ok: false, problem: { code: "no_rows", message: `No record is left to export: ${collectionSize} record(s) in the collection${why ? `, ${why}` : ""}. Loosen the filters (for records awaiting review, include unreviewed ones) or choose another label.`, details: { dropped } } };
  }

  const rng = streams(options.seed);
  let partitions: string[];
  const partitionOf = new Map<number, { partition: string; split: string; fold: number | null }>();
  const grouped = labelled.map((l) => ({ group: l.rec.sourceId, cls: l.cls }));
  if (options.split.kind === "source") {
    const bySource = splitBySource(grouped, options.split, rng.split);
    for (const [g, s] of bySource) partitionOf.set(g, { partition: s, split: s, fold: null });
    partitions = ["train", "validation", "test"];
  } else {
    const k = options.split.k;
    const sourceCount = new Set(grouped.map((g) => g.group)).size;
    if (sourceCount < k) {
      return { ok: false, problem: { code: "too_few_sources", message: `${k} group folds need at least ${k} sources; the filtered records come from ${sourceCount}. Choose fewer folds or a source split.`, details: { sources: sourceCount, k } } };
    }
    const folds = groupFolds(grouped, k, rng.split);
    for (const [g, f] of folds) partitionOf.set(g, { partition: `fold_${f}`, split: "fold", fold: f });
    partitions = Array.from({ length: k }, (_, i) => `fold_${i}`);
  }
  const isTraining = (partition: string) => (options.split.kind === "source" ? partition === "train" : true);

  // Missing process values: medians of training rows only.
  const place = labelled.map((l) => partitionOf.get(l.rec.sourceId)!);
  const filled = fillMissing(labelled.map((l) => processPointOf(l.rec)), labelled.map((l) => l.rec.alloyKey), place.map((p) => isTraining(p.partition)));

  const contexts = new Map<string, MaterialContext>();
  // Records usually share one composition object per material: remember its context by identity
  // before building the text key (the same key gives the same context).
  const byComposition = new Map<ExportRecord["composition"], Map<string, MaterialContext>>();
  const contextOf = (rec: ExportRecord): MaterialContext => {
    let byAlloy = byComposition.get(rec.composition);
    if (!byAlloy) byComposition.set(rec.composition, (byAlloy = new Map()));
    let c = byAlloy.get(rec.alloyKey);
    if (c) return c;
    const key = `${rec.alloyKey}|${rec.composition ? rec.composition.components.map((x) => `${x.element}${x.amount}`).join(",") : ""}`;
    c = contexts.get(key);
    if (!c) contexts.set(key, (c = materialContext(rec.alloyKey, rec.composition)));
    byAlloy.set(rec.alloyKey, c);
    return c;
  };
  const rows: Row[] = new Array(labelled.length);
  for (let i = 0; i < labelled.length; i++) {
    const l = labelled[i]!;
    const at = place[i]!;
    rows[i] = { rec: l.rec, cls: l.cls, label: l.label, partition: at.partition, split: at.split, fold: at.fold, point: filled.points[i]!, ctx: contextOf(l.rec) };
  }

  lap("filter, label, split, fill");
  // Balancing ------------------------------------------------------------------------------------
  const before: ClassCounts = {};
  for (const p of partitions) before[p] = {};
  for (const r of rows) inc(before, r.partition, r.cls);

  const synthetic: Synthetic[] = [];
  const syntheticCounts: ClassCounts = {};
  const underSampled: ClassCounts = {};
  const removed = new Set<Row>();
  const warnings: string[] = [];
  let classWeights: Map<string, number> | null = null;

  if (method === "weights") {
    const counts = new Map<string, number>();
    for (const r of rows) if (isTraining(r.partition)) counts.set(r.cls, (counts.get(r.cls) ?? 0) + 1);
    classWeights = balancedClassWeights(counts);
  } else if (method !== "none") {
    // partition → alloy → class → rows
    const cells = new Map<string, Map<string, Map<string, Row[]>>>();
    for (const r of rows) {
      if (!isTraining(r.partition)) continue;
      let byAlloy = cells.get(r.partition);
      if (!byAlloy) cells.set(r.partition, (byAlloy = new Map()));
      let byClass = byAlloy.get(r.rec.alloyKey);
      if (!byClass) byAlloy.set(r.rec.alloyKey, (byClass = new Map()));
      let list = byClass.get(r.cls);
      if (!list) byClass.set(r.cls, (list = []));
      list.push(r);
    }
    const capped: string[] = [];
    for (const partition of sortedKeys(cells)) {
      const byAlloy = cells.get(partition)!;
      for (const alloy of sortedKeys(byAlloy)) {
        const byClass = byAlloy.get(alloy)!;
        const sizes = [...byClass.values()].map((l) => l.length);
        if (method === "under") {
          const keep = Math.min(...sizes);
          for (const cls of sortedKeys(byClass)) {
            const list = byClass.get(cls)!;
            if (list.length <= keep) continue;
            const kept = new Set(underSampleIndices(list.length, keep, rng.balance));
            list.forEach((r, i) => {
              if (!kept.has(i)) removed.add(r);
            });
            inc(underSampled, partition, cls, list.length - keep);
          }
          continue;
        }
        const most = Math.max(...sizes);
        const allRows = [...byClass.values()].flat();
        const spread = meanAndSpread(allRows.map((r) => PROCESS_FIELDS.map((f) => r.point[f] ?? 0))).sd;
        for (const cls of sortedKeys(byClass)) {
          const list = byClass.get(cls)!;
          const need = most - list.length;
          if (need <= 0) continue;
          const cap = Math.floor(options.balance.maxSyntheticMultiple * list.length);
          const make = Math.min(need, cap);
          if (make < need) capped.push(`${cls} of ${alloy}${options.split.kind === "folds" ? ` in ${partition}` : ""}: ${make} of ${need} (cap ${options.balance.maxSyntheticMultiple}× ${list.length} real rows)`);
          if (make <= 0) continue;
          const where = `class ${cls} of ${alloy}${options.split.kind === "folds" ? ` in ${partition}` : " in the training split"}`;
          if (method === "smote" && list.length <= options.balance.k) {
            return { ok: false, problem: { code: "class_too_small", message: `SMOTE with k = ${options.balance.k} needs at least ${options.balance.k + 1} real rows per class and alloy; ${where} has ${list.length}. Choose a smaller k, another balancing method, or filters that leave this class out.`, details: { class: cls, alloy, partition, rows: list.length, k: options.balance.k } } };
          }
          if (method === "gaussian" && list.length < 2) {
            return { ok: false, problem: { code: "class_too_small", message: `Gaussian sampling needs at least 2 real rows per class and alloy for a spread; ${where} has ${list.length}. Choose another balancing method, or filters that leave this class out.`, details: { class: cls, alloy, partition, rows: list.length } } };
          }
          // Dimensions every row of the group has; the others are copied from the base row.
          const dims = PROCESS_FIELDS.filter((f) => list.every((r) => r.point[f] !== null));
          const vectors = list.map((r) => dims.map((f) => r.point[f] as number));
          const base = list[0]!;
          const pointFrom = (values: readonly number[], from: Row): ProcessPoint => {
            const p: ProcessPoint = { ...from.point };
            dims.forEach((f, j) => (p[f] = roundSig(values[j]!)));
            return p;
          };
          if (method === "over") {
            for (const i of overSampleIndices(list.length, make, rng.balance)) {
              const r = list[i]!;
              synthetic.push({ partition, split: base.split, fold: base.fold, alloy, cls, label: base.label, point: { ...r.point }, ctx: r.ctx, parents: String(r.rec.id) });
            }
          } else if (method === "smote") {
            const scale = dims.map((f) => spread[PROCESS_FIELDS.indexOf(f)]! || 1);
            const s = smote(vectors, make, options.balance.k, rng.balance, scale);
            s.points.forEach((pt, n) => {
              const [a, b] = s.parents[n]!;
              const from = list[a]!;
              synthetic.push({ partition, split: base.split, fold: base.fold, alloy, cls, label: base.label, point: pointFrom(pt, from), ctx: from.ctx, parents: `${from.rec.id} ${list[b]!.rec.id}` });
            });
          } else {
            const g = gaussianSample(vectors, make, rng.balance, (j, v) => clipToHardLimit(dims[j]!, v));
            for (const pt of g.points) synthetic.push({ partition, split: base.split, fold: base.fold, alloy, cls, label: base.label, point: pointFrom(pt, base), ctx: base.ctx, parents: "" });
          }
          inc(syntheticCounts, partition, cls, make);
        }
      }
    }
    if (capped.length) warnings.push(`The synthetic-row cap stopped full balancing for ${capped.length} class(es): ${capped.join("; ")}.`);
  }

  lap("balance");
  // Features and tables ----------------------------------------------------------------------------
  const written = rows.filter((r) => !removed.has(r));
  const elements = new Set<string>();
  if (options.features.includes("composition")) for (const r of written) for (const el of r.ctx.wtPct.keys()) elements.add(el);
  const fc = createFeatureComputer(options.features, [...elements], written.length + synthetic.length);
  const sourceYear = new Map(input.sources.map((s) => [s.id, s.year]));

  const labelKind: TableColumn["kind"] = options.label.scheme === "binary" ? "integer" : options.label.scheme === "multiclass" ? "text" : "number";
  const fixed: ColumnDoc[] = [
    { name: "record_id", kind: "integer", group: "row", unit: "", definition: "the build record's id in the collection; empty for a synthetic row", missing: 0 },
    { name: "source_id", kind: "integer", group: "row", unit: "", definition: "the id of the record's source (see the sources below); empty for a synthetic row", missing: 0 },
    { name: "alloy", kind: "text", group: "row", unit: "", definition: "alloy key (named grade or tidied designation)", missing: 0 },
    { name: "split", kind: "text", group: "row", unit: "", definition: options.split.kind === "source" ? "train, validation or test (all records of a source in one)" : "fold (see the fold column)", missing: 0 },
    ...(options.split.kind === "folds" ? [{ name: "fold", kind: "integer" as const, group: "row" as const, unit: "", definition: `group fold 0 … ${options.split.k - 1} (all records of a source in one); synthetic rows belong to the fold they were made in — leave them out when that fold is held out`, missing: 0 }] : []),
    { name: "is_synthetic", kind: "integer", group: "row", unit: "", definition: "1 for a row made by balancing (copy, SMOTE or Gaussian sample), 0 for a real record", missing: 0 },
    { name: "synthetic_parents", kind: "text", group: "row", unit: "", definition: "record ids a synthetic row was made from (a copy: one id; SMOTE: the base record and the neighbour it moved towards; Gaussian: empty, made from the class's mean and spread)", missing: 0 },
    { name: "sample_weight", kind: "number", group: "row", unit: "1", definition: method === "weights" ? "balanced class weight n/(C·n_c) from the training rows" : "1 (no class weights chosen)", missing: 0 },
    { name: "label", kind: labelKind, group: "row", unit: options.label.scheme === "density" ? "%" : "", definition: "see the label rule", missing: 0 },
  ];
  const columns: ColumnDoc[] = [...fixed, ...fc.columns.map((d) => ({ name: d.name, kind: "number" as const, group: d.group, unit: d.unit, definition: d.definition, missing: 0 }))];
  const featureStart = fixed.length;
  const hasFold = options.split.kind === "folds";

  const tableRows = new Map<string, ColumnarTable>();
  const expected = new Map<string, number>();
  for (const r of written) expected.set(r.split, (expected.get(r.split) ?? 0) + 1);
  for (const name of hasFold ? ["folds"] : partitions) tableRows.set(name, new ColumnarTable(columns, hasFold ? written.length + synthetic.length : (expected.get(name) ?? 0) + (name === "train" ? synthetic.length : 0)));
  const tableOf = (split: string) => tableRows.get(hasFold ? "folds" : split)!;
  const weightOf = (cls: string) => (classWeights ? roundSig(classWeights.get(cls) ?? 1)! : 1);
  const after: ClassCounts = {};
  for (const p of partitions) after[p] = {};
  const features = new Float64Array(fc.columns.length);
  // One array of row cells, refilled per row (the table copies them).
  const cells: Cell[] = new Array<Cell>(featureStart).fill(null);
  const fillCells = (recordId: Cell, sourceId: Cell, alloy: string, split: string, fold: number | null, isSynthetic: number, parents: string | null, weight: number, label: Cell) => {
    let i = 0;
    cells[i++] = recordId;
    cells[i++] = sourceId;
    cells[i++] = alloy;
    cells[i++] = split;
    if (hasFold) cells[i++] = fold;
    cells[i++] = isSynthetic;
    cells[i++] = parents;
    cells[i++] = weight;
    cells[i++] = label;
  };
  const missing = new Array<number>(fc.columns.length).fill(0);

  const provenance: RowProvenance = { recordQuality: null, sourceYear: null };
  for (const r of written) {
    provenance.recordQuality = r.rec.qualityScore;
    provenance.sourceYear = sourceYear.get(r.rec.sourceId) ?? null;
    fc.compute(r.point, r.ctx, provenance, features);
    for (let j = 0; j < features.length; j++) if (Number.isNaN(features[j]!)) missing[j]! += 1;
    fillCells(r.rec.id, r.rec.sourceId, r.rec.alloyKey, r.split, r.fold, 0, null, weightOf(r.cls), r.label);
    tableOf(r.split).push(cells, features);
    inc(after, r.partition, r.cls);
  }
  missing.forEach((n, j) => (columns[featureStart + j]!.missing = n));
  provenance.recordQuality = null;
  provenance.sourceYear = null;
  for (const s of synthetic) {
    fc.compute(s.point, s.ctx, provenance, features);
    fillCells(null, null, s.alloy, s.split, s.fold, 1, s.parents, 1, s.label);
    tableOf(s.split).push(cells, features);
    inc(after, s.partition, s.cls);
  }
  const tables: OutputTable[] = [...tableRows].map(([name, table]) => ({ name, table }));

  lap("features");
  // Warnings ------------------------------------------------------------------------------------------
  const classes = classesOfRule ? [...classesOfRule] : null;
  if (classes) {
    const total = new Map<string, number>();
    for (const r of rows) total.set(r.cls, (total.get(r.cls) ?? 0) + 1);
    for (const c of classes) {
      const n = total.get(c) ?? 0;
      if (n < SMALL_CLASS_ROWS) warnings.push(`Class ${c} has ${n} real row(s), fewer than ${SMALL_CLASS_ROWS}: too few to learn or to test reliably.`);
    }
    const present = classes.filter((c) => (total.get(c) ?? 0) > 0);
    for (const p of partitions) {
      const missing = present.filter((c) => !(before[p]?.[c]));
      const size = Object.values(before[p] ?? {}).reduce((s, n) => s + n, 0);
      if (size === 0) warnings.push(`The ${p.replace("_", " ")} split has no rows: too few sources for the fractions chosen.`);
      else if (missing.length) warnings.push(`The ${p.replace("_", " ")} split has no real row of class${missing.length > 1 ? "es" : ""} ${missing.join(", ")}.`);
    }
  } else {
    for (const p of partitions) if (!Object.values(before[p] ?? {}).some((n) => n > 0)) warnings.push(`The ${p.replace("_", " ")} split has no rows: too few sources for the fractions chosen.`);
  }
  for (const fill of filled.reports) {
    if (!fill.missing) continue;
    const values = Object.entries(fill.values).map(([a, v]) => `${a === "*" ? "all alloys" : a} ${v}`).join(", ");
    warnings.push(`${fill.field}: ${fill.missing} real row(s) had no value; filled with the ${fill.method}${values ? ` (${values})` : ""}${fill.leftEmpty ? `; ${fill.leftEmpty} left empty (no training row has a value)` : ""}.`);
  }
  for (const c of columns.slice(featureStart)) {
    if (c.missing) warnings.push(`Feature ${c.name} is empty in ${c.missing} of ${written.length} real row(s) (not computable from the record; left empty, not filled).`);
  }
  if (hasFold && synthetic.length) warnings.push("Synthetic rows carry the fold they were made in: leave a fold's synthetic rows out whenever that fold is held out for validation.");

  // Sources and quality --------------------------------------------------------------------------------
  const perSource = new Map<number, Record<string, number>>();
  for (const r of written) {
    const m = perSource.get(r.rec.sourceId) ?? {};
    m[r.partition] = (m[r.partition] ?? 0) + 1;
    perSource.set(r.rec.sourceId, m);
  }
  const sourceById = new Map(input.sources.map((s) => [s.id, s]));
  const sources: SourceSummary[] = [...perSource.keys()].sort((a, b) => a - b).map((id) => {
    const s = sourceById.get(id);
    return { id, citation: s ? formatCitation(s) : `source ${id} (not found)`, rows: perSource.get(id)! };
  });
  const scores = written.map((r) => r.rec.qualityScore).filter((q): q is number => q !== null).sort((a, b) => a - b);
  const mid = scores.length >> 1;
  const quality: QualitySummary = {
    scored: scores.length,
    unscored: written.length - scores.length,
    min: scores.length ? roundSig(scores[0]!) : null,
    median: scores.length ? roundSig(scores.length % 2 ? scores[mid]! : (scores[mid - 1]! + scores[mid]!) / 2) : null,
    mean: scores.length ? roundSig(scores.reduce((s, q) => s + q, 0) / scores.length) : null,
    max: scores.length ? roundSig(scores[scores.length - 1]!) : null,
  };
  let dataAsOf: string | null = null;
  for (const r of written) if (dataAsOf === null || r.rec.updatedAt > dataAsOf) dataAsOf = r.rec.updatedAt;
  lap("summaries");

  return {
    ok: true,
    built: {
      columns,
      tables,
      partitions,
      classes,
      counts: { records: collectionSize, dropped, noLabelReasons, labelled: labelled.length, before, after, synthetic: syntheticCounts, underSampled },
      classWeights: classWeights ? Object.fromEntries([...classWeights].sort(([a], [b]) => (a < b ? -1 : 1)).map(([c, w]) => [c, roundSig(w)!])) : null,
      fills: filled.reports,
      sources,
      quality,
      warnings,
      dataAsOf,
      physicsSolves: fc.solves,
      timings,
    },
  };
}
