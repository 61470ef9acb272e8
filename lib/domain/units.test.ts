import { describe, expect, test } from "vitest";
import fc from "fast-check";
import {
  CANONICAL_UNIT,
  HARD_LIMITS,
  PLAUSIBLE_RANGES,
  QUANTITIES,
  checkHardLimit,
  fromCanonical,
  isUnitFor,
  normalizeUnit,
  parseHeaderUnit,
  parseQuantity,
  quantityLabel,
  toCanonical,
  unitOptions,
  type Quantity,
} from "./units";

const MICRO_SIGN = "\u00B5";
const GREEK_MU = "\u03BC";

function closeTo(actual: number, expected: number, relative = 1e-12, absolute = 0): void {
  const tolerance = Math.max(Math.abs(expected) * relative, absolute);
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tolerance);
}

describe("normalizeUnit", () => {
  test.each([
    ["W", "W"],
    ["w", "W"],
    ["watts", "W"],
    ["kW", "kW"],
    ["KW", "kW"],
    ["mm/s", "mm/s"],
    ["mm/sec", "mm/s"],
    ["mm s-1", "mm/s"],
    ["mm·s⁻¹", "mm/s"],
    ["mm s^-1", "mm/s"],
    ["m/s", "m/s"],
    ["m s−1", "m/s"], // U+2212 minus sign
    ["mm/min", "mm/min"],
    ["m/min", "m/min"],
    ["in/s", "in/s"],
    ["ips", "in/s"],
    ["um", "µm"],
    [`${GREEK_MU}m`, "µm"],
    [`${MICRO_SIGN}m`, "µm"],
    ["micron", "µm"],
    ["microns", "µm"],
    ["micrometre", "µm"],
    ["mm", "mm"],
    ["in", "in"],
    ["inch", "in"],
    ["mil", "mil"],
    ["mils", "mil"],
    ["thou", "mil"],
    ["°C", "°C"],
    ["deg C", "°C"],
    ["degC", "°C"],
    ["C", "°C"],
    ["ºC", "°C"], // masculine ordinal typed for the degree sign
    ["\u2103", "°C"], // ℃ as one character
    ["K", "K"],
    ["kelvin", "K"],
    ["°F", "°F"],
    ["deg F", "°F"],
    ["%", "%"],
    ["percent", "%"],
    ["fraction", "fraction"],
    ["  mm / s  ", "mm/s"],
  ])("%j -> %j", (text, expected) => {
    expect(normalizeUnit(text)).toBe(expected);
  });

  test("the normalized micrometre uses the micro sign U+00B5", () => {
    expect(normalizeUnit(`${GREEK_MU}m`)?.codePointAt(0)).toBe(0xb5);
  });

  test.each(["", "kg", "J", "mm/h", "µs", "furlong", "m"])("%j is unknown", (text) => {
    expect(normalizeUnit(text)).toBeNull();
  });
});

describe("unitOptions", () => {
  test.each(QUANTITIES)("%s lists the canonical unit first and normalized ids", (q) => {
    const options = unitOptions(q);
    expect(options[0]?.id).toBe(CANONICAL_UNIT[q]);
    for (const o of options) {
      expect(normalizeUnit(o.id)).toBe(o.id);
      expect(isUnitFor(o.id, q)).toBe(true);
      expect(o.label.length).toBeGreaterThan(0);
    }
  });

  test.each<[Quantity, string[]]>([
    ["laserPower", ["W", "kW"]],
    ["scanSpeed", ["mm/s", "m/s", "mm/min", "m/min", "in/s"]],
    ["hatchSpacing", ["µm", "mm", "in", "mil"]],
    ["layerThickness", ["µm", "mm", "in", "mil"]],
    ["spotDiameter", ["µm", "mm"]],
    ["preheat", ["°C", "K", "°F"]],
    ["powderSize", ["µm", "mm"]],
    ["relativeDensity", ["%", "fraction"]],
  ])("%s offers %j", (q, ids) => {
    expect(unitOptions(q).map((o) => o.id)).toEqual(ids);
  });
});

