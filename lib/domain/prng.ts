/**
 * A small seeded pseudo-random generator (demo scenario, balancing, splits): the same seed gives the same
 * sequence on every machine. Not for cryptography.
 *
 * The core is mulberry32 (a public-domain 32-bit generator): one 32-bit state
 * word advanced by the odd constant 0x6D2B79F5 (a Weyl sequence) and mixed by two
 * multiply-xorshift rounds.
 */

export interface Prng {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform in [min, max). */
  float(min: number, max: number): number;
  /** Uniform integer in [min, max], both inclusive. */
  int(min: number, max: number): number;
  /** True with probability p. */
  chance(p: number): boolean;
  /** One element, uniformly. Throws RangeError for an empty list. */
  pick<T>(items: readonly T[]): T;
  /** One element with probability proportional to its weight. */
  weighted<T>(items: readonly { item: T; weight: number }[]): T;
  /** Normal deviate (Box–Muller). */
  normal(mean: number, sd: number): number;
  /** A shuffled copy (Fisher–Yates). */
  shuffle<T>(items: readonly T[]): T[];
}

/**
 * A generator seeded with any finite number (its low 32 bits after truncation are used).
 *
 * @example
 * const rng = createPrng(42);
 * rng.int(1, 6); // the same die roll on every run
 */
export function createPrng(seed: number): Prng {
  if (!Number.isFinite(seed)) throw new RangeError(`createPrng: seed must be a finite number, got ${seed}`);
  let state = Math.trunc(seed) >>> 0;

  const next = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };

  const pick = <T>(items: readonly T[]): T => {
    if (items.length === 0) throw new RangeError("Prng.pick: empty list");
    return items[Math.floor(next() * items.length)] as T;
  };

  return {
    next,
    float: (min, max) => min + (max - min) * next(),
    int: (min, max) => min + Math.floor(next() * (max - min + 1)),
    chance: (p) => next() < p,
    pick,
    weighted: <T>(items: readonly { item: T; weight: number }[]): T => {
      const total = items.reduce((s, i) => s + i.weight, 0);
      if (!(total > 0)) throw new RangeError("Prng.weighted: weights must sum to more than 0");
      let r = next() * total;
      for (const i of items) {
        r -= i.weight;
        if (r < 0) return i.item;
      }
      return (items[items.length - 1] as { item: T }).item;
    },
    normal: (mean, sd) => {
      const u = 1 - next(); // (0, 1]: log(u) is finite
      const v = next();
      return mean + sd * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
    },
    shuffle: <T>(items: readonly T[]): T[] => {
      const out = [...items];
      for (let i = out.length - 1; i > 0; i -= 1) {
        const j = Math.floor(next() * (i + 1));
        const a = out[i] as T;
        out[i] = out[j] as T;
        out[j] = a;
      }
      return out;
    },
  };
}
