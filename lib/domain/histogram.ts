/**
 * Distributions of one column of a selection: a histogram of a numeric column (hatch, layer,
 * spot, E_v) on readable edges, and a tally of a categorical one (outcome, source).
 */
import { axisEdges, binIndex, chooseScale, niceAxis, type AxisScale } from "./coverage-grid";

export interface Histogram {
  edges: number[];
  counts: number[];
  scale: AxisScale;
  /** Values that are missing (null or NaN) or not positive on a log axis. */
  missing: number;
}

/**
 * A histogram over the range of the values, with about `bins` bins; log bins when the values span
 * a decade or more (unless a scale is given). Null when no value is usable.
 *
 * @example
 * histogram([30, 30, 40, 60], 3); // { edges: [30, 40, 50, 60], counts: [2, 1, 1], scale: "linear", missing: 0 }
 */
export function histogram(values: ArrayLike<number | null>, bins = 20, scale?: AxisScale): Histogram | null {
  let min = Infinity;
  let max = -Infinity;
  let positiveMin = Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v !== "number" || !Number.isFinite(v)) continue;
    if (v < min) min = v;
    if (v > max) max = v;
    if (v > 0 && v < positiveMin) positiveMin = v;
  }
  if (min > max) return null;
  const chosen = scale ?? chooseScale(min, max);
  if (chosen === "log" && !(positiveMin < Infinity)) return null;
  const edges = axisEdges(niceAxis(chosen === "log" ? positiveMin : min, max, bins, chosen));
  const counts = new Array<number>(edges.length - 1).fill(0);
  let missing = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    const b = typeof v === "number" ? binIndex(edges, v) : -1;
    if (b < 0) missing++;
    else counts[b]! += 1;
  }
  return { edges, counts, scale: chosen, missing };
}

/**
 * Counts per distinct value, largest first (ties in first-seen order).
 *
 * @example
 * tally(["dense", "keyhole", "dense"]); // [{ key: "dense", count: 2 }, { key: "keyhole", count: 1 }]
 */
export function tally<T extends string | number>(values: ArrayLike<T>): { key: T; count: number }[] {
  const counts = new Map<T, number>();
  for (let i = 0; i < values.length; i++) counts.set(values[i]!, (counts.get(values[i]!) ?? 0) + 1);
  return [...counts].map(([key, count]) => ({ key, count })).sort((a, b) => b.count - a.count);
}
