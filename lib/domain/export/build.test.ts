import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { buildTrainingSet, type BuiltExport } from "./build";
import { defaultExportOptions, exampleRecords, exampleSources } from "./example-records";
import type { BalanceMethod, ExportOptions, ExportRecord } from "./types";

const sources = exampleSources(14);
const records = exampleRecords(900, 14, 21);

function options(overrides: Partial<ExportOptions> = {}): ExportOptions {
  return { ...defaultExportOptions(), ...overrides };
}

function build(o: ExportOptions, recs: readonly ExportRecord[] = records): BuiltExport {
  const r = buildTrainingSet({ records: recs, sources, options: o });
  if (!r.ok) throw new Error(r.problem.message);
  return r.built;
}

function col(b: BuiltExport, name: string): number {
  return b.columns.findIndex((c) => c.name === name);
}

function allRows(b: BuiltExport) {
  return b.tables.flatMap((t) => t.table.rows().map((row) => ({ table: t.name, row })));
}

const methods: BalanceMethod[] = ["none", "weights", "over", "under", "smote", "gaussian"];

describe("buildTrainingSet rules", () => {
  test.each(methods)("%s: no source straddles splits, synthetic rows only in train and marked", (method) => {
    const b = build(options({ balance: { method, k: 5, maxSyntheticMultiple: 5 } }));
    const splitOfSource = new Map<number, string>();
    for (const { table, row } of allRows(b)) {
      const isSynthetic = row[col(b, "is_synthetic")] === 1;
      if (isSynthetic) {
        expect(table).toBe("train");
        expect(row[col(b, "record_id")]).toBeNull();
        continue;
      }
      const source = row[col(b, "source_id")] as number;
      const seen = splitOfSource.get(source);
      if (seen) expect(seen).toBe(table);
      splitOfSource.set(source, table);
    }
  });

  test("property: over any filters and seed, no real row is lost unless a filter or the label says so, and none is doubled", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 2 ** 31 }),
        fc.constantFrom<BalanceMethod>("none", "weights", "over", "smote", "gaussian"),
        fc.constantFrom("binary", "multiclass"),
        fc.subarray(["316L", "IN718", "Ti-6Al-4V"], { minLength: 1 }),
        (seed, method, scheme, alloys) => {
          const o = options({ seed, balance: { method, k: 3, maxSyntheticMultiple: 4 }, label: { scheme: scheme as "binary", densityThresholdPct: 99 }, filters: { ...defaultExportOptions().filters, alloys } });
          const r = buildTrainingSet({ records, sources, options: o });
          if (!r.ok) return; // e.g. a class too small for SMOTE's k: nothing written at all
          const b = r.built;
          const ids = allRows(b).map(({ row }) => row[col(b, "record_id")]).filter((id) => id !== null);
          expect(new Set(ids).size).toBe(ids.length);
          const dropped = Object.values(b.counts.dropped).reduce((s, n) => s + n, 0);
          expect(ids.length + dropped).toBe(records.length);
          expect(ids.length).toBe(b.counts.labelled);
        },
      ),
      { numRuns: 25 },
    );
  });

  test("property: synthetic rows never mix alloys or classes and stay under the cap", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 31 }), fc.constantFrom<BalanceMethod>("over", "smote", "gaussian"), fc.double({ min: 0.2, max: 3, noNaN: true }), (seed, method, cap) => {
        const b = build(options({ seed, balance: { method, k: 3, maxSyntheticMultiple: cap } }));
        const byId = new Map(records.map((r) => [r.id, r]));
        const labelCol = col(b, "label");
        const rows = allRows(b).map((x) => x.row);
        for (const row of rows) {
          if (row[col(b, "is_synthetic")] !== 1) continue;
          const parents = String(row[col(b, "synthetic_parents")] ?? "").split(" ").filter(Boolean).map(Number);
          for (const id of parents) {
            const p = byId.get(id)!;
            expect(p.alloyKey).toBe(row[col(b, "alloy")]);
            const parentRow = rows.find((x) => x[col(b, "record_id")] === id)!;
            expect(parentRow[labelCol]).toBe(row[labelCol]);
            expect(parentRow[col(b, "split")]).toBe("train");
          }
        }
        for (const [cls, n] of Object.entries(b.counts.synthetic.train ?? {})) {
          const realByAlloy = new Map<string, number>();
          for (const row of rows) if (row[col(b, "is_synthetic")] === 0 && row[col(b, "split")] === "train" && String(row[labelCol]) === (cls === "success" ? "1" : cls === "failure" ? "0" : cls)) realByAlloy.set(String(row[col(b, "alloy")]), (realByAlloy.get(String(row[col(b, "alloy")])) ?? 0) + 1);
          const real = [...realByAlloy.values()].reduce((s, x) => s + x, 0);
          expect(n).toBeLessThanOrEqual(Math.floor(cap * real) + realByAlloy.size);
        }
      }),
      { numRuns: 15 },
    );
  });

  test("over-sampling balances each alloy's classes in train and leaves validation and test alone", () => {
    const none = build(options());
    const over = build(options({ balance: { method: "over", k: 5, maxSyntheticMultiple: 100 } }));
    expect(over.counts.after.validation).toEqual(none.counts.before.validation);
    expect(over.counts.after.test).toEqual(none.counts.before.test);
    const t = over.counts.after.train!;
    expect(t.success).toBe(t.failure);
  });

  test("under-sampling drops real training rows only, and says how many", () => {
    const b = build(options({ balance: { method: "under", k: 5, maxSyntheticMultiple: 5 } }));
    const away = Object.values(b.counts.underSampled.train ?? {}).reduce((s, n) => s + n, 0);
    expect(away).toBeGreaterThan(0);
    const before = Object.values(b.counts.before.train!).reduce((s, n) => s + n, 0);
    const after = Object.values(b.counts.after.train!).reduce((s, n) => s + n, 0);
    expect(after).toBe(before - away);
  });

  test("class weights give every class the same total weight in train", () => {
    const b = build(options({ balance: { method: "weights", k: 5, maxSyntheticMultiple: 5 } }));
    const totals = new Map<string, number>();
    for (const row of b.tables.find((t) => t.name === "train")!.table.rows()) totals.set(String(row[col(b, "label")]), (totals.get(String(row[col(b, "label")])) ?? 0) + (row[col(b, "sample_weight")] as number));
    const [a, c] = [...totals.values()];
    expect(a).toBeCloseTo(c!, 3);
  });

  test("the same records and seed give the same tables; another seed another split", () => {
    const o = options({ balance: { method: "smote", k: 5, maxSyntheticMultiple: 5 } });
    const a = build(o);
    const b = build(o, [...records].reverse());
    expect(a.tables.map((t) => t.table.rows())).toEqual(b.tables.map((t) => t.table.rows()));
    const testSources = (x: BuiltExport) => new Set(x.tables.find((t) => t.name === "test")!.table.rows().map((r) => r[col(x, "source_id")]));
    const others = [8, 9, 10, 11].map((seed) => testSources(build({ ...o, seed })));
    expect(others.some((s) => [...s].sort().join() !== [...testSources(a)].sort().join())).toBe(true);
  });

  test("SMOTE's synthetic process values are recomputed into physics features", () => {
    const b = build(options({ balance: { method: "smote", k: 5, maxSyntheticMultiple: 5 } }));
    const rows = b.tables[0]!.table.rows().filter((r) => r[col(b, "is_synthetic")] === 1);
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows.slice(0, 50)) {
      const [p, v, h, t] = ["laser_power_w", "scan_speed_mm_s", "hatch_spacing_um", "layer_thickness_um"].map((n) => r[col(b, n)] as number);
      expect(r[col(b, "volumetric_energy_density_j_mm3")]).toBeCloseTo(p! / (v! * (h! / 1000) * (t! / 1000)), 4);
      expect(typeof r[col(b, "meltpool_width_um")]).toBe("number");
    }
  });

  test("folds: one table with a fold column; synthetic rows keep their fold", () => {
    const b = build(options({ split: { kind: "folds", k: 4 }, balance: { method: "smote", k: 3, maxSyntheticMultiple: 5 } }));
    expect(b.tables.map((t) => t.name)).toEqual(["folds"]);
    const rows = b.tables[0]!.table.rows();
    const foldOfSource = new Map<number, number>();
    for (const r of rows) {
      const fold = r[col(b, "fold")] as number;
      expect(fold >= 0 && fold < 4).toBe(true);
      if (r[col(b, "is_synthetic")] === 1) continue;
      const s = r[col(b, "source_id")] as number;
      expect(foldOfSource.get(s) ?? fold).toBe(fold);
      foldOfSource.set(s, fold);
    }
    expect(b.warnings.some((w) => /held out/.test(w))).toBe(true);
  });
});

