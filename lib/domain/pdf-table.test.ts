import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { groupPdfTable, normalizeBox, type PdfTextItem } from "./pdf-table";

/** Lays out a grid like a typesetter: cells at column x positions, lines 14 pt apart, 10 pt text. */
function layout(grid: string[][], columnX: number[], top = 700): PdfTextItem[] {
  const items: PdfTextItem[] = [];
  grid.forEach((row, r) =>
    row.forEach((text, c) => {
      if (text) items.push({ str: text, x: columnX[c]!, y: top - r * 14, width: text.length * 5, height: 10 });
    }),
  );
  return items;
}

const BOX = { x: 50, y: 600, width: 450, height: 120 };

describe("groupPdfTable", () => {
  test("a typeset table comes back as its rows and columns", () => {
    const grid = [
      ["Sample", "P (W)", "v (mm/s)", "Result"],
      ["A1", "200", "800", "dense"],
      ["A2", "250", "1200", "lack of fusion"],
    ];
    const r = groupPdfTable(layout(grid, [60, 160, 260, 360]), BOX);
    expect(r).toEqual({ ok: true, rows: grid, itemCount: 12 });
  });

  test("words of one cell set as separate items are joined with a space", () => {
    const items: PdfTextItem[] = [
      { str: "Laser", x: 60, y: 700, width: 25, height: 10 },
      { str: "power", x: 88, y: 700, width: 27, height: 10 },
      { str: "Speed", x: 200, y: 700, width: 27, height: 10 },
      { str: "200", x: 60, y: 686, width: 15, height: 10 },
      { str: "800", x: 200, y: 686, width: 15, height: 10 },
    ];
    expect(groupPdfTable(items, BOX)).toMatchObject({ ok: true, rows: [["Laser power", "Speed"], ["200", "800"]] });
  });

  test("items outside the box are left out, and a missing cell is empty", () => {
    const items = [...layout([["P", "v"], ["200", ""], ["250", "900"]], [60, 200]), { str: "Table 2. Parameters", x: 60, y: 740, width: 90, height: 10 }, { str: "page 4", x: 520, y: 686, width: 30, height: 10 }];
    expect(groupPdfTable(items, BOX)).toMatchObject({ ok: true, rows: [["P", "v"], ["200", ""], ["250", "900"]] });
  });

  test("slightly uneven baselines (superscripts, mixed fonts) stay on one line", () => {
    const items: PdfTextItem[] = [
      { str: "E", x: 60, y: 700, width: 5, height: 10 },
      { str: "v", x: 66, y: 697.5, width: 4, height: 7 },
      { str: "60", x: 200, y: 700.8, width: 10, height: 10 },
    ];
    expect(groupPdfTable(items, BOX)).toMatchObject({ ok: true, rows: [["Ev", "60"]] });
  });

  test("a box drawn from bottom right to top left works the same", () => {
    const items = layout([["1", "2"]], [60, 200]);
    expect(groupPdfTable(items, { x: 500, y: 720, width: -450, height: -120 })).toMatchObject({ ok: true, rows: [["1", "2"]] });
    expect(normalizeBox({ x: 100, y: 50, width: -40, height: -20 })).toEqual({ x: 60, y: 30, width: 40, height: 20 });
  });

  test.each([
    ["a page without text items (a scan) says there is no text layer", [], "no_text_layer"],
    ["only whitespace items count as none", [{ str: " ", x: 60, y: 700, width: 3, height: 10 }], "no_text_layer"],
    ["a box with nothing inside says so", [{ str: "far away", x: 10, y: 100, width: 30, height: 10 }], "empty_box"],
  ])("%s", (_label, items, reason) => {
    const r = groupPdfTable(items, BOX);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toBe(reason);
  });

  test("property: any grid of single-token cells laid out on columns comes back exactly", () => {
    const token = fc.string({ unit: fc.constantFrom("a", "B", "1", "2", ".", ",", "µ", "%"), minLength: 1, maxLength: 6 });
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 5 }).chain((w) => fc.array(fc.array(token, { minLength: w, maxLength: w }), { minLength: 1, maxLength: 7 })), (grid) => {
        const columnX = grid[0]!.map((_, c) => 60 + c * 80);
        const r = groupPdfTable(layout(grid, columnX), { x: 50, y: 500, width: 500, height: 220 });
        expect(r).toMatchObject({ ok: true, rows: grid });
      }),
    );
  });

  test("property: no text is lost or invented for items inside the box", () => {
    const item = fc.record({ str: fc.string({ unit: fc.constantFrom("x", "7", " "), minLength: 1, maxLength: 4 }), x: fc.integer({ min: 0, max: 600 }), y: fc.integer({ min: 0, max: 800 }), width: fc.integer({ min: 0, max: 60 }), height: fc.integer({ min: 1, max: 14 }) });
    fc.assert(
      fc.property(fc.array(item, { maxLength: 40 }), (items) => {
        const box = { x: 0, y: 0, width: 700, height: 900 };
        const r = groupPdfTable(items, box);
        const want = items.map((i) => i.str.replace(/\s/g, "")).join("").split("").sort().join("");
        if (!r.ok) expect(want).toBe("");
        else expect(r.rows.flat().join("").replace(/\s/g, "").split("").sort().join("")).toBe(want);
      }),
    );
  });
});
