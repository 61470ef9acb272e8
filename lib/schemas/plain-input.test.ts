import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { forbiddenKeyPath, nulCharacterPath } from "./plain-input";

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

describe("nulCharacterPath", () => {
  test.each([
    [{ title: "a\u0000b" }, "title"],
    [{ alloy: ["316L", "x\u0000"] }, "alloy[1]"],
    [{ laserPower: { value: "200", unit: "W\u0000" } }, "laserPower.unit"],
    [{ ["k\u0000ey"]: 1 }, "k\u0000ey"],
    ["\u0000", ""],
  ])("%j -> %j", (value, path) => {
    expect(nulCharacterPath(value)).toBe(path);
  });

  test("names the entry of a FormData by its name", () => {
    const form = new FormData();
    form.set("title", "fine");
    form.set("notes", "not\u0000fine");
    expect(nulCharacterPath(form)).toBe("notes");
  });

  test("finds nothing in text without U+0000, whatever else it holds", () => {
    fc.assert(
      fc.property(fc.jsonValue().filter((v) => !JSON.stringify(v).includes("\\u0000")), (value) => {
        expect(nulCharacterPath(value)).toBeNull();
      }),
    );
  });

  test("finds U+0000 wherever it is put in a string", () => {
    fc.assert(
      fc.property(fc.string(), fc.string(), (a, b) => {
        expect(nulCharacterPath({ x: [`${a}\u0000${b}`] })).toBe("x[0]");
      }),
    );
  });
});
