import { describe, expect, test } from "vitest";
import { computeMeltpool } from "./meltpool";

const BASE = { alloy: "316L", power: "200W", speed: "800mm/s", spot: "80um", hatch: "100um", layer: "30um" };

describe("computeMeltpool", () => {
  test("a named alloy: curated properties, criteria, regime and energy density", () => {
    const r = computeMeltpool(BASE);
    if (!r.ok) throw new Error(r.error.message);
    expect(r.data.alloy?.key).toBe("316L");
    expect(r.data.properties_source.basis).toBe("curated");
    expect(r.data.energy_density_j_mm3).toBeCloseTo(83.333, 2);
    expect(r.data.criteria.length).toBe(5);
    expect(r.data.width_um).toBeGreaterThan(0);
    expect(r.data.method).toBe("surface");
  });

  test("units are read like the entry form: 0.2 kW, 0.8 m/s and 0.08 mm are the same case", () => {
    const a = computeMeltpool(BASE);
    const b = computeMeltpool({ ...BASE, power: "0.2 kW", speed: "0.8 m/s", spot: "0.08 mm", hatch: "0.1mm", layer: "0.03 mm" });
    if (!a.ok || !b.ok) throw new Error("expected results");
    expect(b.data.width_um).toBeCloseTo(a.data.width_um, 9);
    expect(b.data.energy_density_j_mm3).toBeCloseTo(a.data.energy_density_j_mm3 as number, 9);
  });

  test("property flags override the alloy and, all given, need no alloy", () => {
    const props = { absorptivity: "0.35", density: "7950", cp: "500", k: "20", tMelt: "1723", tBoil: "3090" };
    const withAlloy = computeMeltpool(BASE);
    const without = computeMeltpool({ ...BASE, alloy: null, ...props });
    if (!withAlloy.ok || !without.ok) throw new Error("expected results");
    expect(without.data.properties_source.basis).toBe("overrides");
    expect(without.data.width_um).toBeCloseTo(withAlloy.data.width_um, 9);
    const override = computeMeltpool({ ...BASE, k: "40" });
    if (!override.ok) throw new Error(override.error.message);
    expect(override.data.properties_source.properties.thermal_conductivity_w_m_k?.origin).toBe("override");
    expect(override.data.width_um).toBeLessThan(withAlloy.data.width_um);
  });

  test("an uncurated composition uses the mixture and says the conductivity is estimated", () => {
    const r = computeMeltpool({ ...BASE, alloy: "Fe-18Cr-8Ni", k: "20" });
    if (!r.ok) throw new Error(r.error.message);
    expect(r.data.properties_source.basis).toBe("mixture");
    expect(r.data.properties_source.properties.absorptivity?.estimated).toBe(true);
  });

  test.each([
    [{ power: "0W" }, "power"],
    [{ power: "-5 W" }, "power"],
    [{ speed: "fast" }, "speed"],
    [{ spot: undefined }, "spot"],
    [{ spot: "80 kg" }, "spot"],
    [{ alloy: "unobtainium" }, "alloy"],
    [{ k: "0" }, "k"],
    [{ density: "NaN" }, "density"],
    [{ absorptivity: "1.5" }, "absorptivity"],
    [{ spotDefinition: "radius" }, "spotDefinition"],
    [{ method: "fast" }, "method"],
  ] as const)("%o is an invalid_input naming %s", (change, field) => {
    const r = computeMeltpool({ ...BASE, ...change });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.error.code).toBe("invalid_input");
    expect(Object.keys(r.error.details?.fieldErrors ?? {})).toContain(field);
  });

  test("without an alloy, the missing property flags are listed", () => {
    const r = computeMeltpool({ ...BASE, alloy: null, absorptivity: "0.3" });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error.message).toMatch(/--density.*--cp.*--k.*--t-melt.*--t-boil/);
  });

  test("preheat at or above the melting point is an invalid_input from the core's RangeError", () => {
    const r = computeMeltpool({ ...BASE, t0: "2000" });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error.message).toMatch(/ambientTemperatureK/);
  });

  test("nothing melting is a result with zero dimensions, not an error", () => {
    const r = computeMeltpool({ ...BASE, power: "3W" });
    if (!r.ok) throw new Error(r.error.message);
    expect([r.data.width_um, r.data.depth_um, r.data.length_um]).toEqual([0, 0, 0]);
    expect(r.data.regime.label).toBe("no_melting");
    expect(r.data.notes.join(" ")).toMatch(/no melting/);
  });
});
