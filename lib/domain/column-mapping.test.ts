import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { guessField, guessMapping, hasMappingErrors, IMPORT_FIELDS, resolveMapping } from "./column-mapping";

const DATASET_HEADERS = [
  "No.", "Material", "Density Measurement Method", "Atmosphere", "Printed Geom.", "Laser Power (W)", "Scan Speed (mm/s)", "Hatch space (mm)",
  "Layer thickness (mm)", "Spot size (mm)", "Geometric Factor", "D50 μm", "RD (%)", "Printer Model", "DOI",
];

describe("guessField", () => {
  test.each([
    ["Laser Power (W)", "laserPower"],
    ["P [kW]", "laserPower"],
    ["Scan Speed (mm/s)", "scanSpeed"],
    ["scan_velocity", "scanSpeed"],
    ["Hatch space (mm)", "hatchSpacing"],
    ["Hatch distance [µm]", "hatchSpacing"],
    ["Layer thickness (mm)", "layerThickness"],
    ["Spot size (mm)", "spotDiameter"],
    ["Beam diameter (um)", "spotDiameter"],
    ["D50 μm", "powderD50"],
    ["RD (%)", "relativeDensity"],
    ["Relative density", "relativeDensity"],
    ["Density Measurement Method", null],
    ["Printer Model", "machine"],
    ["Material", "alloy"],
    ["DOI", "doi"],
    ["Outcome", "outcome"],
    ["Preheat (°C)", "preheat"],
    ["Geometric Factor", null],
    ["No.", null],
  ])("%s -> %s", (header, field) => {
    expect(guessField(header)).toBe(field);
  });
});

