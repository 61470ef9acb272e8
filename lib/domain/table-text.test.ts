import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { looksLikeHeader, splitTableText } from "./table-text";

describe("splitTableText", () => {
  test.each([
    ["tabs from a spreadsheet", "Power (W)\tSpeed (mm/s)\n200\t800\n250\t900\n", "tab", [["Power (W)", "Speed (mm/s)"], ["200", "800"], ["250", "900"]]],
    ["runs of spaces from a PDF", "Power (W)   Speed (mm/s)   Outcome\n200   800   lack of fusion\n", "spaces", [["Power (W)", "Speed (mm/s)", "Outcome"], ["200", "800", "lack of fusion"]]],
    ["single spaces", "200 800 0,1\n250 900 0,12", "whitespace", [["200", "800", "0,1"], ["250", "900", "0,12"]]],
    ["semicolons with decimal commas", "P;h\n200;0,1\n", "semicolon", [["P", "h"], ["200", "0,1"]]],
    ["pipes framing a row", "| P | v |\n| 200 | 800 |", "pipe", [["P", "v"], ["200", "800"]]],
    ["CRLF, BOM and blank lines", "\uFEFFa\tb\r\n\r\n1\t2\r\n", "tab", [["a", "b"], ["1", "2"]]],
  ])("%s", (_label, text, splitter, rows) => {
    const r = splitTableText(text);
    expect(r.splitter).toBe(splitter);
    expect(r.rows).toEqual(rows);
  });

  test("a decimal comma is never a cell break when commas are asked for", () => {
    expect(splitTableText("200, 0,1, dense", "comma").rows).toEqual([["200", "0,1", "dense"]]);
  });

  test("short rows are padded to the widest row", () => {
    expect(splitTableText("a\tb\tc\n1\t2").rows).toEqual([["a", "b", "c"], ["1", "2", ""]]);
  });

  test("empty text gives no rows", () => {
    expect(splitTableText("  \n\n").rows).toEqual([]);
  });

  test("property: never throws, rows are rectangular, no cell has surrounding whitespace", () => {
    fc.assert(
      fc.property(fc.string({ unit: fc.constantFrom("a", "1", ",", ";", ".", " ", "  ", "\t", "\n", "\r", "|", "µ", "\u00A0") }), fc.constantFrom("auto", "tab", "spaces", "whitespace", "semicolon", "comma", "pipe" as const), (text, splitter) => {
        const { rows } = splitTableText(text, splitter);
        const width = rows[0]?.length ?? 0;
        for (const r of rows) {
          expect(r.length).toBe(width);
          for (const c of r) expect(c).toBe(c.trim());
        }
      }),
    );
  });

  test("property: a tab-separated grid of cells without tabs or newlines comes back unchanged", () => {
    const cell = fc.string({ unit: fc.constantFrom("a", "b", "1", "2", ",", ".", "-", "µ"), minLength: 1, maxLength: 6 });
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 5 }).chain((w) => fc.array(fc.array(cell, { minLength: w, maxLength: w }), { minLength: 1, maxLength: 8 })), (grid) => {
        const text = grid.map((r) => r.join("\t")).join("\n");
        expect(splitTableText(text).rows).toEqual(grid);
      }),
    );
  });
});

describe("looksLikeHeader", () => {
  test.each([
    [[["Power (W)", "Speed"], ["200", "800"]], true],
    [[["200", "800"], ["250", "900"]], false],
    [[["316L", "200"], ["IN718", "250"]], false],
    [[["Alloy", "P"], ["316L", "200 W"]], true],
    [[], false],
  ])("%j -> %s", (rows, expected) => {
    expect(looksLikeHeader(rows)).toBe(expected);
  });
});
