/**
 * Gaussian sampling: new points drawn dimension by dimension from a normal distribution with the
 * mean and spread (sample standard deviation) of the class's points, then clipped to hard limits
 * by the caller's `clip`. Dimensions are drawn independently: it fills in a class's box, not its
 * correlations.
 */
import type { Prng } from "../../prng";

export interface GaussianResult {
  points: number[][];
  mean: number[];
  /** Sample standard deviation (n − 1); 0 for a dimension without spread. */
  sd: number[];
}

/**
 * Mean and sample standard deviation of each dimension.
 *
 * @example meanAndSpread([[1], [3]]); // { mean: [2], sd: [1.414…] }
 */
export function meanAndSpread(points: readonly (readonly number[])[]): { mean: number[]; sd: number[] } {
  const d = points[0]?.length ?? 0;
  const mean = new Array<number>(d).fill(0);
  for (const p of points) for (let j = 0; j < d; j++) mean[j]! += p[j]! / points.length;
  const sd = new Array<number>(d).fill(0);
  if (points.length > 1) {
    for (const p of points) for (let j = 0; j < d; j++) sd[j]! += (p[j]! - mean[j]!) ** 2;
    for (let j = 0; j < d; j++) sd[j] = Math.sqrt(sd[j]! / (points.length - 1));
  }
  return { mean, sd };
}

/**
 * `n` points from the per-dimension normal of `points` (at least 2 of them), each value passed
 * through `clip(dimension, value)`.
 *
 * @example gaussianSample([[100], [120]], 3, createPrng(1), (_, v) => Math.max(v, 0)).points.length; // 3
 */
export function gaussianSample(points: readonly (readonly number[])[], n: number, rng: Prng, clip: (dim: number, value: number) => number = (_, v) => v): GaussianResult {
  if (points.length < 2) throw new RangeError(`gaussianSample: at least 2 points are needed for a spread, got ${points.length}`);
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`gaussianSample: n must be a whole number of at least 0, got ${n}`);
  const { mean, sd } = meanAndSpread(points);
  const out: number[][] = new Array(n);
  for (let s = 0; s < n; s++) out[s] = mean.map((m, j) => clip(j, sd[j]! > 0 ? rng.normal(m, sd[j]!) : m));
  return { points: out, mean, sd };
}
