// The records table page (listRecords) on both engines with the same test: filters, ranges,
// case-insensitive search, sorting with missing values, paging and the total. The records are
// written with each engine's own driver; every expected page is computed from the same rows in
// plain JavaScript (SQLite's order: missing values first ascending, last descending; id breaks ties).
import { beforeAll, expect, test } from "vitest";
import { listRecords } from "@/lib/server/records";
import { getRecordsBrowser } from "@/lib/server/records-facets";
import { describeEachEngine, insertRows, type TableRows } from "../support/engines";

const AT = "2026-11-29T12:00:00.000Z";
const SOURCES = [
  { id: 1, title: "Invented density map of a stainless steel across its process window, Lab of Fusion Trials", year: 2020 },
  { id: 2, title: "Invented note without a year", year: null },
];
const ALLOYS = ["316L", "Ti-6Al-4V", "AlSi10Mg"];
const RECORDS = Array.from({ length: 23 }, (_, i) => ({
  id: i + 1,
  sourceId: (i % 3) + 1 > 2 ? 2 : (i % 3) + 1,
  alloyKey: ALLOYS[i % 3]!,
  status: i % 4 === 0 ? "accepted" : "needs_review",
  outcome: i % 5 === 0 ? "keyhole" : "dense",
  // every fourth record has no power: the sort must place it as SQLite does on both engines
  laserPowerW: i % 4 === 1 ? null : 150 + ((i * 37) % 200),
  machine: i % 2 ? `Invented Printer M${i}` : null,
  locationLabel: i % 6 === 0 ? `Table ${i}` : null,
  updatedAt: new Date(Date.parse(AT) + i * 1000).toISOString(),
}));
const TABLES: TableRows[] = [
  ["Source", SOURCES.map((s) => ({ ...s, kind: "article", titleKey: s.title.toLowerCase(), updatedAt: AT }))],
  ["Material", [{ id: 1, designation: "invented", alloyKey: "mixed", fingerprint: "m1" }]],
  ["BuildRecord", RECORDS.map((r) => ({ ...r, materialId: 1 }))],
];

type Rec = (typeof RECORDS)[number];
function expectedPage(match: (r: Rec) => boolean, sort: "id" | "laserPowerW", direction: "asc" | "desc", page: number, pageSize: number) {
  const sign = direction === "asc" ? 1 : -1;
  const key = (r: Rec) => (sort === "id" ? r.id : r.laserPowerW);
  const matching = RECORDS.filter(match).sort((a, b) => {
    const ka = key(a);
    const kb = key(b);
    // NULL is the smallest value, as SQLite orders it
    const byKey = ka === kb ? 0 : ka === null ? -1 : kb === null ? 1 : ka - kb;
    return sign * (byKey || a.id - b.id);
  });
  return { total: matching.length, ids: matching.slice(page * pageSize, (page + 1) * pageSize).map((r) => r.id) };
}

describeEachEngine("records table page", (current) => {
  beforeAll(async () => {
    await insertRows(current(), TABLES);
  });

  async function page(query: Record<string, unknown>) {
    const result = await listRecords(query);
    if (!result.ok) throw new Error(`listRecords failed: ${JSON.stringify(result.error)}`);
    return { total: result.data.total, ids: result.data.rows.map((r) => r.id), rows: result.data.rows };
  }

  test.each([
    ["asc", 0],
    ["asc", 1],
    ["desc", 0],
    ["desc", 2],
  ] as const)("sorted by a column with missing values, %s, page %i", async (direction, n) => {
    const got = await page({ sort: "laserPowerW", direction, page: n, pageSize: 5 });
    expect({ total: got.total, ids: got.ids }).toEqual(expectedPage(() => true, "laserPowerW", direction, n, 5));
  });

  test("filters by alloy, status and a power range together, with the total of all matching", async () => {
    const got = await page({ alloy: ["316L", "AlSi10Mg"], status: ["needs_review"], ranges: { laserPowerW: { min: 180, max: 330 } }, sort: "id", direction: "desc", pageSize: 3 });
    const match = (r: Rec) => ["316L", "AlSi10Mg"].includes(r.alloyKey) && r.status === "needs_review" && r.laserPowerW !== null && r.laserPowerW >= 180 && r.laserPowerW <= 330;
    expect({ total: got.total, ids: got.ids }).toEqual(expectedPage(match, "id", "desc", 0, 3));
    expect(got.total).toBeGreaterThan(3);
  });

  test("search ignores case and finds alloy, machine or location", async () => {
    const got = await page({ search: "printer m1", sort: "id", direction: "asc", pageSize: 100 });
    expect(got.ids).toEqual(RECORDS.filter((r) => r.machine?.toLowerCase().includes("printer m1")).map((r) => r.id));
    const byAlloy = await page({ search: "ti-6al", sort: "id", direction: "asc", pageSize: 100 });
    expect(byAlloy.ids).toEqual(RECORDS.filter((r) => r.alloyKey === "Ti-6Al-4V").map((r) => r.id));
  });

  test("a %, _ or backslash in the search is a character, not a wildcard or an escape", async () => {
    expect((await page({ search: "%", pageSize: 100 })).total).toBe(0);
    expect((await page({ search: "_", pageSize: 100 })).total).toBe(0);
    // unescaped, "M\\1" would mean "M1" and find the M1x printers
    expect((await page({ search: "M1", pageSize: 100 })).total).toBeGreaterThan(0);
    expect((await page({ search: "M\\1", pageSize: 100 })).total).toBe(0);
  });

  test("the records page's first render: alloy choices sorted, every source offered, the requested page", async () => {
    const result = await getRecordsBrowser({ alloy: ["AlSi10Mg"], sort: "id", direction: "asc", pageSize: 4 });
    if (!result.ok) throw new Error(`getRecordsBrowser failed: ${JSON.stringify(result.error)}`);
    expect(result.data.facets.alloys).toEqual([...new Set(RECORDS.map((r) => r.alloyKey))].sort());
    expect(result.data.facets.sources.map((s) => s.id).sort()).toEqual(SOURCES.map((s) => s.id).sort());
    expect(result.data.page?.rows.map((r) => r.id)).toEqual(expectedPage((r) => r.alloyKey === "AlSi10Mg", "id", "asc", 0, 4).ids);
  });

  test("rows carry their values, the source's label and the update time as ISO UTC", async () => {
    const got = await page({ sourceId: [2], sort: "id", direction: "asc", pageSize: 1 });
    const r = RECORDS.find((x) => x.sourceId === 2)!;
    expect(got.rows[0]).toMatchObject({ id: r.id, alloyKey: r.alloyKey, laserPowerW: r.laserPowerW, machine: r.machine, status: r.status, updatedAt: r.updatedAt, sourceLabel: `n.d. · ${SOURCES[1]!.title}` });
    const first = await page({ sourceId: [1], sort: "id", direction: "asc", pageSize: 1 });
    expect(first.rows[0]!.sourceLabel).toBe(`2020 · ${SOURCES[0]!.title.slice(0, 59)}…`);
  });

  test("a page past the last row is empty and still carries the total; a filter matching nothing gives 0", async () => {
    const past = await page({ sort: "id", direction: "asc", page: 50, pageSize: 10 });
    expect({ total: past.total, ids: past.ids }).toEqual({ total: RECORDS.length, ids: [] });
    const none = await page({ alloy: ["IN718"], pageSize: 10 });
    expect({ total: none.total, ids: none.ids }).toEqual({ total: 0, ids: [] });
  });
});
