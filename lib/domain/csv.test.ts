import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { describeCsvError, parseCsvText, sniffDelimiter } from "./csv";

describe("sniffDelimiter", () => {
  test.each([
    ["commas", "a,b,c\n1,2,3\n", ","],
    ["semicolons with decimal commas", "P;h\n200;0,1\n250;0,12\n", ";"],
    ["semicolons when every cell has a decimal comma", "0,1;0,2\n0,3;0,4\n", ";"],
    ["tabs", "a\tb\n1\t2\n", "\t"],
    ["pipes", "a|b\n1|2\n", "|"],
    ["quoted commas do not count", 'name;note\nx;"a, b, c"\ny;"d"\n', ";"],
    ["BOM and CRLF", "\uFEFFa;b\r\n1;2\r\n", ";"],
    ["a single column", "power\n200\n", ","],
  ])("%s", (_label, sample, expected) => {
    expect(sniffDelimiter(sample)).toBe(expected);
  });
});

describe("parseCsvText", () => {
  test.each([
    ["quoted fields with doubled quotes and newlines", 'a,b\n"x, ""y""","line 1\nline 2"\n', [["a", "b"], ['x, "y"', "line 1\nline 2"]]],
    ["BOM removed", "\uFEFFP (W);h (mm)\n200;0,1\n", [["P (W)", "h (mm)"], ["200", "0,1"]]],
    ["uneven rows kept as they are", "a,b,c\n1,2\n", [["a", "b", "c"], ["1", "2"]]],
    ["blank lines skipped", "a,b\n\n1,2\n\n", [["a", "b"], ["1", "2"]]],
    ["cells trimmed", " a , b \n 1 , 2 \n", [["a", "b"], ["1", "2"]]],
  ])("%s", (_label, text, rows) => {
    const r = parseCsvText(text);
    expect(r.ok && r.rows).toEqual(rows);
  });

  test("an unclosed quote is a message with its line, not a throw", () => {
    const r = parseCsvText('a,b\n1,"2\n3,4\n');
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/never closed/);
  });

  test("describeCsvError names the line", () => {
    expect(describeCsvError({ code: "CSV_QUOTE_NOT_CLOSED", lines: 3 })).toEqual({ message: 'Line 3: a quoted cell is never closed (a " is missing).', line: 3 });
  });

  test("property: never throws on any text", () => {
    fc.assert(
      fc.property(fc.string({ unit: fc.constantFrom("a", "1", ",", ";", '"', "\n", "\r", "\t", " ", "\uFEFF", "|") }), (text) => {
        const r = parseCsvText(text);
        if (r.ok) for (const row of r.rows) for (const c of row) expect(typeof c).toBe("string");
      }),
      { numRuns: 500 },
    );
  });

  test("property: a grid written with quoting reads back cell for cell, whatever the delimiter", () => {
    const cell = fc.string({ unit: fc.constantFrom("a", "1", ",", ";", '"', "\n", "µ", ".", "\t"), minLength: 1, maxLength: 6 }).filter((c) => c.trim() === c);
    const quote = (c: string) => `"${c.replace(/"/g, '""')}"`;
    fc.assert(
      fc.property(
        fc.constantFrom(",", ";", "\t", "|" as const),
        fc.integer({ min: 1, max: 4 }).chain((w) => fc.array(fc.array(cell, { minLength: w, maxLength: w }), { minLength: 1, maxLength: 6 })),
        (d, grid) => {
          const text = grid.map((r) => r.map(quote).join(d)).join("\r\n");
          const r = parseCsvText(text, d);
          expect(r.ok && r.rows).toEqual(grid);
        },
      ),
    );
  });
});
