import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { OUTCOMES, mapOutcome } from "../lib/domain/outcomes";
import { normalizeDoi } from "../lib/domain/doi";
import { PLAUSIBLE_RANGES, checkHardLimit, parseQuantity, type Quantity } from "../lib/domain/units";
import {
  ALSI_SPEED_CAP_MM_PER_S,
  DEMO_ALLOYS,
  DEMO_DENSE_WINDOWS_J_PER_MM3,
  HOLE_316L,
  PLANTED_PROBLEM_KINDS,
  generateScenario,
  type PlantedProblemKind,
  type QuantityText,
  type Scenario,
  type ScenarioRecord,
} from "./scenario";

const SEED = 20_261_201;
const scenario = generateScenario(SEED);

const FIELDS = {
  laserPower: "laserPower",
  scanSpeed: "scanSpeed",
  hatchSpacing: "hatchSpacing",
  layerThickness: "layerThickness",
  spotDiameter: "spotDiameter",
  preheat: "preheat",
  powderD10: "powderSize",
  powderD50: "powderSize",
  powderD90: "powderSize",
  relativeDensity: "relativeDensity",
} as const satisfies Record<string, Quantity>;
type Field = keyof typeof FIELDS;
const FIELD_NAMES = Object.keys(FIELDS) as Field[];
const REQUIRED: Field[] = ["laserPower", "scanSpeed", "hatchSpacing", "layerThickness"];

/** Reads a field the way the record form does: value and unit joined. */
function canonical(r: ScenarioRecord, field: Field): number | null {
  const q: QuantityText = r[field];
  if (q.value === "") return null;
  const parsed = parseQuantity(q.unit ? `${q.value} ${q.unit}` : q.value, FIELDS[field]);
  if (!parsed.ok) throw new Error(`${r.key}.${field}: ${parsed.message}`);
  return parsed.value;
}

function must(r: ScenarioRecord, field: Field): number {
  const v = canonical(r, field);
  if (v === null) throw new Error(`${r.key}.${field} is empty`);
  return v;
}

function energy(r: ScenarioRecord): number {
  return must(r, "laserPower") / (must(r, "scanSpeed") * (must(r, "hatchSpacing") / 1000) * (must(r, "layerThickness") / 1000));
}

const byKey = new Map(scenario.records.map((r) => [r.key, r]));
const record = (key: string): ScenarioRecord => {
  const r = byKey.get(key);
  if (!r) throw new Error(`no record ${key}`);
  return r;
};
const problems = (s: Scenario, kind: PlantedProblemKind) => s.plantedProblems.filter((p) => p.kind === kind);
const plantedKeys = (kind: PlantedProblemKind) => new Set(problems(scenario, kind).flatMap((p) => p.recordKeys));

describe("generateScenario: shape", () => {
  test("the same seed gives the same scenario; another seed another", () => {
    expect(generateScenario(SEED)).toEqual(scenario);
    const other = generateScenario(SEED + 1);
    expect(other.records).not.toEqual(scenario.records);
    expect(other.records).toHaveLength(scenario.records.length);
  });

  test("about 3,000 records by default, exactly the count asked for otherwise", () => {
    expect(scenario.records).toHaveLength(3_000);
    for (const n of [200, 1_234, 4_000]) expect(generateScenario(7, { recordCount: n }).records).toHaveLength(n);
  });

  test.each([199, 4_001, 1.5, Number.NaN])("recordCount %d is refused", (n) => {
    expect(() => generateScenario(1, { recordCount: n })).toThrow(RangeError);
  });

  test("keys are unique and every reference resolves", () => {
    expect(byKey.size).toBe(scenario.records.length);
    const sources = new Set(scenario.sources.map((s) => s.key));
    const users = new Set(scenario.users.map((u) => u.name));
    expect(sources.size).toBe(scenario.sources.length);
    for (const r of scenario.records) {
      expect(sources.has(r.sourceKey)).toBe(true);
      expect(users.has(r.createdBy)).toBe(true);
      expect(Number.isInteger(r.dayOffset) && r.dayOffset >= 0).toBe(true);
    }
    for (const s of scenario.sources) expect(scenario.records.some((r) => r.sourceKey === s.key)).toBe(true);
  });

  test("an invented lab with 3–4 users of every role", () => {
    expect(scenario.lab.name.length).toBeGreaterThan(0);
    expect(scenario.users.length).toBeGreaterThanOrEqual(3);
    expect(scenario.users.length).toBeLessThanOrEqual(4);
    expect(new Set(scenario.users.map((u) => u.role))).toEqual(new Set(["contributor", "reviewer", "admin"]));
  });

  test("every alloy is present in quantity", () => {
    for (const alloy of DEMO_ALLOYS) {
      expect(scenario.records.filter((r) => r.alloy === alloy).length).toBeGreaterThan(300);
    }
  });

  test("generates 3,000 records in under 200 ms", () => {
    generateScenario(1); // warm-up: the first call also compiles
    const times = [2, 3, 4].map((seed) => {
      const t0 = performance.now();
      generateScenario(seed);
      return performance.now() - t0;
    });
    expect(times.sort((a, b) => a - b)[1]).toBeLessThan(200);
  });
});

