/**
 * Splits by source: all records of one source go to one split (or one fold), so a model is never
 * tested on the paper it was trained on (DOMAIN.md, "Training-set export"). Sources are placed one
 * at a time, largest first (ties in a seeded random order), each where it brings the class counts
 * of the splits closest to their targets; this stratifies by class as far as whole sources allow.
 */
import type { Prng } from "../prng";

/** One row's group (its source) and class (null for regression). */
export interface GroupedRow {
  group: number;
  cls: string | null;
}

interface Group {
  id: number;
  size: number;
  counts: Map<string, number>;
}

function groupsOf(rows: readonly GroupedRow[]): { groups: Group[]; totals: Map<string, number> } {
  const byId = new Map<number, Group>();
  const totals = new Map<string, number>();
  for (const r of rows) {
    const cls = r.cls ?? "";
    let g = byId.get(r.group);
    if (!g) byId.set(r.group, (g = { id: r.group, size: 0, counts: new Map() }));
    g.size += 1;
    g.counts.set(cls, (g.counts.get(cls) ?? 0) + 1);
    totals.set(cls, (totals.get(cls) ?? 0) + 1);
  }
  return { groups: [...byId.values()].sort((a, b) => a.id - b.id), totals };
}

/**
 * Places groups into bins with the given target fractions (bins with fraction 0 get nothing).
 * Returns the bin index of each group.
 *
 * @example placeGroups(rows, [0.7, 0.15, 0.15], createPrng(1)); // Map { 3 => 0, 7 => 2, … }
 */
export function placeGroups(rows: readonly GroupedRow[], fractions: readonly number[], rng: Prng): Map<number, number> {
  if (!fractions.length || fractions.some((x) => !(x >= 0)) || Math.abs(fractions.reduce((s, x) => s + x, 0) - 1) > 1e-9) {
    throw new RangeError(`placeGroups: fractions must be non-negative and sum to 1, got ${fractions.join(", ")}`);
  }
  const { groups, totals } = groupsOf(rows);
  const classes = [...totals.keys()].sort();
  const target = fractions.map((fr) => classes.map((c) => fr * totals.get(c)!));
  const count = fractions.map(() => classes.map(() => 0));
  const order = rng.shuffle(groups).sort((a, b) => b.size - a.size);
  const placed = new Map<number, number>();
  for (const g of order) {
    const gc = classes.map((c) => g.counts.get(c) ?? 0);
    let best = -1;
    let bestDelta = Infinity;
    for (let b = 0; b < fractions.length; b++) {
      if (fractions[b] === 0) continue;
      let delta = 0;
      for (let c = 0; c < classes.length; c++) delta += gc[c]! * (2 * (count[b]![c]! - target[b]![c]!) + gc[c]!);
      if (delta < bestDelta - 1e-9) {
        bestDelta = delta;
        best = b;
      }
    }
    placed.set(g.id, best);
    for (let c = 0; c < classes.length; c++) count[best]![c]! += gc[c]!;
  }
  return placed;
}

export const SPLIT_NAMES = ["train", "validation", "test"] as const;

/**
 * Train/validation/test by source.
 *
 * @example splitBySource(rows, { train: 0.7, validation: 0.15, test: 0.15 }, createPrng(7)).get(12); // "test"
 */
export function splitBySource(rows: readonly GroupedRow[], fractions: { train: number; validation: number; test: number }, rng: Prng): Map<number, (typeof SPLIT_NAMES)[number]> {
  const placed = placeGroups(rows, [fractions.train, fractions.validation, fractions.test], rng);
  return new Map([...placed].map(([g, b]) => [g, SPLIT_NAMES[b]!]));
}

/**
 * k group folds (0 … k−1), stratified where whole sources allow. Needs at least k groups.
 *
 * @example groupFolds(rows, 5, createPrng(7)).get(12); // 3
 */
export function groupFolds(rows: readonly GroupedRow[], k: number, rng: Prng): Map<number, number> {
  if (!Number.isInteger(k) || k < 2) throw new RangeError(`groupFolds: k must be a whole number of at least 2, got ${k}`);
  return placeGroups(rows, Array.from({ length: k }, () => 1 / k), rng);
}

/**
 * Reads a split given as text: `source:0.7,0.15,0.15` or `folds:5`. Problems come back as a message.
 *
 * @example parseSplitSpec("folds:5"); // { ok: true, spec: { kind: "folds", k: 5 } }
 */
export function parseSplitSpec(text: string): { ok: true; spec: { kind: "source"; train: number; validation: number; test: number } | { kind: "folds"; k: number } } | { ok: false; message: string } {
  const t = text.trim().toLowerCase();
  const folds = /^folds:(\d+)$/.exec(t);
  if (folds) {
    const k = Number(folds[1]);
    if (k < 2 || k > 20) return { ok: false, message: `folds:K takes K from 2 to 20, got ${k}` };
    return { ok: true, spec: { kind: "folds", k } };
  }
  const source = /^source:([^,]+),([^,]+),([^,]+)$/.exec(t);
  if (!source) return { ok: false, message: `a split is source:TRAIN,VALIDATION,TEST (e.g. source:0.7,0.15,0.15) or folds:K (e.g. folds:5), got "${text}"` };
  const [train, validation, test] = [source[1], source[2], source[3]].map((x) => Number(x));
  if (![train, validation, test].every((x) => Number.isFinite(x) && x! >= 0 && x! <= 1)) return { ok: false, message: `split fractions must be numbers from 0 to 1, got "${text}"` };
  const sum = train! + validation! + test!;
  if (Math.abs(sum - 1) > 1e-6) return { ok: false, message: `split fractions must sum to 1; ${train} + ${validation} + ${test} = ${Math.round(sum * 1e6) / 1e6}` };
  if (train! <= 0) return { ok: false, message: "the train fraction must be above 0" };
  return { ok: true, spec: { kind: "source", train: train!, validation: validation!, test: test! } };
}
