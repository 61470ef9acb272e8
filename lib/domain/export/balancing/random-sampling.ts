/**
 * Random over-sampling (copies of real rows, drawn with replacement) and random under-sampling
 * (a random subset of real rows, without replacement), and balanced class weights.
 */
import type { Prng } from "../../prng";

/**
 * `n` indices in [0, size), drawn with replacement.
 *
 * @example overSampleIndices(3, 5, createPrng(1)); // e.g. [2, 0, 2, 1, 0]
 */
export function overSampleIndices(size: number, n: number, rng: Prng): number[] {
  if (size < 1 && n > 0) throw new RangeError(`overSampleIndices: nothing to copy from (size ${size})`);
  return Array.from({ length: n }, () => Math.floor(rng.next() * size));
}

/**
 * `keep` distinct indices in [0, size), in ascending order.
 *
 * @example underSampleIndices(5, 2, createPrng(1)); // e.g. [1, 4]
 */
export function underSampleIndices(size: number, keep: number, rng: Prng): number[] {
  if (keep > size || keep < 0) throw new RangeError(`underSampleIndices: cannot keep ${keep} of ${size}`);
  return rng.shuffle(Array.from({ length: size }, (_, i) => i)).slice(0, keep).sort((a, b) => a - b);
}

/**
 * Balanced class weights w_c = n / (C · n_c): the heuristic scikit-learn calls "balanced"
 * (King & Zeng, Political Analysis 9(2):137–163, 2001), so every class carries the same total weight.
 *
 * @example balancedClassWeights(new Map([["a", 30], ["b", 10]])); // Map { a => 0.667, b => 2 }
 */
export function balancedClassWeights(counts: ReadonlyMap<string, number>): Map<string, number> {
  const present = [...counts].filter(([, n]) => n > 0);
  const total = present.reduce((s, [, n]) => s + n, 0);
  return new Map(present.map(([c, n]) => [c, total / (present.length * n)]));
}
