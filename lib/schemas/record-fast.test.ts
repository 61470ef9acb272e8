import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { benchRecordInputs } from "../../bench/records-fixture";
import { OUTCOMES } from "../domain/outcomes";
import { normalizeQuantities, PROVENANCE, RECORD_QUANTITY_FIELD_NAMES, RECORD_SPOT_DEFINITIONS, recordInputSchema } from "./record";
import { parseRecordInputFast } from "./record-fast";

// Values near every edge the schema has: blanks, padding, lengths at and past the limits, decimal
// commas, units of the wrong quantity, numbers where strings belong, hard limits, junk.
const text = fc.oneof(
  fc.constantFrom("", " ", "  316L ", "Ti-6Al-4V", "argon", "x".repeat(100), "x".repeat(101), "y".repeat(200), "y".repeat(201), " z ".repeat(40)),
  fc.string({ maxLength: 12 }),
);
const maybe = <T,>(a: fc.Arbitrary<T>) => fc.oneof({ arbitrary: a, weight: 4 }, { arbitrary: fc.constantFrom(undefined, null), weight: 1 });
const valueText = fc.oneof(
  fc.constantFrom("200", " 200 ", "0,8", "0.08", "1e3", "-5", "0", "12000", "99.5", "100.1", "abc", "", "2 00", "1.2.3", "9".repeat(65), "200 W", "0.1mm", "30 µm"),
  fc.double({ min: -10, max: 5000, noNaN: true }).map((x) => x.toFixed(2)),
);
const unitText = fc.constantFrom("", "W", "kW", "mm/s", "m/s", "mm", "µm", "um", "%", "°C", "K", "kg", " W ", "x".repeat(33));
const quantity = fc.oneof(
  { arbitrary: fc.record({ value: valueText, unit: unitText }, { requiredKeys: [] }), weight: 6 },
  { arbitrary: fc.record({ value: fc.oneof(fc.integer(), fc.constant(null)), unit: unitText }), weight: 1 },
  { arbitrary: fc.constantFrom(undefined, null, "200 W", 200), weight: 1 },
);
const quantities = Object.fromEntries(RECORD_QUANTITY_FIELD_NAMES.map((f) => [f, quantity]));
const fieldArbs = {
  sourceId: fc.oneof(fc.constantFrom(1, 7, 0, -1, 1.5, "3", "03", " 4", "x", null, 2 ** 40), fc.integer({ min: 1, max: 50 })),
  locationPage: fc.constantFrom(undefined, null, "", 3, "12", 0, 100_000, 100_001, "1e2", 2.5, "abc"),
  locationLabel: maybe(text),
  alloy: fc.oneof(text, fc.constantFrom(3, null)),
  composition: maybe(text),
  machine: maybe(text),
  ...quantities,
  spotDefinition: fc.constantFrom(undefined, null, ...RECORD_SPOT_DEFINITIONS, "1/e2", ""),
  atmosphere: maybe(fc.oneof(text, fc.constant(5))),
  scanStrategy: maybe(text),
  outcome: fc.constantFrom(undefined, ...OUTCOMES, "porous", "", null),
  outcomeText: maybe(text),
  provenance: fc.oneof(
    fc.constant(undefined),
    fc.dictionary(fc.constantFrom(...RECORD_QUANTITY_FIELD_NAMES, "colour"), fc.constantFrom(...PROVENANCE, "guessed"), { maxKeys: 3 }),
  ),
  status: fc.constantFrom(undefined, "draft", "needs_review", "accepted"),
  extra: fc.constantFrom(undefined, "ignored"),
};
// A well-formed row (benchmark fixture rows, with and without optional fields) with up to three
// fields replaced by anything the field generators give (or removed), so about half the inputs
// stay valid and the rest break in every way.
const pool = benchRecordInputs(200, [1, 2, 9]).map((r, i) => (i % 3 === 0 ? { ...r, composition: "Fe bal, Cr 17, Ni 12", provenance: { spotDiameter: "assumed" as const } } : r));
const fieldNames = Object.keys(fieldArbs) as (keyof typeof fieldArbs)[];
const inputArb = fc
  .tuple(
    fc.constantFrom(...pool),
    fc.array(fc.tuple(fc.constantFrom(...fieldNames), fc.boolean()), { maxLength: 3 }).chain((edits) =>
      fc.tuple(...edits.map(([field, remove]) => (remove ? fc.constant([field, undefined] as const) : fieldArbs[field].map((v: unknown) => [field, v] as const)))),
    ),
  )
  .map(([row, edits]) => {
    const out: Record<string, unknown> = { ...row };
    for (const [field, value] of edits) {
      if (value === undefined) delete out[field];
      else out[field] = value;
    }
    return out;
  });

describe("parseRecordInputFast", () => {
  test("property: whenever it answers, the schema accepts the input and returns the same values", () => {
    let answered = 0;
    fc.assert(
      fc.property(inputArb, (input) => {
        const fast = parseRecordInputFast(input);
        if (!fast) return;
        answered++;
        const zod = recordInputSchema.safeParse(input);
        expect(zod.success).toBe(true);
        expect(fast.values).toStrictEqual(zod.data);
        // The parsed quantities it hands over normalize to the same stored values.
        expect(normalizeQuantities(fast.values, fast.parsed)).toStrictEqual(normalizeQuantities(zod.data!));
      }),
      { numRuns: 3000 },
    );
    // The generator must reach the fast path often enough for the property to mean something.
    expect(answered).toBeGreaterThan(50);
  });

  test("takes the ordinary rows of a bulk write (benchmark fixture rows, mixed units)", () => {
    const inputs = benchRecordInputs(500, [1, 2, 3]);
    for (const input of inputs) {
      const fast = parseRecordInputFast(input);
      expect(fast).not.toBeNull();
      expect(fast!.values).toStrictEqual(recordInputSchema.parse(input));
    }
  });

  test("leaves inputs with problems to the schema (null), so its messages name them", () => {
    const base = { sourceId: 1, alloy: "316L", laserPower: { value: "200", unit: "W" }, scanSpeed: { value: "800", unit: "mm/s" } };
    expect(parseRecordInputFast(base)).not.toBeNull();
    expect(parseRecordInputFast({ ...base, laserPower: { value: "200", unit: "kg" } })).toBeNull();
    expect(parseRecordInputFast({ ...base, laserPower: { value: "12000", unit: "W" } })).toBeNull();
    expect(parseRecordInputFast({ ...base, scanSpeed: { value: "", unit: "mm/s" } })).toBeNull();
    expect(parseRecordInputFast({ ...base, outcome: "porous" })).toBeNull();
    expect(parseRecordInputFast({ ...base, sourceId: 0 })).toBeNull();
    expect(parseRecordInputFast([base])).toBeNull();
  });
});
