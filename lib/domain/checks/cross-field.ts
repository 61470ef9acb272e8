/**
 * Rules that compare fields of one record: powder size order, spot diameter against hatch
 * spacing, and volumetric energy density against its usual window.
 */
import { settingOf } from "../check-settings";
import { energyDensities } from "../energy-density";
import { fmt } from "./fields";
import type { RecordRule } from "./types";

const powderOrder: RecordRule = {
  infos: [{
    code: "powder.order",
    severity: "error",
    title: "Powder sizes out of order",
    description: "D10 ≤ D50 ≤ D90 by definition of the percentiles. Swapped columns or a value in the wrong field are the usual cause: correct the values from the source.",
    source: "definition of the cumulative size percentiles (ISO 9276-2; common practice)",
    thresholdKeys: [],
    scope: "record",
  }],
  check: (r) => {
    const sizes = [
      ["D10", r.powderD10Um],
      ["D50", r.powderD50Um],
      ["D90", r.powderD90Um],
    ].filter((x): x is [string, number] => typeof x[1] === "number");
    for (let i = 1; i < sizes.length; i++) {
      const [a, av] = sizes[i - 1]!;
      const [b, bv] = sizes[i]!;
      if (av > bv) {
        return {
          code: "powder.order",
          severity: "error",
          message: `Powder ${a} ${fmt(av)} µm is larger than ${b} ${fmt(bv)} µm; D10 ≤ D50 ≤ D90 must hold. Check whether the columns were swapped and correct them from the source.`,
          details: { inputs: { powderD10Um: r.powderD10Um, powderD50Um: r.powderD50Um, powderD90Um: r.powderD90Um } },
        };
      }
    }
    return null;
  },
};

const spotVersusHatch: RecordRule = {
  infos: [{
    code: "geometry.spot_hatch",
    severity: "warning",
    title: "Spot diameter far from the hatch spacing",
    description: "Neighbouring tracks usually overlap: a hatch several spot diameters wide leaves unfused gaps, and a spot many hatches wide is unusual. A unit slip in one of the two is a common cause; check both against the source.",
    source: "common practice; bounds from memory, configurable",
    thresholdKeys: ["geometry.spotToHatch.max", "geometry.hatchToSpot.max"],
    scope: "record",
  }],
  check: (r, s) => {
    const d = r.spotDiameterUm;
    const h = r.hatchSpacingUm;
    if (d === null || h === null || !(d > 0) || !(h > 0)) return null;
    const spotToHatch = settingOf(s, "geometry.spotToHatch.max");
    const hatchToSpot = settingOf(s, "geometry.hatchToSpot.max");
    const details = { inputs: { spotDiameterUm: d, hatchSpacingUm: h, ratio: Number((d / h).toPrecision(4)) }, thresholds: { spotToHatchMax: spotToHatch, hatchToSpotMax: hatchToSpot } };
    if (d / h > spotToHatch) {
      return {
        code: "geometry.spot_hatch",
        severity: "warning",
        message: `The spot (${fmt(d)} µm) is ${fmt(d / h)} times the hatch spacing (${fmt(h)} µm), more than ${fmt(spotToHatch)}. Check both values and their units against the source; waive if the source really says so.`,
        details,
      };
    }
    if (h / d > hatchToSpot) {
      return {
        code: "geometry.spot_hatch",
        severity: "warning",
        message: `The hatch spacing (${fmt(h)} µm) is ${fmt(h / d)} times the spot (${fmt(d)} µm), more than ${fmt(hatchToSpot)}: tracks this far apart rarely fuse. Check both values and their units against the source; waive if the source really says so.`,
        details,
      };
    }
    return null;
  },
};

const energyWindow: RecordRule = {
  infos: [{
    code: "energy.volumetric",
    severity: "warning",
    title: "Volumetric energy density outside the usual window",
    description: "E_v = P/(v·h·t) far outside its usual window points to a slip in one of the four values. Check each against the source and correct the one that is off; waive if all are right.",
    source: "E_v = P/(v·h·t) (common practice); window from DOMAIN.md plausible ranges (from memory)",
    thresholdKeys: ["energy.volumetric.min", "energy.volumetric.max"],
    scope: "record",
  }],
  check: (r, s) => {
    const ev = r.volumetricEnergyJMm3 ?? energyDensities(r).volumetricJPerMm3;
    if (ev === null || !Number.isFinite(ev)) return null;
    const min = settingOf(s, "energy.volumetric.min");
    const max = settingOf(s, "energy.volumetric.max");
    if (ev >= min && ev <= max) return null;
    return {
      code: "energy.volumetric",
      severity: "warning",
      message: `E_v = ${fmt(ev)} J/mm³ (P ${fmt(r.laserPowerW ?? 0)} W, v ${fmt(r.scanSpeedMmPerS ?? 0)} mm/s, h ${fmt(r.hatchSpacingUm ?? 0)} µm, t ${fmt(r.layerThicknessUm ?? 0)} µm) is ${ev < min ? "below" : "above"} the usual ${fmt(min)}–${fmt(max)} J/mm³. Check the four values and their units against the source; waive if they are right.`,
      details: {
        inputs: { laserPowerW: r.laserPowerW, scanSpeedMmPerS: r.scanSpeedMmPerS, hatchSpacingUm: r.hatchSpacingUm, layerThicknessUm: r.layerThicknessUm, volumetricEnergyJMm3: Number(ev.toPrecision(6)) },
        thresholds: { min, max },
      },
    };
  },
};

export const CROSS_FIELD_RULES: readonly RecordRule[] = [powderOrder, spotVersusHatch, energyWindow];
