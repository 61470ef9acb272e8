import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { parse } from "csv-parse/sync";
import { escapeTextCell, formatNumberCell, writeCsv, writeCsvBytes } from "./csv-writer";
import { ColumnarTable } from "./table";

describe("escapeTextCell (OWASP CSV injection)", () => {
  test.each([
    ["=SUM(A1:A3)", `"'=SUM(A1:A3)"`],
    ["+1", `"'+1"`],
    ["-2+3", `"'-2+3"`],
    ["@cmd", `"'@cmd"`],
    ["\tx", `"'\tx"`],
    ["\rx", `"'\rx"`],
    ["316L", "316L"],
    ['a "quoted", text', `"a ""quoted"", text"`],
    ["Ti-6Al-4V", "Ti-6Al-4V"],
  ])("%j → %s", (input, expected) => {
    expect(escapeTextCell(input)).toBe(expected);
  });
});

describe("formatNumberCell", () => {
  test.each([
    [200, "200"],
    [0.1 + 0.2, "0.30000000000000004"],
    [-0.5, "-0.5"],
    [-0, "0"],
    [Number.NaN, ""],
    [Infinity, ""],
  ])("%s → %j", (x, s) => {
    expect(formatNumberCell(x)).toBe(s);
  });
});

describe("writeCsv", () => {
  const columns = [{ name: "alloy", kind: "text" as const }, { name: "laser_power_w", kind: "number" as const }, { name: "margin", kind: "number" as const }];

  test("numbers as numbers, negatives unescaped, empty cells empty", () => {
    expect(writeCsv(columns, [["316L", 200, -0.25], ["=1+1", null, 3]])).toBe(`alloy,laser_power_w,margin\n316L,200,-0.25\n"'=1+1",,3\n`);
  });

  test("any text reads back as written (after the guard) and numbers exactly", () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.string(), fc.double({ noNaN: true, noDefaultInfinity: true })), { minLength: 1, maxLength: 30 }), (rows) => {
        const text = writeCsv(columns.slice(0, 2), rows);
        const body = (parse(text, { bom: false, trim: false, skip_empty_lines: false }) as string[][]).slice(1);
        expect(body).toHaveLength(rows.length);
        rows.forEach(([s, x], i) => {
          const cell = body[i]![0]!;
          expect(/^[=+\-@\t\r]/.test(s) ? cell === `'${s}` : cell === s).toBe(true);
          expect(Number(body[i]![1])).toBe(Object.is(x, -0) ? 0 : x);
          expect(/^[=+@\t\r]/.test(cell)).toBe(false);
        });
      }),
      { numRuns: 200 },
    );
  });

  test("the same rows give the same bytes", () => {
    const rows = [["a", 1.5, 2], ["b", null, 1e-7]] as const;
    expect(writeCsv(columns, rows.map((r) => [...r]))).toBe(writeCsv(columns, rows.map((r) => [...r])));
  });

  test("property: a columnar table gives the same text as its rows, and the bytes are that text in UTF-8, across piece boundaries", () => {
    const cell = fc.tuple(fc.option(fc.string({ unit: "grapheme", maxLength: 400 })), fc.option(fc.double({ noNaN: true })), fc.option(fc.integer()));
    fc.assert(
      fc.property(fc.array(cell, { maxLength: 400 }), (rows) => {
        const cols = [{ name: "text", kind: "text" as const }, { name: "x", kind: "number" as const }, { name: "n", kind: "integer" as const }];
        const table = new ColumnarTable(cols, 4);
        for (const r of rows) table.push(r);
        const fromRows = writeCsv(cols, rows.map((r) => [...r]));
        expect(writeCsv(cols, table)).toBe(fromRows);
        expect(new TextDecoder().decode(writeCsvBytes(cols, table))).toBe(fromRows);
        expect(writeCsvBytes(cols, rows.map((r) => [...r]))).toEqual(new TextEncoder().encode(fromRows));
      }),
      { numRuns: 60 },
    );
  });

  test("a long multi-byte text that nearly fills the buffer leaves room for the numbers after it", () => {
    const cols = [{ name: "text", kind: "text" as const }, { name: "x", kind: "number" as const }, { name: "n", kind: "integer" as const }];
    const rows = [["€".repeat(1360), 0.1 + 0.2, 123456789]] as const;
    const table = new ColumnarTable(cols, 1);
    for (const r of rows) table.push([...r]);
    expect(new TextDecoder().decode(writeCsvBytes(cols, table))).toBe(writeCsv(cols, rows.map((r) => [...r])));
  });
});