describe("isUnitFor", () => {
  test.each<[string, Quantity, boolean]>([
    ["kW", "laserPower", true],
    ["mm/s", "laserPower", false],
    ["in/s", "scanSpeed", true],
    ["um", "hatchSpacing", true],
    ["mil", "layerThickness", true],
    ["mil", "spotDiameter", false],
    ["in", "powderSize", false],
    ["F", "preheat", true],
    ["fraction", "relativeDensity", true],
    ["%", "hatchSpacing", false],
    ["kg", "laserPower", false],
  ])("%j for %s: %s", (unit, q, expected) => {
    expect(isUnitFor(unit, q)).toBe(expected);
  });
});

describe("toCanonical", () => {
  // Expected values were computed independently with /usr/bin/python3 and scipy.constants
  // (SciPy 1.10, constants from NIST/CODATA: inch = 0.0254 m, mil = 2.54e-5 m, minute = 60 s,
  // convert_temperature) — see the module header for the defining documents.
  test.each<[number, string, Quantity, number]>([
    [200, "W", "laserPower", 200],
    [0.2, "kW", "laserPower", 200],
    [800, "mm/s", "scanSpeed", 800],
    [0.8, "m/s", "scanSpeed", 800],
    [60, "mm/min", "scanSpeed", 1],
    [1, "m/min", "scanSpeed", 16.666666666666668],
    [1, "in/s", "scanSpeed", 25.4],
    [100, "µm", "hatchSpacing", 100],
    [0.1, "mm", "hatchSpacing", 100],
    [1, "in", "hatchSpacing", 25400],
    [1, "mil", "hatchSpacing", 25.4],
    [0.03, "mm", "layerThickness", 30],
    [0.07, "mm", "layerThickness", 70],
    [2, "mil", "layerThickness", 50.8],
    [0.08, "mm", "spotDiameter", 80],
    [0.035, "mm", "powderSize", 35],
    [80, "°C", "preheat", 80],
    [300, "K", "preheat", 26.85],
    [0, "K", "preheat", -273.15],
    [68, "°F", "preheat", 20],
    [-40, "°F", "preheat", -40],
    [451, "°F", "preheat", 232.77777778],
    [99.5, "%", "relativeDensity", 99.5],
    [0.995, "fraction", "relativeDensity", 99.5],
  ])("%d %s (%s) -> %d", (value, unit, q, expected) => {
    closeTo(toCanonical(value, unit, q), expected, 1e-10);
  });

  test("accepts any spelling of the unit", () => {
    expect(toCanonical(80, "um", "hatchSpacing")).toBe(80);
    expect(toCanonical(0.8, "m/sec", "scanSpeed")).toBe(800);
  });

  test("removes binary noise from decimal conversions", () => {
    // 0.07 * 1000 is 70.00000000000001 in binary floating point
    expect(toCanonical(0.07, "mm", "layerThickness")).toBe(70);
    expect(toCanonical(0.29, "kW", "laserPower")).toBe(290);
  });

  test.each<[string, Quantity]>([
    ["kg", "laserPower"],
    ["mm/s", "laserPower"],
    ["in", "spotDiameter"],
    ["%", "preheat"],
  ])("throws RangeError for %j as %s", (unit, q) => {
    expect(() => toCanonical(1, unit, q)).toThrow(RangeError);
    expect(() => fromCanonical(1, unit, q)).toThrow(RangeError);
  });

  test.each([Number.NaN, Number.POSITIVE_INFINITY])("throws RangeError for %d", (value) => {
    expect(() => toCanonical(value, "W", "laserPower")).toThrow(/toCanonical/);
    expect(() => fromCanonical(value, "W", "laserPower")).toThrow(/fromCanonical/);
  });
});

const everyUnit = QUANTITIES.flatMap((q) => unitOptions(q).map((o) => ({ q, unit: o.id })));
const magnitude = fc.oneof(
  fc.constant(0),
  fc.double({ min: 1e-6, max: 1e9, noNaN: true }),
  fc.double({ min: -1e9, max: -1e-6, noNaN: true }),
);
/** Offsets of the affine temperature units: cancellation limits their precision near them. */
const AFFINE_SCALE = 273.15 + 32;

