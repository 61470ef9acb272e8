/**
 * Seeded Latin hypercube designs in the unit cube, spread by the maximin criterion.
 *
 * A Latin hypercube of n points puts exactly one point in each of the n equal strata of every
 * axis (McKay, Beckman & Conover, Technometrics 21(2):239–245, 1979). Among such designs, a
 * maximin design makes the smallest distance between two points as large as possible (Johnson,
 * Moore & Ylvisaker, J. Stat. Plan. Inference 26:131–148, 1990). The search here is the usual
 * one: the best of a few random designs, then swaps of two points' strata on one axis that lower
 * φ_p = (Σ d_ij^−p)^(1/p), a smooth stand-in for the smallest distance (Morris & Mitchell,
 * J. Stat. Plan. Inference 43:381–402, 1995, who suggest p around 15–50; from memory).
 *
 * Randomness comes in as a function, so the same generator state gives the same design.
 */

export interface LatinHypercubeOptions {
  /** Random designs tried before improving the best; default 10. */
  candidates?: number;
  /** Stratum swaps proposed; default 200·n, at most 20,000. */
  iterations?: number;
  /** Exponent of φ_p; default 15. */
  p?: number;
  /** Place each point uniformly within its strata instead of at their centres; default false. */
  jitter?: boolean;
}

function requireSize(fn: string, n: number, dims: number): void {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`${fn}: n must be a whole number >= 0, got ${n}`);
  if (!Number.isInteger(dims) || dims < 1) throw new RangeError(`${fn}: dims must be a whole number >= 1, got ${dims}`);
}

function permutation(n: number, random: () => number): number[] {
  const out = Array.from({ length: n }, (_, i) => i);
  for (let i = n - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    const t = out[i]!;
    out[i] = out[j]!;
    out[j] = t;
  }
  return out;
}

/** strata[d][i]: the stratum of point i on axis d. */
function randomStrata(n: number, dims: number, random: () => number): number[][] {
  return Array.from({ length: dims }, () => permutation(n, random));
}

function toPoints(strata: number[][], n: number, random: () => number, jitter: boolean): number[][] {
  return Array.from({ length: n }, (_, i) => strata.map((axis) => (axis[i]! + (jitter ? random() : 0.5)) / n));
}

/**
 * A random Latin hypercube of n points in [0, 1)^dims (one point per stratum of every axis),
 * points at their strata centres unless `jitter` is set.
 *
 * @example
 * latinHypercube(4, 2, createPrng(1).next); // e.g. [[0.625, 0.125], [0.125, 0.875], [0.875, 0.375], [0.375, 0.625]]
 */
export function latinHypercube(n: number, dims: number, random: () => number, jitter = false): number[][] {
  requireSize("latinHypercube", n, dims);
  return toPoints(randomStrata(n, dims, random), n, random, jitter);
}

function squaredDistance(strata: number[][], i: number, j: number): number {
  let s = 0;
  for (const axis of strata) {
    const d = axis[i]! - axis[j]!;
    s += d * d;
  }
  return s;
}

/**
 * The smallest Euclidean distance between two points (Infinity for fewer than two).
 *
 * @example
 * minPairDistance([[0, 0], [3, 4], [0, 1]]); // 1
 */
export function minPairDistance(points: readonly (readonly number[])[]): number {
  let best = Infinity;
  for (let i = 0; i < points.length; i++) {
    for (let j = i + 1; j < points.length; j++) {
      let s = 0;
      const a = points[i]!;
      const b = points[j]!;
      for (let d = 0; d < a.length; d++) s += (a[d]! - b[d]!) ** 2;
      if (s < best) best = s;
    }
  }
  return Math.sqrt(best);
}

/**
 * A maximin Latin hypercube of n points in [0, 1)^dims. Deterministic for a given `random`
 * sequence. Distances are measured in stratum units, so every axis weighs the same.
 *
 * @example
 * const rng = createPrng(1);
 * maximinLatinHypercube(12, 2, () => rng.next()); // 12 points, one per row and column stratum, well spread
 */
export function maximinLatinHypercube(n: number, dims: number, random: () => number, options: LatinHypercubeOptions = {}): number[][] {
  requireSize("maximinLatinHypercube", n, dims);
  const p = options.p ?? 15;
  const candidates = options.candidates ?? 10;
  const iterations = options.iterations ?? Math.min(20_000, 200 * n);
  if (!(p > 0) || !Number.isInteger(candidates) || candidates < 1 || !Number.isInteger(iterations) || iterations < 0) {
    throw new RangeError(`maximinLatinHypercube: p must be > 0, candidates >= 1 and iterations >= 0; got ${p}, ${candidates}, ${iterations}`);
  }
  if (n < 3) return latinHypercube(n, dims, random, options.jitter ?? false);

  // term(i, j) = d_ij^−p in stratum units; φ_p^p is the sum over pairs.
  const power = -p / 2;
  const termOf = p === 15 ? (s: number) => 1 / (s * s * s * s * s * s * s * Math.sqrt(s)) : (s: number) => s ** power;
  const sumOf = (s: number[][]) => {
    let total = 0;
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) total += termOf(squaredDistance(s, i, j));
    return total;
  };
  let strata = randomStrata(n, dims, random);
  let sum = sumOf(strata);
  for (let c = 1; c < candidates; c++) {
    const other = randomStrata(n, dims, random);
    const otherSum = sumOf(other);
    if (otherSum < sum) {
      strata = other;
      sum = otherSum;
    }
  }
  // The terms of every pair, kept: a swap changes only the 2n − 3 terms of the two points swapped.
  const terms = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const t = termOf(squaredDistance(strata, i, j));
      terms[i * n + j] = t;
      terms[j * n + i] = t;
    }
  }
  const fresh = new Float64Array(2 * n);
  for (let it = 0; it < iterations; it++) {
    const d = Math.floor(random() * dims);
    const a = Math.floor(random() * n);
    let b = Math.floor(random() * (n - 1));
    if (b >= a) b++;
    const axis = strata[d]!;
    const t = axis[a]!;
    axis[a] = axis[b]!;
    axis[b] = t;
    let before = 0;
    let after = 0;
    for (let k = 0; k < n; k++) {
      if (k === a || k === b) continue;
      before += terms[a * n + k]! + terms[b * n + k]!;
      const ta = termOf(squaredDistance(strata, a, k));
      const tb = termOf(squaredDistance(strata, b, k));
      fresh[k] = ta;
      fresh[n + k] = tb;
      after += ta + tb;
    }
    // The pair (a, b) itself keeps its distance: a swap on one axis leaves |a − b| unchanged.
    if (after < before) {
      for (let k = 0; k < n; k++) {
        if (k === a || k === b) continue;
        terms[a * n + k] = terms[k * n + a] = fresh[k]!;
        terms[b * n + k] = terms[k * n + b] = fresh[n + k]!;
      }
    } else {
      axis[b] = axis[a]!;
      axis[a] = t;
    }
  }
  return toPoints(strata, n, random, options.jitter ?? false);
}