describe("generateScenario: sources", () => {
  test("about ten sources of every kind, years 2015–2025", () => {
    expect(scenario.sources.length).toBeGreaterThanOrEqual(8);
    expect(scenario.sources.length).toBeLessThanOrEqual(12);
    expect(new Set(scenario.sources.map((s) => s.kind))).toEqual(
      new Set(["journal_article", "conference_paper", "thesis", "preprint", "report", "shop_trial"]),
    );
    for (const s of scenario.sources) {
      expect(s.year).toBeGreaterThanOrEqual(2015);
      expect(s.year).toBeLessThanOrEqual(2025);
      expect(s.authors.length).toBeGreaterThan(0);
    }
  });

  test("DOIs use the 10.5555 test prefix and are already normalized; one shop trial has none", () => {
    const withDoi = scenario.sources.filter((s) => s.doi !== null);
    for (const s of withDoi) {
      expect(s.doi?.startsWith("10.5555/")).toBe(true);
      expect(normalizeDoi(s.doi ?? "")).toBe(s.doi);
    }
    const without = scenario.sources.filter((s) => s.doi === null);
    expect(without.map((s) => s.kind)).toEqual(["shop_trial"]);
    expect(new Set(withDoi.map((s) => s.doi)).size).toBe(withDoi.length);
  });

  test("quality attributes vary over their whole vocabularies", () => {
    const values = <K extends keyof Scenario["sources"][number]>(k: K) => new Set(scenario.sources.map((s) => s[k]));
    expect(values("densityMethod")).toEqual(new Set(["archimedes", "ct", "image_analysis", "other", "unknown"]));
    expect(values("outcomeEvidence")).toEqual(new Set(["micrographs", "density_only", "statement_only"]));
    expect(values("spotSizeDefinition")).toEqual(new Set(["one_over_e2", "d4sigma", "fwhm", "unstated"]));
    for (const k of ["machineStated", "powderReported", "atmosphereReported"] as const) expect(values(k)).toEqual(new Set([true, false]));
  });

  test("sources report in the units papers use", () => {
    const unitsOf = (field: Field) => new Set(scenario.records.map((r) => r[field].unit).filter((u) => u !== ""));
    expect(unitsOf("scanSpeed")).toContain("m/s");
    expect(unitsOf("scanSpeed")).toContain("in/s");
    expect(unitsOf("hatchSpacing")).toContain("mm");
    expect(unitsOf("laserPower")).toContain("kW");
    expect(unitsOf("layerThickness")).toContain("mm");
    expect(unitsOf("layerThickness")).toContain("mil");
    expect(unitsOf("preheat")).toContain("K");
    expect(unitsOf("relativeDensity")).toContain("fraction");
    expect(unitsOf("hatchSpacing")).toContain("\u03BCm"); // Greek mu as typed
    expect(scenario.records.some((r) => r.spotDefinition === "fwhm")).toBe(true);
    expect(scenario.records.some((r) => r.laserPower.value.includes(","))).toBe(true); // decimal comma
  });
});

