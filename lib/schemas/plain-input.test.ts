import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { forbiddenKeyPath } from "./plain-input";

describe("forbiddenKeyPath", () => {
  test.each([
    [JSON.parse('{"year":{"toString":""}}'), "year.toString"],
    [JSON.parse('{"__proto__":{"admin":true}}'), "__proto__"],
    [JSON.parse('{"items":[{"flagId":1},{"valueOf":2}]}'), "items[1].valueOf"],
    [{ year: 2024, authors: ["A. Placeholder"] }, null],
    ["text", null],
    [null, null],
  ])("%j -> %s", (value, expected) => {
    expect(forbiddenKeyPath(value)).toBe(expected);
  });

  test("whatever it lets through, Number() and String() of every nested value do not throw", () => {
    fc.assert(
      fc.property(fc.jsonValue(), fc.constantFrom("toString", "valueOf", "x"), (v, key) => {
        const value = JSON.parse(JSON.stringify({ a: v, b: { [key]: v } })) as { a: unknown; b: Record<string, unknown> };
        if (forbiddenKeyPath(value) !== null) return;
        const visit = (x: unknown): void => {
          Number(x);
          String(x);
          if (x && typeof x === "object") for (const y of Object.values(x)) visit(y);
        };
        expect(() => visit(value)).not.toThrow();
      }),
    );
  });
});
