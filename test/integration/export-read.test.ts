// What an export reads, on both engines with the same rows written by each engine's own driver:
// records in id order with their material's composition, timestamps in one canonical form whatever
// form they were stored in, the counts of what the query leaves out, sources with their authors,
// and export-run names matched exactly (no LIKE wildcards).
import { beforeAll, expect, test } from "vitest";
import { countExportCandidates, countRecords, exportRunNamesLike, insertExportRun, loadExportRecords, loadExportSources } from "@/lib/db/exports";
import { sql } from "@/lib/db/sql";
import { describeEachEngine, insertRows, type TableRows } from "../support/engines";

// The forms a timestamp is stored in on SQLite: Prisma's adapter ("+00:00"), the bulk paths ("Z"),
// a column default ("YYYY-MM-DD HH:MM:SS"); PostgreSQL reads each of them into TIMESTAMP(3).
const STORED = ["2026-11-30T09:15:00.250+00:00", "2026-11-30T09:15:00.250Z", "2026-11-30 09:15:00"];
const CANONICAL = ["2026-11-30T09:15:00.250Z", "2026-11-30T09:15:00.250Z", "2026-11-30T09:15:00.000Z"];

const RECORDS = Array.from({ length: 9 }, (_, i) => ({
  id: i + 1,
  sourceId: (i % 2) + 1,
  materialId: i % 3 === 2 ? 2 : 1,
  alloyKey: i % 3 === 2 ? "invented-alloy" : "316L",
  status: i % 4 === 3 ? "needs_review" : "accepted",
  outcome: "dense",
  laserPowerW: 150 + i * 10,
  scanSpeedMmPerS: 800,
  relativeDensityPct: i === 4 ? null : 99.1,
  createdAt: STORED[i % 3]!,
  updatedAt: STORED[(i + 1) % 3]!,
}));

const TABLES: TableRows[] = [
  ["Source", [
    { id: 1, kind: "journal_article", title: "Invented study one", titleKey: "invented study one", authors: JSON.stringify(["A. Placeholder", "B. Example"]), year: 2021, doi: "10.5555/read.1", updatedAt: STORED[0]! },
    { id: 2, kind: "report", title: "Invented report two", titleKey: "invented report two", authors: "not json", year: null, doi: null, updatedAt: STORED[0]! },
  ]],
  ["Material", [
    { id: 1, designation: "SS316L", alloyKey: "316L", basis: "wt", fingerprint: "read-m1" },
    { id: 2, designation: "invented", alloyKey: "invented-alloy", basis: "at", fingerprint: "read-m2" },
  ]],
  ["MaterialComponent", [
    { id: 1, materialId: 1, element: "Fe", amount: 0, isBalance: 1 },
    { id: 2, materialId: 1, element: "Cr", amount: 17, isBalance: 0 },
    { id: 3, materialId: 1, element: "Ni", amount: 12, isBalance: 0 },
  ]],
  ["BuildRecord", RECORDS],
];

describeEachEngine("export reads", (current) => {
  beforeAll(async () => {
    // booleans as the engine's driver takes them: 1/0 in SQLite, true/false in PostgreSQL
    const tables = TABLES.map(([t, rows]): TableRows => [t, t === "MaterialComponent" && current().engine === "postgresql" ? rows.map((r) => ({ ...r, isBalance: r.isBalance === 1 ? "true" : "false" })) : rows]);
    await insertRows(current(), tables);
  });

  test("records in id order, narrowed by status, alloy and source, with compositions and canonical timestamps", async () => {
    const all = await loadExportRecords(sql(), { statuses: ["accepted", "needs_review"], alloys: [], sourceIds: [] });
    expect(all.map((r) => r.id)).toEqual(RECORDS.map((r) => r.id));
    expect(all.map((r) => r.createdAt)).toEqual(RECORDS.map((_, i) => CANONICAL[i % 3]));
    expect(all.map((r) => r.updatedAt)).toEqual(RECORDS.map((_, i) => CANONICAL[(i + 1) % 3]));
    expect(all[0]!.composition).toEqual({ basis: "wt", components: [{ element: "Cr", amount: 17, isBalance: false }, { element: "Fe", amount: 0, isBalance: true }, { element: "Ni", amount: 12, isBalance: false }] });
    // one shared object per material; a material without components has no composition
    expect(all[1]!.composition).toBe(all[0]!.composition);
    expect(all[2]!.composition).toBeNull();
    expect(all[4]!.relativeDensityPct).toBeNull();
    expect(all[3]).toMatchObject({ id: 4, sourceId: 2, alloyKey: "316L", status: "needs_review", laserPowerW: 180, scanSpeedMmPerS: 800, hatchSpacingUm: null, qualityScore: null });

    // read a page at a time: pages of 2 and of 4 give the same records as one page
    const q = { statuses: ["accepted", "needs_review"], alloys: [], sourceIds: [] };
    expect(await sql().transaction((tx) => loadExportRecords(tx, q, 2), { readOnly: true })).toEqual(all);
    expect(await loadExportRecords(sql(), { ...q, statuses: ["accepted"] }, 4)).toEqual(all.filter((r) => r.status === "accepted"));

    const narrowed = await loadExportRecords(sql(), { statuses: ["accepted"], alloys: ["316L"], sourceIds: [1] }, 1);
    const expected = RECORDS.filter((r) => r.status === "accepted" && r.alloyKey === "316L" && r.sourceId === 1).map((r) => r.id);
    expect(narrowed.map((r) => r.id)).toEqual(expected);
    expect(expected.length).toBeGreaterThan(1);
  });

  test("counts of the collection and of the records an export's statuses and alloys let through", async () => {
    expect(await countRecords(sql())).toBe(RECORDS.length);
    expect(await countExportCandidates(sql(), ["accepted"], [])).toBe(RECORDS.filter((r) => r.status === "accepted").length);
    expect(await countExportCandidates(sql(), ["accepted"], ["invented-alloy"])).toBe(RECORDS.filter((r) => r.status === "accepted" && r.alloyKey === "invented-alloy").length);
    expect(await countExportCandidates(sql(), [], [])).toBe(0);
  });

  test("sources with their authors; an unreadable authors column is no authors", async () => {
    const sources = await loadExportSources(sql());
    expect(sources.map((s) => [s.id, s.authors, s.year, s.doi])).toEqual([
      [1, ["A. Placeholder", "B. Example"], 2021, "10.5555/read.1"],
      [2, [], null, null],
    ]);
  });

  test("run names are matched by their exact prefix: _ and . are not wildcards", async () => {
    const at = new Date("2026-11-30T10:00:00.000Z");
    for (const name of ["a_b", "a_b-2", "axb", "a.b", "A_B"]) {
      await sql().transaction((tx) => insertExportRun(tx, { name, params: {}, seed: 1, counts: {}, files: {}, toolVersion: "0.0.0", createdById: null, at }));
    }
    expect(await exportRunNamesLike(sql(), "a_b")).toEqual(["a_b", "a_b-2"]);
    expect(await exportRunNamesLike(sql(), "a.")).toEqual(["a.b"]);
  });
});