describe("generateScenario: records", () => {
  test("every value parses as its quantity and stays inside the hard limits", () => {
    for (const r of scenario.records) {
      for (const field of FIELD_NAMES) {
        const v = canonical(r, field);
        if (v !== null) expect(checkHardLimit(v, FIELDS[field]), `${r.key}.${field}`).toBeNull();
      }
    }
  });

  test("required values are present and every value has a unit and a provenance", () => {
    for (const r of scenario.records) {
      for (const field of REQUIRED) expect(r[field].value, `${r.key}.${field}`).not.toBe("");
      for (const field of FIELD_NAMES) {
        if (r[field].value === "") continue;
        expect(r[field].unit, `${r.key}.${field}`).not.toBe("");
        expect(r.provenance[field], `${r.key}.${field}`).toBeDefined();
      }
      expect(r.alloy).not.toBe("");
    }
  });

  test("some spot sizes are assumed and some densities derived", () => {
    expect(scenario.records.some((r) => r.provenance.spotDiameter === "assumed")).toBe(true);
    expect(scenario.records.some((r) => r.provenance.relativeDensity === "derived")).toBe(true);
  });

  test("powder sizes are ordered D10 ≤ D50 ≤ D90", () => {
    for (const r of scenario.records) {
      const [d10, d50, d90] = [canonical(r, "powderD10"), canonical(r, "powderD50"), canonical(r, "powderD90")];
      if (d10 !== null && d50 !== null) expect(d10).toBeLessThanOrEqual(d50);
      if (d50 !== null && d90 !== null) expect(d50).toBeLessThanOrEqual(d90);
    }
  });

  test("the outcome is what the outcome text maps to", () => {
    for (const r of scenario.records) {
      expect(r.outcome, r.key).toBe(r.outcomeText === null ? "unknown" : mapOutcome(r.outcomeText).outcome);
    }
  });

  test("every outcome class has records and the classes are imbalanced", () => {
    const counts = OUTCOMES.map((o) => scenario.records.filter((r) => r.outcome === o).length);
    for (const c of counts) expect(c).toBeGreaterThan(0);
    expect(Math.max(...counts) / Math.min(...counts)).toBeGreaterThan(5);
    expect(scenario.records.filter((r) => r.outcome === "dense").length).toBe(Math.max(...counts));
  });

  test("relative density stays at or below 100 % except where planted", () => {
    const planted = plantedKeys("implausible_value");
    for (const r of scenario.records) {
      const rd = canonical(r, "relativeDensity");
      if (rd !== null && !planted.has(r.key)) expect(rd, r.key).toBeLessThanOrEqual(100);
    }
  });

  test("outside the planted problems, outcomes follow the energy density", () => {
    const planted = new Set(scenario.plantedProblems.flatMap((p) => p.recordKeys));
    const byOutcome = (o: string) =>
      scenario.records.filter((r) => r.outcome === o && !planted.has(r.key) && r.alloy === "316L").map(energy);
    const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)] ?? Number.NaN;
    expect(median(byOutcome("lack_of_fusion"))).toBeLessThan(median(byOutcome("dense")));
    expect(median(byOutcome("dense"))).toBeLessThan(median(byOutcome("keyhole")));
  });
});

