import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { recordInputSchema } from "../schemas/record";
import { calibrateFigure, type FigureCalibration } from "./figure-calibration";
import { decimalsFor, figureLocationLabel, figureRecordInputs, formatReading, formatUncertainty, LOCATION_LABEL_MAX, type FigureSetup } from "./figure-records";

function cal(): FigureCalibration {
  // x: 100 W at px 100 to 400 W at px 400 (1 W per px); y: 500 mm/s at px 400 to 1500 mm/s at px 100
  const r = calibrateFigure({
    x: { scale: "linear", ticks: [{ pixel: 100, value: 100 }, { pixel: 400, value: 400 }] },
    y: { scale: "linear", ticks: [{ pixel: 400, value: 500 }, { pixel: 100, value: 1500 }] },
  });
  if (!r.ok) throw new Error("calibration");
  return r.calibration;
}

const setup: FigureSetup = {
  sourceId: 7,
  page: 4,
  figureLabel: "Fig. 3",
  alloy: "316L",
  x: { field: "laserPower", unit: "W" },
  y: { field: "scanSpeed", unit: "mm/s" },
  fixed: { hatchSpacing: { value: "100", unit: "µm" }, layerThickness: { value: "0.03", unit: "mm" } },
  kinds: [
    { id: "red", outcome: "keyhole", legend: "red squares: keyhole pores" },
    { id: "blue", outcome: "dense", legend: "blue circles" },
  ],
};

describe("formatting", () => {
  test.each([
    [2.1, 1],
    [0.031, 3],
    [9, 1],
    [12, 0],
    [0.5, 2],
  ])("decimalsFor(%s) = %s", (u, d) => expect(decimalsFor(u)).toBe(d));

  test.each([
    [412.345, 2.1, "412.3"],
    [-0.01, 2.1, "0.0"],
    [1234.6, 12, "1235"],
  ])("formatReading(%s, ±%s) = %s", (v, u, s) => expect(formatReading(v, u)).toBe(s));

  test.each([
    [9.04, "9"],
    [0.0123, "0.012"],
    [2.149, "2.1"],
  ])("formatUncertainty(%s) = %s", (u, s) => expect(formatUncertainty(u)).toBe(s));

  test("the location label keeps the pixel and uncertainty and fits the record field", () => {
    expect(figureLocationLabel("Fig. 3", { x: 412.2, y: 233.6 }, "±2.1 W", "±9 mm/s")).toBe("Fig. 3 · px (412, 234) · ±2.1 W, ±9 mm/s");
    const long = figureLocationLabel("Figure ".repeat(30), { x: 1, y: 2 }, "±2.1 W", "±9 mm/s");
    expect(long.length).toBe(LOCATION_LABEL_MAX);
    expect(long.endsWith("… · px (1, 2) · ±2.1 W, ±9 mm/s")).toBe(true);
  });
});

describe("figureRecordInputs", () => {
  test("points become record inputs with axis values, fixed parameters, outcome and provenance", () => {
    const r = figureRecordInputs(cal(), setup, [
      { pixel: { x: 250, y: 250 }, kind: "red" },
      { pixel: { x: 120.4, y: 380 }, kind: "blue", pixelUncertaintyPx: 2 },
    ]);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.records[0]).toEqual({
      sourceId: 7,
      locationPage: 4,
      locationLabel: "Fig. 3 · px (250, 250) · ±0.5 W, ±1.7 mm/s",
      alloy: "316L",
      outcome: "keyhole",
      outcomeText: "red squares: keyhole pores",
      provenance: { laserPower: "derived", scanSpeed: "derived", hatchSpacing: "reported", layerThickness: "reported" },
      laserPower: { value: "250.00", unit: "W" },
      scanSpeed: { value: "1000.0", unit: "mm/s" },
      hatchSpacing: { value: "100", unit: "µm" },
      layerThickness: { value: "0.03", unit: "mm" },
    });
    expect(r.records[1]!.laserPower).toEqual({ value: "120.4", unit: "W" });
    expect(r.records[1]!.locationLabel).toBe("Fig. 3 · px (120, 380) · ±2 W, ±6.7 mm/s");
    // the same schema as any record accepts them
    for (const rec of r.records) expect(recordInputSchema.safeParse(rec).success).toBe(true);
  });

  test.each([
    ["a point outside the marked axes", { ...setup }, [{ pixel: { x: 50, y: 250 }, kind: "red" }], /Point 1: .*outside the marked horizontal axis/],
    ["a marker kind with no outcome", { ...setup }, [{ pixel: { x: 200, y: 200 }, kind: "green" }], /marker kind "green", which has no outcome/],
    ["both axes on one quantity", { ...setup, y: { field: "laserPower" as const, unit: "W" } }, [{ pixel: { x: 200, y: 200 }, kind: "red" }], /same quantity/],
    ["an axis quantity also fixed", { ...setup, fixed: { laserPower: { value: "200", unit: "W" } } }, [{ pixel: { x: 200, y: 200 }, kind: "red" }], /also given as a fixed parameter/],
    ["no alloy", { ...setup, alloy: " " }, [{ pixel: { x: 200, y: 200 }, kind: "red" }], /alloy/],
    ["no points", { ...setup }, [], /at least one point/],
  ])("%s is a problem and no record is built", (_name, s, points, message) => {
    const r = figureRecordInputs(cal(), s, points);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems.map((p) => p.message).join("\n")).toMatch(message);
  });

  test("every point inside the axes reads back within its stated uncertainty (property)", () => {
    fc.assert(
      fc.property(fc.array(fc.record({ x: fc.double({ min: 100, max: 400, noNaN: true }), y: fc.double({ min: 100, max: 400, noNaN: true }), red: fc.boolean() }), { minLength: 1, maxLength: 20 }), (pts) => {
        const r = figureRecordInputs(cal(), setup, pts.map((p) => ({ pixel: { x: p.x, y: p.y }, kind: p.red ? "red" : "blue" })));
        expect(r.ok).toBe(true);
        if (!r.ok) return;
        expect(r.records).toHaveLength(pts.length);
        r.records.forEach((rec, i) => {
          const power = Number((rec.laserPower as { value: string }).value);
          const speed = Number((rec.scanSpeed as { value: string }).value);
          // the true values: 1 W per px from 100 W at px 100; 1000 mm/s over 300 px, upwards
          expect(Math.abs(power - pts[i]!.x)).toBeLessThanOrEqual(0.5);
          expect(Math.abs(speed - (500 + ((400 - pts[i]!.y) * 1000) / 300))).toBeLessThanOrEqual(1.7);
          expect(rec.outcome).toBe(pts[i]!.red ? "keyhole" : "dense");
        });
      }),
    );
  });
});
