/**
 * A memo keyed by a fixed-length tuple of numbers (null allowed), without building a text key
 * per lookup: open addressing over a flat Float64Array of keys, hashed on the bits of the doubles.
 * Keys are equal when every entry is `===` (so 0 and −0 are one key) or both are null.
 */

const EMPTY = -1;

export class TupleMemo {
  readonly width: number;
  private keys: Float64Array;
  /** Per key: 1 where the entry is null. */
  private nulls: Uint8Array;
  private values: Int32Array;
  private slots: Int32Array;
  private count = 0;
  private readonly scratch = new Float64Array(1);
  private readonly bits = new Uint32Array(this.scratch.buffer);

  /** @example new TupleMemo(3).size; // 0 */
  constructor(width: number, initialCapacity = 1024) {
    if (!Number.isInteger(width) || width < 1) throw new RangeError(`TupleMemo: width must be a whole number of at least 1, got ${width}`);
    this.width = width;
    const cap = Math.max(16, initialCapacity);
    this.keys = new Float64Array(cap * width);
    this.nulls = new Uint8Array(cap * width);
    this.values = new Int32Array(cap);
    this.slots = new Int32Array(tableSize(cap)).fill(EMPTY);
  }

  get size(): number {
    return this.count;
  }

  private hash(tuple: ArrayLike<number | null>): number {
    let h = 0x811c9dc5;
    for (let i = 0; i < this.width; i++) {
      const v = tuple[i];
      if (v === null || v === undefined) {
        h = Math.imul(h ^ 0x9e3779b9, 0x01000193);
        continue;
      }
      this.scratch[0] = v + 0; // −0 and 0 hash alike
      h = Math.imul(h ^ this.bits[0]!, 0x01000193);
      h = Math.imul(h ^ this.bits[1]!, 0x01000193);
    }
    return (h ^ (h >>> 15)) >>> 0;
  }

  private same(entry: number, tuple: ArrayLike<number | null>): boolean {
    const base = entry * this.width;
    for (let i = 0; i < this.width; i++) {
      const v = tuple[i];
      if (v === null || v === undefined) {
        if (this.nulls[base + i] !== 1) return false;
      } else if (this.nulls[base + i] === 1 || this.keys[base + i] !== v) return false;
    }
    return true;
  }

  /** The value stored for the tuple, or -1. */
  get(tuple: ArrayLike<number | null>): number {
    const mask = this.slots.length - 1;
    for (let s = this.hash(tuple) & mask; ; s = (s + 1) & mask) {
      const e = this.slots[s]!;
      if (e === EMPTY) return -1;
      if (this.same(e, tuple)) return this.values[e]!;
    }
  }

  /** Stores a value (a whole number ≥ 0) for a tuple not yet stored. */
  add(tuple: ArrayLike<number | null>, value: number): void {
    if (this.count === this.values.length) this.grow();
    const e = this.count++;
    const base = e * this.width;
    for (let i = 0; i < this.width; i++) {
      const v = tuple[i];
      if (v === null || v === undefined) {
        this.nulls[base + i] = 1;
        this.keys[base + i] = 0;
      } else {
        this.keys[base + i] = v;
      }
    }
    this.values[e] = value;
    this.place(e, this.hash(tuple));
  }

  private place(entry: number, hash: number): void {
    const mask = this.slots.length - 1;
    let s = hash & mask;
    while (this.slots[s] !== EMPTY) s = (s + 1) & mask;
    this.slots[s] = entry;
  }

  private grow(): void {
    const cap = this.values.length * 2;
    const keys = new Float64Array(cap * this.width);
    keys.set(this.keys);
    const nulls = new Uint8Array(cap * this.width);
    nulls.set(this.nulls);
    const values = new Int32Array(cap);
    values.set(this.values);
    this.keys = keys;
    this.nulls = nulls;
    this.values = values;
    this.slots = new Int32Array(tableSize(cap)).fill(EMPTY);
    const tuple: (number | null)[] = new Array(this.width);
    for (let e = 0; e < this.count; e++) {
      for (let i = 0; i < this.width; i++) tuple[i] = this.nulls[e * this.width + i] === 1 ? null : this.keys[e * this.width + i]!;
      this.place(e, this.hash(tuple));
    }
  }
}

/** A power of two at least twice the capacity (load factor ≤ 0.5). */
function tableSize(capacity: number): number {
  let n = 16;
  while (n < capacity * 2) n *= 2;
  return n;
}