describe("round trips", () => {
  test.each(everyUnit)("fromCanonical(toCanonical(x)) = x for $unit ($q)", ({ q, unit }) => {
    const absolute = q === "preheat" ? 1e-12 * AFFINE_SCALE : 0;
    fc.assert(
      fc.property(magnitude, (x) => {
        closeTo(fromCanonical(toCanonical(x, unit, q), unit, q), x, 1e-12, absolute);
        closeTo(toCanonical(fromCanonical(x, unit, q), unit, q), x, 1e-12, absolute);
      }),
      { numRuns: 200 },
    );
  });

  test.each(everyUnit)("parseQuantity(format(x, $unit)) recovers x ($q)", ({ q, unit }) => {
    const absolute = q === "preheat" ? 1e-12 * AFFINE_SCALE : 0;
    fc.assert(
      fc.property(magnitude, fc.boolean(), (x, spaced) => {
        const text = `${fromCanonical(x, unit, q)}${spaced ? " " : ""}${unit}`;
        const parsed = parseQuantity(text, q);
        expect(parsed.ok).toBe(true);
        if (parsed.ok) {
          closeTo(parsed.value, x, 1e-12, absolute);
          expect(parsed.unit).toBe(unit);
          expect(parsed.text).toBe(text);
        }
      }),
      { numRuns: 100 },
    );
  });
});

describe("parseQuantity", () => {
  test.each<[string, Quantity, string | undefined, number, string]>([
    ["0.8 m/s", "scanSpeed", undefined, 800, "m/s"],
    ["0.8m/s", "scanSpeed", undefined, 800, "m/s"],
    ["1.2e3 mm/s", "scanSpeed", undefined, 1200, "mm/s"],
    ["1.2E+3 mm/s", "scanSpeed", undefined, 1200, "mm/s"],
    ["48000 mm/min", "scanSpeed", undefined, 800, "mm/min"],
    ["30 in/s", "scanSpeed", undefined, 762, "in/s"],
    ["200 W", "laserPower", undefined, 200, "W"],
    ["200W", "laserPower", undefined, 200, "W"],
    ["0.2 kW", "laserPower", undefined, 200, "kW"],
    ["200", "laserPower", undefined, 200, "W"],
    ["0.2", "laserPower", "kW", 200, "kW"],
    ["0.2", "laserPower", "KW", 200, "kW"],
    ["250 W", "laserPower", "kW", 250, "W"], // a unit in the text wins over the column unit
    ["0,1 mm", "hatchSpacing", undefined, 100, "mm"],
    ["80 µm", "hatchSpacing", undefined, 80, "µm"],
    ["80 um", "hatchSpacing", undefined, 80, "µm"],
    [`80 ${GREEK_MU}m`, "hatchSpacing", undefined, 80, "µm"],
    ["80 microns", "spotDiameter", undefined, 80, "µm"],
    ["4 mil", "hatchSpacing", undefined, 101.6, "mil"],
    [".03 mm", "layerThickness", undefined, 30, "mm"],
    ["-20 °C", "preheat", undefined, -20, "°C"],
    ["\u221220 °C", "preheat", undefined, -20, "°C"], // U+2212 minus sign
    ["473 K", "preheat", undefined, 199.85, "K"],
    ["200 deg C", "preheat", undefined, 200, "°C"],
    ["99.5 %", "relativeDensity", undefined, 99.5, "%"],
    ["99.5%", "relativeDensity", undefined, 99.5, "%"],
    ["0.995", "relativeDensity", "fraction", 99.5, "fraction"],
    ["  35 µm  ", "powderSize", undefined, 35, "µm"],
  ])("%j as %s (default %s) -> %d from %s", (text, q, defaultUnit, value, unit) => {
    const parsed = parseQuantity(text, q, defaultUnit);
    expect(parsed).toEqual({ ok: true, value, unit, text });
  });

  test("a bare number takes the canonical unit when no default is given", () => {
    expect(parseQuantity("30", "layerThickness")).toMatchObject({ ok: true, value: 30, unit: "µm" });
  });

  test("limits are not judged here: a negative power parses", () => {
    expect(parseQuantity("-5 W", "laserPower")).toMatchObject({ ok: true, value: -5 });
  });
});

