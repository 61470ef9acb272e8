import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { TupleMemo } from "./tuple-memo";

describe("TupleMemo", () => {
  test("property: finds exactly the tuples a text-keyed map finds, through growth", () => {
    const value = fc.oneof(fc.constant(null), fc.constantFrom(0, -0, 1, 0.1, 298.15), fc.double({ noNaN: true }), fc.integer({ min: -5, max: 5 }));
    fc.assert(
      fc.property(fc.array(fc.tuple(value, value, value), { maxLength: 300 }), (tuples) => {
        const memo = new TupleMemo(3, 16);
        const reference = new Map<string, number>();
        const keyOf = (t: readonly (number | null)[]) => t.map((x) => (x === null ? "null" : String(x))).join("|");
        for (const t of tuples) {
          const k = keyOf(t);
          const expected = reference.get(k) ?? -1;
          expect(memo.get(t)).toBe(expected);
          if (expected < 0) {
            reference.set(k, reference.size);
            memo.add(t, reference.size - 1);
          }
        }
        expect(memo.size).toBe(reference.size);
      }),
      { numRuns: 200 },
    );
  });

  test("0 and −0 are one key; null is not 0", () => {
    const memo = new TupleMemo(2);
    memo.add([0, null], 7);
    expect(memo.get([-0, null])).toBe(7);
    expect(memo.get([0, 0])).toBe(-1);
  });

  test("a width below 1 is a RangeError", () => {
    expect(() => new TupleMemo(0)).toThrow(RangeError);
  });
});
