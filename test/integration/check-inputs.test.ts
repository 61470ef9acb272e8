// What the checks load and write (lib/db/check-inputs.ts), on both engines with the same test. The
// rows are written with each engine's own driver; every expectation is worked out from those rows.
import { beforeAll, expect, test } from "vitest";
import { loadCheckRecords, loadPropertyOverrides, loadSourceAttributes, recordKeys, reopenAcceptedRecords, writeQualityScores } from "@/lib/db/check-inputs";
import { sql } from "@/lib/db/sql";
import { describeEachEngine, insertRows, type TableRows } from "../support/engines";

const AT = "2026-11-30T08:00:00.000Z";
// 316L holds most records (a load by alloy scans the table), IN718 a few (index lookups), one
// Ti-6Al-4V record is rejected and one 316L record merged: neither is checked. 4,200 records, so
// a full scan takes two reads (4,096 records each) and the lists of ids cross the 500-id chunks and
// the 1,000-row write batches.
const N_316L = 4_151;
const N_IN718 = 48;
const RECORDS = [
  ...Array.from({ length: N_316L }, (_, i) => ({ alloyKey: "316L", materialId: 1, laserPowerW: 150 + (i % 200), status: i === 7 ? "merged" : i % 10 === 0 ? "accepted" : "needs_review" })),
  ...Array.from({ length: N_IN718 }, (_, i) => ({ alloyKey: "IN718", materialId: 2, laserPowerW: 250 + i, status: "needs_review" })),
  { alloyKey: "Ti-6Al-4V", materialId: 3, laserPowerW: 300, status: "rejected" },
].map((r, i) => ({
  id: i + 1,
  sourceId: (i % 2) + 1,
  ...r,
  scanSpeedMmPerS: 800 + i,
  // every third record has an assumed spot size
  enteredValues: i % 3 === 0 ? JSON.stringify({ spotDiameter: { text: "80", unit: "µm", provenance: "assumed" } }) : JSON.stringify({ laserPower: { text: String(r.laserPowerW), unit: "W", provenance: "reported" } }),
  qualityScore: i % 4 === 0 ? null : 0.5,
  updatedAt: AT,
}));
const ACTIVE = RECORDS.filter((r) => r.status !== "rejected" && r.status !== "merged");
const TABLES: TableRows[] = [
  [
    "Source",
    [
      { id: 1, kind: "journal_article", title: "Invented study of stainless steel", titleKey: "invented study of stainless steel", densityMethod: "archimedes", outcomeEvidence: "micrographs", machineStated: 1, powderReported: 0, atmosphereReported: 1, qualityOverride: null, updatedAt: AT },
      { id: 2, kind: "thesis", title: "Invented thesis on nickel alloys", titleKey: "invented thesis on nickel alloys", densityMethod: "ct", outcomeEvidence: "density_only", machineStated: 0, powderReported: 1, atmosphereReported: 0, qualityOverride: 0.3, qualityOverrideReason: "figures only", updatedAt: AT },
    ],
  ],
  [
    "Material",
    [
      { id: 1, designation: "316L", alloyKey: "316L", basis: "wt", fingerprint: "m1" },
      { id: 2, designation: "IN718", alloyKey: "IN718", basis: "wt", fingerprint: "m2" },
      { id: 3, designation: "Ti-6Al-4V", alloyKey: "Ti-6Al-4V", basis: "at", fingerprint: "m3" },
    ],
  ],
  [
    "MaterialComponent",
    [
      { id: 1, materialId: 1, element: "Fe", amount: 0, isBalance: 1 },
      { id: 2, materialId: 1, element: "Cr", amount: 17, isBalance: 0 },
      { id: 3, materialId: 1, element: "Ni", amount: 12, isBalance: 0 },
      { id: 4, materialId: 2, element: "Ni", amount: 0, isBalance: 1 },
      { id: 5, materialId: 2, element: "Nb", amount: 5.1, isBalance: 0 },
    ],
  ],
  ["BuildRecord", RECORDS],
  [
    "AlloyPropertyOverride",
    [
      { id: 1, alloyKey: "316L", property: "k_w_m_k", value: 16.2, source: "invented handbook, table 3" },
      { id: 2, alloyKey: "316L", property: "absorptivity", value: 1.4, source: "a typo: above 1" },
      { id: 3, alloyKey: "IN718", property: "densityKgPerM3", value: 8190, source: "invented datasheet" },
      { id: 4, alloyKey: "IN718", property: "colour", value: 3, source: "not a property" },
    ],
  ],
];

