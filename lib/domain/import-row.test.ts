import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { resolveMapping } from "./column-mapping";
import { mapImportRow } from "./import-row";

const HEADERS = ["Material", "Laser Power (W)", "Scan Speed (m/s)", "Hatch space (mm)", "Outcome", "Printer Model", "DOI"];
const cols = resolveMapping(HEADERS, null).columns;

describe("mapImportRow", () => {
  test("cells go to their fields with the column's unit and the text as written", () => {
    const r = mapImportRow(["SS316L", "200", "0,8", "0.1", "LOF", " EOS  M290 ", "https://doi.org/10.5555/ABC"], cols, {}, 1);
    expect(r.input).toMatchObject({
      alloy: "SS316L",
      laserPower: { value: "200", unit: "W" },
      scanSpeed: { value: "0,8", unit: "m/s" },
      hatchSpacing: { value: "0.1", unit: "mm" },
      outcome: "lack_of_fusion",
      outcomeText: "LOF",
      machine: "EOS  M290",
    });
    expect(r.doi).toBe("10.5555/abc");
    expect(r.problems).toEqual([]);
  });

  test.each([
    ["a cell with its own unit keeps it", "0.25 kW", { value: "0.25 kW", unit: "" }],
    ["a not-reported marker leaves the field empty", "n/a", undefined],
    ["a dash too", "—", undefined],
  ])("%s", (_label, cell, expected) => {
    expect(mapImportRow(["316L", cell, "1", "0.1", "", "", ""], cols, {}, 1).input.laserPower).toEqual(expected);
  });

  test.each([
    ["a DOI cell that is no DOI is an error", ["316L", "200", "1", "0.1", "", "", "see paper"], "doi", "error"],
    ["a web address in the DOI column is a warning; the source is known by it", ["316L", "200", "1", "0.1", "", "", "http://www.example.org/paper/1"], "doi", "warning"],
    ["an unknown outcome word is a warning and kept", ["316L", "200", "1", "0.1", "splendid", "", ""], "outcome", "warning"],
  ])("%s", (_label, cells, field, severity) => {
    const r = mapImportRow(cells, cols, {}, 7);
    expect(r.problems).toEqual([expect.objectContaining({ row: 7, field, severity })]);
  });

  test("defaults fill what no column gives", () => {
    const c = resolveMapping(["P (W)", "v (mm/s)"], { columns: { "P (W)": { field: "laserPower" }, "v (mm/s)": { field: "scanSpeed" } }, defaults: { alloy: "IN718", outcome: "dense" } }).columns;
    expect(mapImportRow(["200", "800"], c, { alloy: "IN718", outcome: "dense" }, 1).input).toMatchObject({ alloy: "IN718", outcome: "dense" });
  });

  test("a blank row is marked blank; a short row reads missing cells as empty", () => {
    expect(mapImportRow(["", " ", "", "", "", "", ""], cols, {}, 1).blank).toBe(true);
    const short = mapImportRow(["316L", "200"], cols, {}, 1);
    expect(short.blank).toBe(false);
    expect(short.input.scanSpeed).toBeUndefined();
  });

  test("property: never throws; every non-empty quantity cell keeps its text", () => {
    fc.assert(
      fc.property(fc.array(fc.string({ maxLength: 12 }), { maxLength: 9 }), (cells) => {
        const r = mapImportRow(cells, cols, {}, 3);
        const power = cells[1]?.trim();
        if (power && r.input.laserPower) expect(r.input.laserPower.value).toBe(power);
        for (const p of r.problems) expect(p.row).toBe(3);
      }),
    );
  });
});
