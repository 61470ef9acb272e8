import { expect, test } from "vitest";
import { fillMissing } from "./fill";
import type { ProcessPoint } from "./process-point";

const p = (spot: number | null, power = 200): ProcessPoint => ({ laserPowerW: power, scanSpeedMmPerS: 800, hatchSpacingUm: 100, layerThicknessUm: 30, spotDiameterUm: spot, preheatC: null, powderD50Um: null });

test("a missing value takes the median of the alloy's training rows; validation rows never inform it", () => {
  const r = fillMissing([p(70), p(90), p(null), p(1000), p(null)], ["316L", "316L", "316L", "316L", "IN718"], [true, true, true, false, true]);
  expect(r.points[2]!.spotDiameterUm).toBe(80);
  // IN718 has no training value: the median of all training rows (70, 90) = 80
  expect(r.points[4]!.spotDiameterUm).toBe(80);
  const report = r.reports.find((x) => x.field === "spotDiameterUm")!;
  expect(report).toMatchObject({ missing: 2, leftEmpty: 0, values: { "316L": 80, "*": 80 } });
});

test("nothing to fill from leaves the value empty and says so; present values are untouched", () => {
  const r = fillMissing([p(70), p(75)], ["316L", "316L"], [true, true]);
  expect(r.reports.find((x) => x.field === "preheatC")).toMatchObject({ missing: 2, leftEmpty: 2 });
  expect(r.points.map((x) => x.spotDiameterUm)).toEqual([70, 75]);
  expect(r.reports.find((x) => x.field === "spotDiameterUm")).toMatchObject({ missing: 0, method: null });
});

test("mismatched lengths are a RangeError", () => {
  expect(() => fillMissing([p(1)], [], [true])).toThrow(/fillMissing/);
});
