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
  /** Values outside the range asked for (implausible ones, say), not binned. */
  outside: number;
}

/**
 * A histogram over the range of the values, with about `bins` bins; log bins when the values span
 * a decade or more (unless a scale is given). With a `range`, values outside it are counted as
 * `outside` and left out of the bins and of the axis. Null when no value is usable.
 *
 * @example
 * histogram([30, 30, 40, 60], 3); // { edges: [30, 40, 50, 60], counts: [2, 1, 1], scale: "linear", missing: 0, outside: 0 }
 * histogram([0.07, 75, 95], 2, undefined, { min: 20, max: 300 }).outside; // 1
 */
export function histogram(values: ArrayLike<number | null>, bins = 20, scale?: AxisScale, range?: { min: number; max: number }): Histogram | null {
  const lo = range?.min ?? -Infinity;
  const hi = range?.max ?? Infinity;
  let min = Infinity;
  let max = -Infinity;
  let positiveMin = Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v !== "number" || !Number.isFinite(v) || v < lo || v > hi) continue;
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
  let outside = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v === "number" && Number.isFinite(v) && (v < lo || v > hi)) {
      outside++;
      continue;
    }
    const b = typeof v === "number" ? binIndex(edges, v) : -1;
    if (b < 0) missing++;
    else counts[b]! += 1;
  }
  return { edges, counts, scale: chosen, missing, outside };
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
