import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { findGrade, GRADES, normalizeGradeName } from "./grades";

describe("normalizeGradeName", () => {
  test.each([
    ["18Ni(300)", "18ni300"],
    ["Ti-6Al-4V", "ti6al4v"],
    ["SS 316-L", "ss316l"],
    ["Inconel®\u00a0718", "inconel718"],
  ])("%s -> %s", (text, normalized) => {
    expect(normalizeGradeName(text)).toBe(normalized);
  });

  test("is idempotent", () => {
    fc.assert(
      fc.property(fc.string(), (s) => {
        expect(normalizeGradeName(normalizeGradeName(s))).toBe(normalizeGradeName(s));
      }),
    );
  });
});

describe("grade library", () => {
  test("keys and aliases are unique across grades (the lookup would throw otherwise)", () => {
    const names = GRADES.flatMap((g) => [g.key, ...g.aliases].map(normalizeGradeName).map((n) => `${n}|${g.key}`));
    const owners = new Map<string, Set<string>>();
    for (const entry of names) {
      const [name, key] = entry.split("|") as [string, string];
      owners.set(name, (owners.get(name) ?? new Set()).add(key));
    }
    for (const [name, keys] of owners) expect(keys.size, name).toBe(1);
  });

  test.each(GRADES.map((g) => [g.key, g] as const))("%s names a standard and has exactly one balance element", (_key, g) => {
    expect(g.standard).toMatch(/ASTM|AMS|EN/);
    expect(g.components.filter((c) => c.amountWtPct === null)).toHaveLength(1);
    expect(g.standardNote).toMatch(/from memory/);
  });

  test("unknown names are not guessed", () => {
    expect(findGrade("Ti-5553")).toBeUndefined();
    expect(findGrade("316")).toBeUndefined();
  });
});
