/**
 * Shapes shared by the training-set export core: the records and sources it reads, and the
 * options that steer it (already validated by lib/schemas/export.ts).
 */
import type { Composition } from "../composition";

/** A build record as the export reads it, canonical units. */
export interface ExportRecord {
  id: number;
  sourceId: number;
  alloyKey: string;
  status: string;
  outcome: string;
  relativeDensityPct: number | null;
  laserPowerW: number | null;
  scanSpeedMmPerS: number | null;
  hatchSpacingUm: number | null;
  layerThicknessUm: number | null;
  /** 1/e² diameter, as stored. */
  spotDiameterUm: number | null;
  preheatC: number | null;
  powderD50Um: number | null;
  /** Record quality in [0, 1] (source score × completeness); null when not yet scored. */
  qualityScore: number | null;
  /** ISO timestamps. */
  createdAt: string;
  updatedAt: string;
  /** The record's material; null when it has no components. */
  composition: Composition | null;
}

/** A source as the datasheet cites it. */
export interface ExportSource {
  id: number;
  kind: string;
  title: string;
  authors: readonly string[];
  year: number | null;
  venue: string | null;
  doi: string | null;
  url: string | null;
}

export const LABEL_SCHEMES = ["binary", "multiclass", "density"] as const;
export type LabelScheme = (typeof LABEL_SCHEMES)[number];

export const BALANCE_METHODS = ["none", "weights", "over", "under", "smote", "gaussian"] as const;
export type BalanceMethod = (typeof BALANCE_METHODS)[number];

export const FEATURE_GROUPS = ["process", "energy", "meltpool", "mixture", "composition", "provenance"] as const;
export type FeatureGroup = (typeof FEATURE_GROUPS)[number];

export interface LabelRule {
  scheme: LabelScheme;
  /** Binary success needs relative density at or above this, in % (99.0 default, DOMAIN.md "Outcomes"). */
  densityThresholdPct: number;
}

export interface ExportFilters {
  /** Records awaiting review are included as well as accepted ones. */
  includeUnreviewed: boolean;
  /** Records below this quality (or not yet scored) are left out; null: no quality filter. */
  minQuality: number | null;
  /** Alloy keys; empty: every alloy. */
  alloys: readonly string[];
  /** Source ids; empty: every source. */
  sourceIds: readonly number[];
  /** Records entered on or after / on or before these dates (YYYY-MM-DD, UTC); null: open. */
  enteredFrom: string | null;
  enteredTo: string | null;
}

export type SplitSpec =
  | { kind: "source"; train: number; validation: number; test: number }
  | { kind: "folds"; k: number };

export interface BalanceOptions {
  method: BalanceMethod;
  /** Neighbours for SMOTE (5 default, as in Chawla et al. 2002). */
  k: number;
  /** Synthetic rows of one class, alloy and partition stay at or below this multiple of its real rows. */
  maxSyntheticMultiple: number;
}

export interface ExportOptions {
  filters: ExportFilters;
  label: LabelRule;
  features: readonly FeatureGroup[];
  balance: BalanceOptions;
  split: SplitSpec;
  seed: number;
}

/** Where a row ends up: a split of a source split, or "fold" for k group folds. */
export type SplitName = "train" | "validation" | "test";

/** An expected problem that stops an export before anything is written. */
export interface ExportProblem {
  code: "no_rows" | "class_too_small" | "bad_split" | "balance_needs_classes" | "too_few_sources";
  message: string;
  details?: Record<string, unknown>;
}