describeEachEngine("check inputs", (current) => {
  beforeAll(async () => {
    await insertRows(current(), TABLES);
  });

  const idsOf = async (alloys: string[] | "all") => (await loadCheckRecords(sql(), alloys)).map((r) => r.id);
  const idsWhere = (match: (r: (typeof RECORDS)[number]) => boolean) => ACTIVE.filter(match).map((r) => r.id);

  test("by alloys gives the same active records in id order whether it scans the table (most records asked for) or uses the index (few)", async () => {
    expect(await idsOf(["316L"])).toEqual(idsWhere((r) => r.alloyKey === "316L")); // most of the active records: one scan, filtered
    expect(await idsOf(["IN718"])).toEqual(idsWhere((r) => r.alloyKey === "IN718")); // a few: index lookups
    expect(await idsOf(["IN718", "316L"])).toEqual(ACTIVE.map((r) => r.id));
    expect(await idsOf(["Ti-6Al-4V"])).toEqual([]); // rejected records are not checked
    expect(await idsOf([])).toEqual([]);
    expect(await idsOf("all")).toEqual(ACTIVE.map((r) => r.id));
    expect(await idsOf("all")).not.toContain(8); // the merged one
  });

  test("a loaded record carries its values, its material's composition and whether every entered value was reported", async () => {
    const loaded = await loadCheckRecords(sql(), ["316L", "IN718"]);
    const byId = new Map(loaded.map((r) => [r.id, r]));
    for (const id of [1, 2, 4, 4_097, N_316L + 1]) {
      const row = RECORDS[id - 1]!;
      const r = byId.get(id)!;
      expect([r.alloyKey, r.laserPowerW, r.scanSpeedMmPerS, r.status, r.qualityScore, r.sourceId]).toEqual([row.alloyKey, row.laserPowerW, row.scanSpeedMmPerS, row.status, row.qualityScore, row.sourceId]);
      expect(r.enteredAllReported).toBe((id - 1) % 3 !== 0);
      expect(r.entered).toEqual(JSON.parse(row.enteredValues));
    }
    expect(byId.get(1)!.components).toEqual([
      { element: "Cr", amount: 17, isBalance: false },
      { element: "Fe", amount: 0, isBalance: true },
      { element: "Ni", amount: 12, isBalance: false },
    ]);
    expect(byId.get(N_316L + 1)!.components).toEqual([
      { element: "Nb", amount: 5.1, isBalance: false },
      { element: "Ni", amount: 0, isBalance: true },
    ]);
    expect(byId.get(1)!.compositionBasis).toBe("wt");
  });

  test("recordKeys answers the same for consecutive ids (one range query) and scattered ones, rejected records included", async () => {
    const many = Array.from({ length: RECORDS.length + 20 }, (_, i) => i + 1); // consecutive, past the last record
    const keys = await recordKeys(sql(), many);
    expect(keys.map((k) => k.id)).toEqual(RECORDS.map((r) => r.id));
    expect(keys.at(-1)).toEqual({ id: RECORDS.length, alloyKey: "Ti-6Al-4V", status: "rejected" });
    const scattered = Array.from({ length: 700 }, (_, i) => 1 + i * 2).filter((id) => id <= RECORDS.length); // not consecutive, more than one chunk
    expect((await recordKeys(sql(), scattered)).map((k) => [k.id, k.alloyKey, k.status])).toEqual(scattered.map((id) => [id, RECORDS[id - 1]!.alloyKey, RECORDS[id - 1]!.status]));
  });

  test("source attributes come back with booleans and the override", async () => {
    const sources = await loadSourceAttributes(sql(), [2, 1, 99]);
    expect([...sources.keys()].sort()).toEqual([1, 2]);
    expect(sources.get(1)).toMatchObject({ kind: "journal_article", densityMethod: "archimedes", outcomeEvidence: "micrographs", machineStated: true, powderReported: false, atmosphereReported: true, qualityOverride: null });
    expect(sources.get(2)).toMatchObject({ kind: "thesis", machineStated: false, powderReported: true, atmosphereReported: false, qualityOverride: 0.3, qualityOverrideReason: "figures only" });
    expect((await loadSourceAttributes(sql(), "all")).size).toBe(2);
    expect((await loadSourceAttributes(sql(), [])).size).toBe(0);
  });

  test("property overrides: column spellings and domain names are read, unknown names and unusable values skipped", async () => {
    const overrides = await loadPropertyOverrides(sql());
    expect(overrides.get("316L")).toEqual({ thermalConductivityWPerMK: { value: 16.2, source: "invented handbook, table 3" } });
    expect(overrides.get("IN718")).toEqual({ densityKgPerM3: { value: 8190, source: "invented datasheet" } });
  });

  test("quality scores and the reopening of accepted records are written in the caller's transaction", async () => {
    const scores = ACTIVE.map((r) => [r.id, Math.round(r.id * 7) / 10_000] as const);
    const reopened = await sql().transaction(async (tx) => {
      await writeQualityScores(tx, scores);
      return reopenAcceptedRecords(tx, [21, 11, 12, 1], AT);
    });
    expect(reopened).toEqual([1, 11, 21]); // 12 was not accepted
    const rows = await sql().all<{ id: number; qualityScore: number; status: string; version: number }>(`SELECT "id", "qualityScore" AS "qualityScore", "status", "version" FROM "BuildRecord" ORDER BY "id"`);
    const byId = new Map(rows.map((r) => [r.id, r]));
    for (const [id, q] of scores) expect(byId.get(id)!.qualityScore).toBe(q);
    expect(byId.get(RECORDS.length)!.qualityScore).toBe(RECORDS.at(-1)!.qualityScore); // the rejected record was not given a score
    expect([1, 11, 12, 21].map((id) => [byId.get(id)!.status, byId.get(id)!.version])).toEqual([["needs_review", 2], ["needs_review", 2], ["needs_review", 1], ["needs_review", 2]]);
    // a rolled-back transaction writes nothing
    await expect(sql().transaction(async (tx) => {
      await writeQualityScores(tx, [[2, 0.99]]);
      throw new Error("stop");
    })).rejects.toThrow("stop");
    expect((await sql().get<{ q: number }>(`SELECT "qualityScore" AS q FROM "BuildRecord" WHERE "id" = 2`))!.q).toBe(scores[1]![1]);
  });
});