describe("resolveMapping", () => {
  test("the open dataset's headers: fields, header units, unmapped columns", () => {
    const r = resolveMapping(DATASET_HEADERS, null);
    const byHeader = Object.fromEntries(r.columns.map((c) => [c.header, [c.field, c.unit]]));
    expect(byHeader["Hatch space (mm)"]).toEqual(["hatchSpacing", "mm"]);
    expect(byHeader["Layer thickness (mm)"]).toEqual(["layerThickness", "mm"]);
    expect(byHeader["D50 μm"]).toEqual(["powderD50", "µm"]);
    expect(byHeader["RD (%)"]).toEqual(["relativeDensity", "%"]);
    expect(byHeader["DOI"]).toEqual(["doi", null]);
    expect(r.unmapped).toEqual(["No.", "Density Measurement Method", "Printed Geom.", "Geometric Factor"]);
    expect(hasMappingErrors(r.issues)).toBe(false);
  });

  test("a field mapped from two columns is an error naming both", () => {
    const r = resolveMapping(["Alloy", "P (W)", "Power [kW]", "v"], { columns: { Alloy: { field: "alloy" }, "P (W)": { field: "laserPower" }, "Power [kW]": { field: "laserPower" }, v: { field: "scanSpeed", unit: "mm/s" } } });
    const e = r.issues.filter((i) => i.severity === "error");
    expect(e).toHaveLength(1);
    expect(e[0]).toMatchObject({ field: "laserPower", message: expect.stringMatching(/two columns \("P \(W\)" and "Power \[kW\]"\)/) });
  });

  test.each([
    ["a unit of another quantity", { field: "hatchSpacing", unit: "W" }, /W cannot apply to hatch spacing/],
    ["an unknown unit", { field: "hatchSpacing", unit: "furlong" }, /"furlong" is not a unit/],
    ["a unit on a text field", { field: "machine", unit: "mm" }, /takes no unit/],
  ] as const)("%s is an error", (_label, rule, message) => {
    const r = resolveMapping(["Alloy", "P (W)", "v (mm/s)", "X"], { columns: { Alloy: { field: "alloy" }, "P (W)": { field: "laserPower" }, "v (mm/s)": { field: "scanSpeed" }, X: rule } });
    expect(r.issues.filter((i) => i.severity === "error").map((i) => i.message)).toEqual([expect.stringMatching(message)]);
  });

  test("a header unit that cannot apply is an error too", () => {
    const r = resolveMapping(["Alloy", "Power (mm)", "v"], null);
    expect(r.issues.some((i) => i.severity === "error" && i.field === "laserPower" && /mm cannot apply to laser power/.test(i.message))).toBe(true);
  });

  test("no unit anywhere is a warning and the canonical unit is assumed", () => {
    const r = resolveMapping(["Alloy", "Power", "Speed", "Hatch"], null);
    expect(hasMappingErrors(r.issues)).toBe(false);
    expect(r.columns[3]).toMatchObject({ field: "hatchSpacing", unit: "µm", unitFrom: "assumed" });
    expect(r.issues.filter((i) => i.severity === "warning").map((i) => i.field)).toEqual(["laserPower", "scanSpeed", "hatchSpacing"]);
  });

  test("missing alloy, power and speed are errors unless defaults cover them", () => {
    expect(resolveMapping(["x"], null).issues.filter((i) => i.severity === "error").map((i) => i.field)).toEqual(["alloy", "laserPower", "scanSpeed"]);
    const withDefault = resolveMapping(["P (W)", "v (mm/s)"], { columns: { "P (W)": { field: "laserPower" }, "v (mm/s)": { field: "scanSpeed" } }, defaults: { alloy: "316L" } });
    expect(hasMappingErrors(withDefault.issues)).toBe(false);
  });

  test("a column the table lacks, and a repeated header, are errors; #N names a column by position", () => {
    const missing = resolveMapping(["Alloy", "P", "v"], { columns: { Power: { field: "laserPower" } } });
    expect(missing.issues.some((i) => /does not have/.test(i.message))).toBe(true);
    const repeated = resolveMapping(["Alloy", "P (W)", "P (W)", "v (mm/s)"], { columns: { Alloy: { field: "alloy" }, "P (W)": { field: "laserPower" }, "v (mm/s)": { field: "scanSpeed" } } });
    expect(repeated.issues.some((i) => /appears more than once.*#2/.test(i.message))).toBe(true);
    const byPosition = resolveMapping(["Alloy", "P (W)", "P (W)", "v (mm/s)"], { columns: { Alloy: { field: "alloy" }, "#3": { field: "laserPower" }, "v (mm/s)": { field: "scanSpeed" } } });
    expect(hasMappingErrors(byPosition.issues)).toBe(false);
    expect(byPosition.columns[2]).toMatchObject({ field: "laserPower", unit: "W" });
  });

  test("property: whatever the mapping, resolving never throws and no field ends up on two columns without an error", () => {
    const header = fc.constantFrom("P (W)", "Speed [m/s]", "Hatch (mm)", "Alloy", "DOI", "Layer (µm)", "x", "P (W)", "");
    const rule = fc.option(fc.record({ field: fc.option(fc.constantFrom(...IMPORT_FIELDS, "bogus"), { nil: null }), unit: fc.option(fc.constantFrom("W", "mm", "µm", "m/s", "kg", ""), { nil: null }) }), { nil: null });
    fc.assert(
      fc.property(fc.array(header, { maxLength: 8 }), fc.dictionary(fc.constantFrom("P (W)", "Alloy", "#1", "#2", "#3", "Nope", "Hatch (mm)"), rule), (headers, columns) => {
        const r = resolveMapping(headers, { columns: columns as never });
        const counts = new Map<string, number>();
        for (const c of r.columns) if (c.field) counts.set(c.field, (counts.get(c.field) ?? 0) + 1);
        for (const [field, n] of counts) if (n > 1) expect(r.issues.some((i) => i.severity === "error" && i.field === field)).toBe(true);
      }),
    );
  });

  test("two headers naming one field are both guessed, so the ambiguity is an error, not a silent choice", () => {
    const r = resolveMapping(["Alloy", "P (W)", "Power (kW)", "v (mm/s)"], null);
    expect(r.issues.filter((i) => i.severity === "error").map((i) => i.field)).toEqual(["laserPower"]);
  });

  test("guessMapping keys repeated or empty headers by position", () => {
    expect(Object.keys(guessMapping(["P (W)", "", "P (W)"]).columns)).toEqual(["#1", "#2", "#3"]);
  });
});