describe("decimal-comma rule", () => {
  test.each<[string, number]>([
    ["0,1 mm", 100], // single comma: decimal comma
    ["0,03", 30],
    [",5 mm", 500],
    ["1,000 mm", 1000], // "1,000" is 1.000 — predictable, and flagged later as implausible
    ["1,234.5 µm", 1234.5], // with a dot, commas are thousands separators
    ["12,345.0 µm", 12345],
  ])("%j -> %d µm", (text, um) => {
    expect(parseQuantity(text, "hatchSpacing", "mm")).toMatchObject({ ok: true, value: um });
  });

  test.each(["1,000,000 mm/s", "1.234.5 mm/s", "12,34.5 mm/s", "1,2,3 mm/s", ", mm/s", ". mm/s"])(
    "%j is refused rather than guessed",
    (text) => {
      const parsed = parseQuantity(text, "scanSpeed");
      expect(parsed.ok).toBe(false);
      if (!parsed.ok) expect(parsed.message).toContain("scan speed");
    },
  );
});

describe("parseQuantity messages", () => {
  test("unreadable text names the quantity and shows examples", () => {
    expect(parseQuantity("abc", "scanSpeed")).toEqual({
      ok: false,
      message: "Cannot read 'abc' as a scan speed: enter a number with a unit such as 800 mm/s or 0.8 m/s.",
    });
  });

  test.each<[string, Quantity, string]>([
    ["200 kg", "laserPower", "'kg' is not a unit of laser power: use W or kW."],
    ["800 W", "scanSpeed", "'W' is not a unit of scan speed: use mm/s, m/s, mm/min, m/min or in/s."],
    ["4 mil", "spotDiameter", "'mil' is not a unit of spot diameter: use µm or mm."],
    ["80 mm/s", "hatchSpacing", "'mm/s' is not a unit of hatch spacing: use µm, mm, in or mil."],
    ["20 %", "preheat", "'%' is not a unit of preheat temperature: use °C, K or °F."],
    ["99 W", "relativeDensity", "'W' is not a unit of relative density: use % or fraction."],
  ])("%j as %s", (text, q, message) => {
    expect(parseQuantity(text, q)).toEqual({ ok: false, message });
  });

  test("a wrong column unit is reported, not thrown", () => {
    expect(parseQuantity("200", "laserPower", "mm")).toEqual({
      ok: false,
      message: "'mm' is not a unit of laser power: use W or kW.",
    });
  });

  test("empty input", () => {
    expect(parseQuantity("  ", "layerThickness")).toEqual({
      ok: false,
      message: "No layer thickness entered: enter a number with a unit such as 30 µm or 0.03 mm.",
    });
  });

  test("spaces inside a number are explained", () => {
    const parsed = parseQuantity("1 000 mm/s", "scanSpeed");
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.message).toMatch(/without spaces/);
  });

  test("overflow is refused", () => {
    expect(parseQuantity("1e999 W", "laserPower").ok).toBe(false);
    expect(parseQuantity("1e306 kW", "laserPower").ok).toBe(false);
  });
});

