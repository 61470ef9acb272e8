/**
 * SMOTE, the synthetic minority over-sampling technique (Chawla, Bowyer, Hall & Kegelmeyer,
 * JAIR 16:321–357, 2002): each new point lies on the segment between a randomly chosen point of the
 * class and one of its k nearest neighbours in the same class, at a uniform random fraction of the
 * way. The caller passes the points of one class (and one alloy) only.
 */
import type { Prng } from "../../prng";
import { buildKdTree } from "./kd-tree";

export interface SmoteResult {
  points: number[][];
  /** For each new point: the index of the point it grew from and of the neighbour it moved towards. */
  parents: [number, number][];
  /** For each new point: the fraction of the way from the first parent to the second, in [0, 1). */
  gaps: number[];
}

/**
 * `n` synthetic points from `points` with `k` neighbours. Distances are measured after dividing each
 * dimension by `scale` (default 1: raw Euclidean); the new point is interpolated in the original
 * units. Needs more than k points: fewer is a RangeError (callers check and report it first).
 *
 * @example smote([[0, 0], [1, 0], [0, 1]], 4, 2, createPrng(1)).points.length; // 4
 */
export function smote(points: readonly (readonly number[])[], n: number, k: number, rng: Prng, scale?: readonly number[]): SmoteResult {
  if (!Number.isInteger(k) || k < 1) throw new RangeError(`smote: k must be a whole number of at least 1, got ${k}`);
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`smote: n must be a whole number of at least 0, got ${n}`);
  if (n === 0) return { points: [], parents: [], gaps: [] };
  if (points.length <= k) throw new RangeError(`smote: ${points.length} points are too few for k = ${k} neighbours (at least ${k + 1} are needed)`);
  const space = scale
    ? points.map((p) => p.map((x, j) => {
        const s = scale[j] ?? 1;
        return s > 0 ? x / s : x;
      }))
    : points;
  const tree = buildKdTree(space);
  const neighbours = new Map<number, number[]>();
  const out: number[][] = new Array(n);
  const parents: [number, number][] = new Array(n);
  const gaps: number[] = new Array(n);
  for (let s = 0; s < n; s++) {
    const i = Math.floor(rng.next() * points.length);
    let nn = neighbours.get(i);
    if (!nn) neighbours.set(i, (nn = tree.neighboursOf(i, k)));
    const j = nn[Math.floor(rng.next() * nn.length)]!;
    const gap = rng.next();
    const a = points[i]!;
    const b = points[j]!;
    out[s] = a.map((x, d) => x + gap * (b[d]! - x));
    parents[s] = [i, j];
    gaps[s] = gap;
  }
  return { points: out, parents, gaps };
}