describe("warnings and problems", () => {
  test("small classes, missing classes in a split and filled values are warned about", () => {
    const b = build(options({ label: { scheme: "multiclass", densityThresholdPct: 99 } }));
    expect(b.warnings.some((w) => /Class cracking has 0 real row/.test(w))).toBe(true);
    expect(b.warnings.some((w) => /spotDiameterUm: \d+ real row\(s\) had no value; filled with the median/.test(w))).toBe(true);
    expect(b.fills.find((f) => f.field === "spotDiameterUm")!.missing).toBeGreaterThan(0);
  });

  test.each<[string, Partial<ExportOptions>, string, RegExp]>([
    ["a filter that leaves nothing", { filters: { ...defaultExportOptions().filters, alloys: ["CuCrZr"] } }, "no_rows", /No record is left/],
    ["a class too small for SMOTE's k", { filters: { ...defaultExportOptions().filters, sourceIds: [1, 2, 3] }, balance: { method: "smote", k: 40, maxSyntheticMultiple: 5 } }, "class_too_small", /needs at least 41 real rows/],
    ["fractions that do not sum to 1", { split: { kind: "source", train: 0.7, validation: 0.2, test: 0.2 } }, "bad_split", /sum to 1/],
    ["balancing a regression label", { label: { scheme: "density", densityThresholdPct: 99 }, balance: { method: "smote", k: 5, maxSyntheticMultiple: 5 } }, "balance_needs_classes", /regression/],
    ["more folds than sources", { split: { kind: "folds", k: 20 } }, "too_few_sources", /at least 20 sources/],
  ])("%s is a problem, not a table", (_, o, code, message) => {
    const r = buildTrainingSet({ records, sources, options: options(o) });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.problem.code).toBe(code);
      expect(r.problem.message).toMatch(message);
    }
  });

  test("records awaiting review are left out by default and counted", () => {
    const pending = exampleRecords(50, 4, 2, { status: "needs_review" });
    const r = buildTrainingSet({ records: pending, sources, options: options() });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problem.message).toMatch(/50 by status/);
    const included = buildTrainingSet({ records: pending, sources, options: options({ filters: { ...defaultExportOptions().filters, includeUnreviewed: true } }) });
    expect(included.ok).toBe(true);
  });
});