describe("parseHeaderUnit", () => {
  test.each<[string, string, string | null]>([
    ["Speed [m/s]", "Speed", "m/s"],
    ["Hatch space (mm)", "Hatch space", "mm"],
    ["Layer (µm)", "Layer", "µm"],
    [`Layer (${GREEK_MU}m)`, "Layer", "µm"],
    ["Layer thickness (um)", "Layer thickness", "µm"],
    [`D50 ${GREEK_MU}m`, "D50", "µm"],
    [`D50 ${MICRO_SIGN}m`, "D50", "µm"],
    ["RD (%)", "RD", "%"],
    ["Power (W)", "Power", "W"],
    ["Power [kW]", "Power", "kW"],
    ["Preheat (°C)", "Preheat", "°C"],
    ["Preheat (C)", "Preheat", "°C"],
    ["Scan speed (mm s-1)", "Scan speed", "mm/s"],
    ["Scan speed, mm/s", "Scan speed", "mm/s"],
    ["power_W", "power", "W"],
    ["hatch_spacing_um", "hatch_spacing", "µm"],
    ["speed_mm_s", "speed", "mm/s"],
    ["Speed mm/s", "Speed", "mm/s"],
    ["Power", "Power", null],
    ["Sample C", "Sample C", null], // a single letter after a space is not taken as a unit
    ["Track (A)", "Track (A)", null], // a bracket without a known unit keeps the header whole
    ["  Speed   [m/s] ", "Speed", "m/s"],
    ["(mm)", "(mm)", null],
  ])("%j -> %j, %j", (header, name, unit) => {
    expect(parseHeaderUnit(header)).toEqual({ name, unit });
  });
});

describe("hard limits and plausible ranges", () => {
  test.each<[number, Quantity, string | null]>([
    [200, "laserPower", null],
    [10_000, "laserPower", null],
    [10_000.5, "laserPower", "Laser power must be at most 10,000 W; got 10,000.5 W."],
    [0, "laserPower", "Laser power must be greater than 0 W; got 0 W."],
    [-3, "scanSpeed", "Scan speed must be greater than 0 mm/s; got -3 mm/s."],
    [20_001, "scanSpeed", "Scan speed must be at most 20,000 mm/s; got 20,001 mm/s."],
    [2_000, "hatchSpacing", null],
    [2_001, "hatchSpacing", "Hatch spacing must be at most 2,000 µm; got 2,001 µm."],
    [1_001, "layerThickness", "Layer thickness must be at most 1,000 µm; got 1,001 µm."],
    [2_500, "spotDiameter", "Spot diameter must be at most 2,000 µm; got 2,500 µm."],
    [-273.15, "preheat", null],
    [-300, "preheat", "Preheat temperature must be at least -273.15 °C (absolute zero); got -300 °C."],
    [5_000, "preheat", null],
    [1e6, "powderSize", null],
    [0, "powderSize", "Powder particle size must be greater than 0 µm; got 0 µm."],
    [0, "relativeDensity", null],
    [100.6, "relativeDensity", null], // 100–101 % is a warning raised elsewhere
    [101.2, "relativeDensity", "Relative density must be at most 101 %; got 101.2 %."],
    [-0.1, "relativeDensity", "Relative density must be at least 0 %; got -0.1 %."],
    [Number.NaN, "laserPower", "Laser power must be a finite number of W; got NaN."],
  ])("%d as %s", (value, q, message) => {
    expect(checkHardLimit(value, q)).toBe(message);
  });

  test.each(QUANTITIES)("the plausible range of %s lies inside its hard limits", (q) => {
    const { min, max } = PLAUSIBLE_RANGES[q];
    expect(min).toBeLessThan(max);
    expect(checkHardLimit(min, q)).toBeNull();
    expect(checkHardLimit(max, q)).toBeNull();
  });

  test("hard limits match DOMAIN.md", () => {
    expect(HARD_LIMITS.preheat).toEqual({ min: -273.15, minInclusive: true, max: null });
    expect(HARD_LIMITS.relativeDensity).toEqual({ min: 0, minInclusive: true, max: 101 });
  });
});

describe("quantityLabel", () => {
  test.each<[Quantity, string]>([
    ["laserPower", "laser power"],
    ["scanSpeed", "scan speed"],
    ["hatchSpacing", "hatch spacing"],
    ["layerThickness", "layer thickness"],
    ["spotDiameter", "spot diameter"],
    ["preheat", "preheat temperature"],
    ["powderSize", "powder particle size"],
    ["relativeDensity", "relative density"],
  ])("%s -> %s", (q, label) => {
    expect(quantityLabel(q)).toBe(label);
  });
});
