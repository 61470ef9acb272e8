import { execFileSync } from "node:child_process";
import { beforeAll, describe, expect, test } from "vitest";
import { ELEMENTS, getElement, isElementSymbol } from "./elements";

const LPBF_ELEMENTS = "Fe Cr Ni Mo Mn Si C N P S Ti Al V Nb Ta Co W Cu Zr Mg Zn B Hf Re Y O Sn Pd Ag La Ce Sc".split(" ");

interface Reference {
  number: number;
  mass: number;
  density: number | null;
}

// Reference library: python3-periodictable (P. Kienzle et al.; masses and densities from NIST/CRC).
let reference: Record<string, Reference> = {};
beforeAll(() => {
  const script = [
    "import json, periodictable as pt",
    `symbols = ${JSON.stringify(ELEMENTS.map((e) => e.symbol))}`,
    "print(json.dumps({s: {'number': getattr(pt, s).number, 'mass': getattr(pt, s).mass, 'density': getattr(pt, s).density} for s in symbols}))",
  ].join("\n");
  reference = JSON.parse(execFileSync("/usr/bin/python3", ["-c", script], { encoding: "utf8" })) as Record<string, Reference>;
});

describe("element table", () => {
  test("covers the elements of LPBF alloys", () => {
    for (const symbol of LPBF_ELEMENTS) expect(isElementSymbol(symbol), symbol).toBe(true);
    expect(ELEMENTS.length).toBeGreaterThanOrEqual(30);
  });

  test.each(ELEMENTS.map((e) => [e.symbol, e] as const))("%s: atomic number and mass agree with periodictable", (symbol, e) => {
    const ref = reference[symbol];
    expect(ref).toBeDefined();
    expect(e.atomicNumber).toBe(ref?.number);
    // periodictable carries older (2001) IUPAC weights; the CIAAW 2021 abridged values differ by < 0.1 %.
    expect(Math.abs(e.atomicMassGPerMol - (ref?.mass ?? 0)) / (ref?.mass ?? 1)).toBeLessThan(1e-3);
  });

  test.each(ELEMENTS.map((e) => [e.symbol, e] as const))("%s: density agrees with periodictable within 3 %%", (symbol, e) => {
    const refDensity = reference[symbol]?.density;
    expect(refDensity).toBeTypeOf("number");
    // Carbon: allotrope spread (periodictable 2.2, graphite crystal 2.267); N and O: liquid at T_boil.
    const tolerance = symbol === "C" ? 0.05 : 0.03;
    expect(Math.abs(e.densityGPerCm3 - (refDensity ?? 0)) / (refDensity ?? 1)).toBeLessThan(tolerance);
  });

  test.each(ELEMENTS.map((e) => [e.symbol, e] as const))("%s: every column is a positive number and T_boil >= T_melt", (_symbol, e) => {
    for (const value of [e.atomicMassGPerMol, e.densityGPerCm3, e.meltingPointK, e.boilingPointK, e.specificHeatJPerGK,
      e.thermalConductivityWPerMK, e.heatOfFusionKJPerMol, e.electronegativityPauling, e.valenceElectrons, e.atomicRadiusPm]) {
      expect(value).toBeGreaterThan(0);
    }
    expect(e.boilingPointK).toBeGreaterThanOrEqual(e.meltingPointK);
  });

  test("Dulong–Petit: molar heat capacity of the metals is near 3R (25 J/mol·K)", () => {
    // A cross-check between two columns typed separately: c_p·M ≈ 3R = 24.94 J/(mol·K) for metals.
    for (const e of ELEMENTS.filter((x) => !["B", "C", "N", "O", "Si", "P", "S", "Be"].includes(x.symbol))) {
      const molar = e.specificHeatJPerGK * e.atomicMassGPerMol;
      expect(molar, e.symbol).toBeGreaterThan(20);
      expect(molar, e.symbol).toBeLessThan(30);
    }
  });

  test("symbols are case-sensitive", () => {
    expect(getElement("Co")?.name).toBe("cobalt");
    expect(getElement("CO")).toBeUndefined();
    expect(getElement("co")).toBeUndefined();
  });
});
