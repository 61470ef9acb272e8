// Generators of hostile and half-valid input for the fuzz tests.
import fc from "fast-check";

/** Strings that have broken servers before: traversal, injection, odd numbers, odd text. */
export const HOSTILE_STRINGS = [
  "",
  " ",
  "../../../../etc/passwd",
  "..\\..\\windows\\win.ini",
  "%2e%2e%2f%2e%2e%2fetc%2fpasswd",
  "/etc/passwd",
  "C:\\boot.ini",
  "file\u0000.pdf",
  "=HYPERLINK(\"http://evil.example\")",
  "+cmd|' /C calc'!A0",
  "-2+3",
  "@SUM(1)",
  "\tTAB",
  "\rCR",
  "'; DROP TABLE BuildRecord; --",
  "\" OR 1=1 --",
  "<script>alert(1)</script>",
  "{{7*7}}",
  "${process.exit()}",
  "__proto__",
  "constructor",
  "toString",
  "valueOf",
  "NaN",
  "Infinity",
  "-Infinity",
  "1e309",
  "-0",
  "0x1F",
  "9007199254740993",
  "1,5",
  "１２３",
  "\u202Eevil",
  "🔥🔥",
  "a".repeat(5000),
  "10.5555/x",
  "https://doi.org/10.5555/TEST.0001",
] as const;

export const hostileString = fc.oneof(fc.constantFrom(...HOSTILE_STRINGS), fc.string({ maxLength: 40 }), fc.string({ unit: "grapheme", maxLength: 20 }));

/** Numbers at and beyond the edges. */
export const hostileNumber = fc.oneof(
  fc.constantFrom(0, -1, 1, 2, 3, -0, 1.5, 2 ** 31, 2 ** 53 + 1, Number.MAX_VALUE, Number.MIN_VALUE),
  fc.integer({ min: -10, max: 50 }),
  fc.double({ noNaN: false }),
);

/** Any JSON-ish value, hostile leaves mixed in. */
export const hostileValue: fc.Arbitrary<unknown> = fc.letrec((tie) => ({
  value: fc.oneof(
    { depthSize: "small", withCrossShrink: true },
    hostileString,
    hostileNumber,
    fc.boolean(),
    fc.constant(null),
    fc.array(tie("value"), { maxLength: 4 }),
    // what JSON.parse can produce: objects with the ordinary prototype
    fc.dictionary(hostileString, tie("value"), { maxKeys: 4, noNullPrototype: true }),
  ),
})).value;

/**
 * A valid example with some of its fields replaced by hostile values, dropped, or an extra key
 * added: gets past the first checks to the deeper ones.
 */
export function mutated(example: Record<string, unknown>): fc.Arbitrary<unknown> {
  const keys = Object.keys(example);
  return fc
    .record({
      replace: fc.subarray(keys, { maxLength: Math.min(3, keys.length) }),
      drop: fc.subarray(keys, { maxLength: Math.min(2, keys.length) }),
      values: fc.array(hostileValue, { minLength: 3, maxLength: 3 }),
      extraKey: fc.option(hostileString, { nil: undefined }),
    })
    .map(({ replace, drop, values, extraKey }) => {
      const out: Record<string, unknown> = { ...example };
      replace.forEach((k, i) => (out[k] = values[i]));
      for (const k of drop) delete out[k];
      if (extraKey !== undefined) out[extraKey] = values[0];
      return out;
    });
}

/** Input for a use case: anything, or a mutated valid example. */
export function inputFor(example: Record<string, unknown> | null): fc.Arbitrary<unknown> {
  return example ? fc.oneof({ weight: 1, arbitrary: hostileValue }, { weight: 3, arbitrary: mutated(example) }) : hostileValue;
}