describe("generateScenario: planted problems", () => {
  test.each(PLANTED_PROBLEM_KINDS)("%s is planted and its records exist", (kind) => {
    const found = problems(scenario, kind);
    expect(found.length).toBeGreaterThan(0);
    for (const p of found) {
      for (const key of p.recordKeys) expect(byKey.has(key), key).toBe(true);
      expect(p.note.length).toBeGreaterThan(0);
    }
  });

  test.each<[PlantedProblemKind, number, number]>([
    ["exact_duplicate", 12, 20],
    ["near_duplicate", 12, 18],
    ["unit_slip", 8, 12],
    ["implausible_value", 6, 10],
    ["physics_contradiction", 12, 18],
    ["label_conflict", 6, 12],
  ])("about the intended number of %s (%d–%d)", (kind, min, max) => {
    const n = problems(scenario, kind).length;
    expect(n).toBeGreaterThanOrEqual(min);
    expect(n).toBeLessThanOrEqual(max);
  });

  test("a label conflict the wording cannot express is made up by an exact duplicate", () => {
    // 15 exact duplicates and 10 label conflicts are intended at 3,000 records
    expect(problems(scenario, "exact_duplicate").length + problems(scenario, "label_conflict").length).toBe(25);
  });

  test("exact duplicates repeat every value in the same source", () => {
    for (const { recordKeys } of problems(scenario, "exact_duplicate")) {
      const [a, b] = recordKeys.map(record);
      expect(a && b).toBeTruthy();
      if (!a || !b) continue;
      expect(b.sourceKey).toBe(a.sourceKey);
      for (const field of FIELD_NAMES) expect(b[field]).toEqual(a[field]);
      expect(b.outcome).toBe(a.outcome);
    }
  });

  test("near duplicates cross sources within the duplicate tolerances (P ±1 % or 2 W, v ±1 %, h and t ±1 µm)", () => {
    for (const { recordKeys } of problems(scenario, "near_duplicate")) {
      const [a, b] = recordKeys.map(record);
      if (!a || !b) throw new Error("pair expected");
      expect(b.sourceKey).not.toBe(a.sourceKey);
      expect(b.alloy).toBe(a.alloy);
      const p = [must(a, "laserPower"), must(b, "laserPower")] as const;
      expect(Math.abs(p[0] - p[1])).toBeLessThanOrEqual(Math.max(2, 0.01 * p[0]));
      const v = [must(a, "scanSpeed"), must(b, "scanSpeed")] as const;
      expect(Math.abs(v[0] - v[1])).toBeLessThanOrEqual(0.01 * v[0]);
      for (const f of ["hatchSpacing", "layerThickness"] as const) expect(Math.abs(must(a, f) - must(b, f))).toBeLessThanOrEqual(1 + 1e-9);
      const same = FIELD_NAMES.every((f) => JSON.stringify(a[f]) === JSON.stringify(b[f]));
      expect(same).toBe(false);
    }
  });

  test("no near duplicates exist across sources beyond the planted ones", () => {
    const expected = new Set(
      [...problems(scenario, "near_duplicate"), ...problems(scenario, "label_conflict")].map((p) => [...p.recordKeys].sort().join("|")),
    );
    const cells = new Map<string, ScenarioRecord[]>();
    for (const r of scenario.records) {
      const cell = `${r.alloy}|${Math.round(must(r, "hatchSpacing"))}`;
      cells.set(cell, [...(cells.get(cell) ?? []), r]);
    }
    const found: string[] = [];
    for (const list of cells.values()) {
      for (let i = 0; i < list.length; i += 1) {
        for (let j = i + 1; j < list.length; j += 1) {
          const a = list[i] as ScenarioRecord;
          const b = list[j] as ScenarioRecord;
          if (a.sourceKey === b.sourceKey) continue;
          const close =
            Math.abs(must(a, "laserPower") - must(b, "laserPower")) <= Math.max(2, 0.01 * must(a, "laserPower")) &&
            Math.abs(must(a, "scanSpeed") - must(b, "scanSpeed")) <= 0.01 * must(a, "scanSpeed") &&
            Math.abs(must(a, "layerThickness") - must(b, "layerThickness")) <= 1;
          if (close) found.push([a.key, b.key].sort().join("|"));
        }
      }
    }
    for (const pair of found) expect(expected.has(pair), pair).toBe(true);
  });

  test("unit slips lie outside the plausible range and one factor of 1,000 brings them in", () => {
    const quantityOf: Record<string, [Field, Quantity]> = {
      "Scan speed": ["scanSpeed", "scanSpeed"],
      "Hatch spacing": ["hatchSpacing", "hatchSpacing"],
      "Layer thickness": ["layerThickness", "layerThickness"],
      "Laser power": ["laserPower", "laserPower"],
    };
    for (const p of problems(scenario, "unit_slip")) {
      const r = record(p.recordKeys[0] ?? "");
      const entry = Object.entries(quantityOf).find(([prefix]) => p.note.startsWith(prefix));
      if (!entry) throw new Error(`unexpected note ${p.note}`);
      const [field, quantity] = entry[1];
      const v = must(r, field);
      const { min, max } = PLAUSIBLE_RANGES[quantity];
      expect(v < min || v > max).toBe(true);
      expect(v * 1000).toBeGreaterThanOrEqual(min);
      expect(v * 1000).toBeLessThanOrEqual(max);
    }
  });

  test("implausible values lie outside the plausible range but still parse", () => {
    for (const p of problems(scenario, "implausible_value")) {
      const r = record(p.recordKeys[0] ?? "");
      const outside = (["laserPower", "scanSpeed", "layerThickness", "relativeDensity"] as const).some((f) => {
        const v = canonical(r, f);
        const { min, max } = PLAUSIBLE_RANGES[f];
        return v !== null && (v < min || v > max);
      });
      expect(outside, p.note).toBe(true);
    }
  });

  test("physics contradictions are labelled dense far below the alloy's window", () => {
    for (const p of problems(scenario, "physics_contradiction")) {
      const r = record(p.recordKeys[0] ?? "");
      expect(r.outcome).toBe("dense");
      const [low] = DEMO_DENSE_WINDOWS_J_PER_MM3[r.alloy as (typeof DEMO_ALLOYS)[number]];
      expect(energy(r)).toBeLessThan(0.75 * low);
    }
  });

  test("label conflicts pair the same parameters with different outcomes", () => {
    const sources = new Set<boolean>();
    for (const p of problems(scenario, "label_conflict")) {
      const [a, b] = p.recordKeys.map(record);
      if (!a || !b) throw new Error("pair expected");
      expect(b.alloy).toBe(a.alloy);
      for (const f of REQUIRED) expect(must(b, f)).toBeCloseTo(must(a, f), 9);
      expect(b.outcome).not.toBe(a.outcome);
      sources.add(a.sourceKey === b.sourceKey);
    }
    expect(sources).toEqual(new Set([true, false])); // within a source and across sources
  });

  test("thin regions: almost no fast AlSi10Mg, and a hole in the 316L power–speed plane", () => {
    const fast = scenario.records.filter((r) => r.alloy === "AlSi10Mg" && must(r, "scanSpeed") > ALSI_SPEED_CAP_MM_PER_S);
    const listed = problems(scenario, "thin_region").flatMap((p) => p.recordKeys);
    expect(fast.length).toBeGreaterThan(0);
    expect(fast.length).toBeLessThanOrEqual(5);
    expect(fast.map((r) => r.key).sort()).toEqual([...listed].sort());
    const inHole = scenario.records.filter((r) => {
      if (r.alloy !== "316L") return false;
      const p = must(r, "laserPower");
      const v = must(r, "scanSpeed");
      return p >= HOLE_316L.minPowerW && p <= HOLE_316L.maxPowerW && v >= HOLE_316L.minSpeedMmPerS && v <= HOLE_316L.maxSpeedMmPerS;
    });
    expect(inHole).toEqual([]);
  });
});

describe("generateScenario: invariants over seeds", () => {
  test("never produces NaN, infinities or empty required values", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 31 - 1 }), fc.integer({ min: 200, max: 600 }), (seed, recordCount) => {
        const s = generateScenario(seed, { recordCount });
        expect(s.records).toHaveLength(recordCount);
        expect(JSON.stringify(s)).not.toMatch(/NaN|Infinity|undefined|null,"unit"/);
        for (const r of s.records) {
          for (const f of REQUIRED) expect(Number.isFinite(must(r, f))).toBe(true);
          for (const f of FIELD_NAMES) {
            const v = canonical(r, f);
            if (v !== null) expect(checkHardLimit(v, FIELDS[f])).toBeNull();
          }
        }
        for (const kind of PLANTED_PROBLEM_KINDS) expect(problems(s, kind).length).toBeGreaterThan(0);
        const keys = new Set(s.records.map((r) => r.key));
        for (const p of s.plantedProblems) for (const k of p.recordKeys) expect(keys.has(k)).toBe(true);
      }),
      { numRuns: 8 },
    );
  });
});
