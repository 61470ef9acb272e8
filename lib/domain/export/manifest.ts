/**
 * manifest.json of an export: everything a pipeline needs to trust and reproduce the files —
 * options, filters, label rule, every column with its definition and unit, counts per class and
 * split before and after balancing, sources, quality, file hashes, tool version and warnings.
 * Keys are written in a fixed order and hold no clock time, so a re-run gives the same bytes.
 */
import type { BuiltExport } from "./build";
import { describeFilters } from "./filters";
import { describeLabelRule } from "./labels";
import type { ExportOptions } from "./types";

export const MANIFEST_FORMAT = "meltledger-training-set/1";

export interface ExportFileEntry {
  name: string;
  /** Data rows (CSV and Parquet); null for the datasheet. */
  rows: number | null;
  bytes: number;
  sha256: string;
}

/** The options as plain snake_case JSON, the form a re-run reads back. */
export function optionsJson(o: ExportOptions) {
  return {
    filters: {
      include_unreviewed: o.filters.includeUnreviewed,
      min_quality: o.filters.minQuality,
      alloys: [...o.filters.alloys],
      source_ids: [...o.filters.sourceIds],
      entered_from: o.filters.enteredFrom,
      entered_to: o.filters.enteredTo,
    },
    label: { scheme: o.label.scheme, density_threshold_pct: o.label.densityThresholdPct },
    features: [...o.features],
    balance: { method: o.balance.method, k: o.balance.k, max_synthetic_multiple: o.balance.maxSyntheticMultiple },
    split: o.split.kind === "source" ? { kind: "source", train: o.split.train, validation: o.split.validation, test: o.split.test } : { kind: "folds", k: o.split.k },
    seed: o.seed,
  };
}

/**
 * The manifest object (serialize with JSON.stringify(m, null, 2)).
 *
 * @example buildManifest(built, options, "0.1.0", files).files[0].sha256; // "3f2a…"
 */
export function buildManifest(built: BuiltExport, options: ExportOptions, toolVersion: string, files: readonly ExportFileEntry[]) {
  return {
    format: MANIFEST_FORMAT,
    tool: { name: "meltledger", version: toolVersion },
    seed: options.seed,
    options: optionsJson(options),
    filters: describeFilters(options.filters),
    label_rule: { scheme: options.label.scheme, density_threshold_pct: options.label.densityThresholdPct, text: describeLabelRule(options.label), classes: built.classes },
    balancing: { method: options.balance.method, k: options.balance.k, max_synthetic_multiple: options.balance.maxSyntheticMultiple, class_weights: built.classWeights },
    columns: built.columns.map((c) => ({ name: c.name, type: c.kind, group: c.group, unit: c.unit, definition: c.definition, missing_in_real_rows: c.missing })),
    missing_values_filled: built.fills.filter((f) => f.missing > 0).map((f) => ({ field: f.field, missing: f.missing, method: f.method, values: f.values, left_empty: f.leftEmpty })),
    counts: {
      records_in_collection: built.counts.records,
      left_out: built.counts.dropped,
      no_label_reasons: built.counts.noLabelReasons,
      labelled: built.counts.labelled,
      before_balancing: built.counts.before,
      after_balancing: built.counts.after,
      synthetic: built.counts.synthetic,
      under_sampled_away: built.counts.underSampled,
    },
    sources: built.sources.map((s) => ({ id: s.id, citation: s.citation, rows: s.rows })),
    quality: built.quality,
    data_as_of: built.dataAsOf,
    physics_parameter_sets_solved: built.physicsSolves,
    files: files.map((f) => ({ name: f.name, rows: f.rows, bytes: f.bytes, sha256: f.sha256 })),
    warnings: built.warnings,
  };
}
