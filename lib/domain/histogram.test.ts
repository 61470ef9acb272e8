import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { histogram, tally } from "./histogram";

describe("histogram", () => {
  test.each<[(number | null)[], number, ReturnType<typeof histogram>]>([
    [[30, 30, 40, 60], 3, { edges: [30, 40, 50, 60], counts: [2, 1, 1], scale: "linear", missing: 0, outside: 0 }],
    [[75, 95, null, 115, Number.NaN], 4, { edges: [70, 80, 90, 100, 110, 120], counts: [1, 0, 1, 0, 1], scale: "linear", missing: 2, outside: 0 }],
    [[20, 200, 2000], 2, { edges: [20, 200, 2000], counts: [1, 2], scale: "log", missing: 0, outside: 0 }],
    [[null, null], 5, null],
    [[], 5, null],
  ])("%j in %s bins", (values, bins, expected) => {
    expect(histogram(values, bins)).toEqual(expected);
  });

  test("a range leaves implausible values out of the bins and the axis, and counts them", () => {
    // a hatch of 0.07 (a µm column holding mm) beside plausible ones: linear bins over 75–115 only
    expect(histogram([0.07, 75, 95, 115, 2400], 4, undefined, { min: 20, max: 300 })).toEqual({
      edges: [70, 80, 90, 100, 110, 120], counts: [1, 0, 1, 0, 1], scale: "linear", missing: 0, outside: 2,
    });
    expect(histogram([0.07, 2400], 4, undefined, { min: 20, max: 300 })).toBeNull();
  });

  test("a forced linear scale on decade-spanning data", () => {
    expect(histogram([20, 200, 2000], 2, "linear")?.scale).toBe("linear");
  });

  test("nothing is lost: counts plus missing equal the number of values", () => {
    fc.assert(
      fc.property(fc.array(fc.oneof(fc.constant(null), fc.double({ min: 0.5, max: 1e4, noNaN: true })), { maxLength: 300 }), fc.integer({ min: 1, max: 30 }), (values, bins) => {
        const h = histogram(values, bins);
        if (values.every((v) => v === null)) expect(h).toBeNull();
        else expect(h!.counts.reduce((a, b) => a + b, 0) + h!.missing + h!.outside).toBe(values.length);
      }),
    );
  });
});

describe("tally", () => {
  test("largest first, ties in first-seen order", () => {
    expect(tally(["keyhole", "dense", "dense", "balling", "keyhole", "dense"])).toEqual([
      { key: "dense", count: 3 },
      { key: "keyhole", count: 2 },
      { key: "balling", count: 1 },
    ]);
    expect(tally([3, 1, 3, 1])).toEqual([
      { key: 3, count: 2 },
      { key: 1, count: 2 },
    ]);
  });
});
