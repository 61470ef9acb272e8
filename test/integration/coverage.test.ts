// Coverage and suggested experiments through the server layer, on a hand-built collection, on
// SQLite and on PostgreSQL: exact grid counts, filters, the window plane, property overrides, bad
// input, and suggestion sets that stay inside the limits, avoid existing records, land in sparse
// cells and reproduce — the same on both engines.
import { beforeAll, describe, expect, test } from "vitest";
import type { DatabaseEngine } from "@/lib/db/location";
import { sql } from "@/lib/db/sql";
import { axisEdges, binIndex } from "@/lib/domain/coverage-grid";
import { SUGGESTION_CAUTION } from "@/lib/domain/safety";
import { localActor, type Actor } from "@/lib/server/actor";
import { clearCoverageCache, coverageJson, getCoverage } from "@/lib/server/coverage";
import { COVERAGE_RECORDS, coverageFixture, createSourceOrThrow, FIXTURE_GRID } from "../support/coverage-fixture";
import { createSuggestionSet, getSuggestionSetView, suggestionSetCsv } from "@/lib/server/suggestions";
import { writeRecordsForTest } from "../support/engine-records";
import { describeEachEngine } from "../support/engines";

/** What each engine's block computed, compared across engines at the end. */
const results = new Map<DatabaseEngine, unknown>();

describeEachEngine("coverage and suggestions", (current) => {
  let actor: Actor;
  let sourceId: number;

  beforeAll(async () => {
    actor = await localActor();
    sourceId = await createSourceOrThrow(actor);
    await writeRecordsForTest(coverageFixture(sourceId), { actorId: actor.id });
  });

  describe("coverage of a hand-built selection", () => {
    test("grid counts are exact, per cell and per outcome", async () => {
      const r = await getCoverage({ alloy: "316L", hatch: "80-120um", layer: "30um", ...FIXTURE_GRID, k: 2 });
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      const d = r.data;
      expect(d.powerEdgesW).toEqual([100, 200, 300, 400]);
      expect(d.speedEdgesMmPerS).toEqual([500, 1000, 1500, 2000]);
      expect(d.counts).toEqual([
        [3, 0, 0],
        [1, 1, 0],
        [0, 0, 3],
      ]);
      expect(d.countsByOutcome.dense).toEqual([
        [2, 0, 0],
        [0, 1, 0],
        [0, 0, 0],
      ]);
      expect(d.countsByOutcome.balling).toEqual([
        [0, 0, 0],
        [0, 0, 0],
        [0, 0, 3],
      ]);
      expect(d.countsByOutcome.keyhole?.[0]?.[0]).toBe(1);
      expect(d.countsByOutcome.lack_of_fusion?.[1]?.[0]).toBe(1);
      expect([d.nRecords, d.nOnGrid, d.nOutsideGrid, d.nWithoutPowerOrSpeed]).toEqual([9, 8, 1, 0]);
      // k = 2: every cell below 2 is sparse; in-window flags come from the physics mask
      expect(d.sparseCells.map((c) => [c.powerIndex, c.speedIndex, c.count])).toEqual([
        [0, 1, 0], [0, 2, 0], [1, 2, 0], [2, 0, 0], [2, 1, 0], [1, 0, 1], [1, 1, 1],
      ]);
      expect(d.window).not.toBeNull();
      const mask = d.window!.mask;
      for (const c of d.sparseCells) expect(c.inWindow).toBe(mask[c.powerIndex]![c.speedIndex]);
      const windowCells = mask.flat().filter(Boolean).length;
      const covered = [[0, 0], [2, 2]].filter(([i, j]) => mask[i!]![j!]).length;
      expect(d.score).toMatchObject({ k: 2, windowCells, covered, share: windowCells ? covered / windowCells : null });
      expect(d.score.byOutcome.balling?.covered).toBe(mask[2]![2] ? 1 : 0);
    });

    test("filters: status, hatch and alloy", async () => {
      const reviewOnly = await getCoverage({ alloy: "316L", hatch: "80-120um", layer: "30um", status: "needs_review", ...FIXTURE_GRID });
      expect(reviewOnly.ok && reviewOnly.data.counts[2]![2]).toBe(2); // the draft record drops out
      const anyHatch = await getCoverage({ alloy: "316L", layer: "30um", ...FIXTURE_GRID });
      expect(anyHatch.ok && anyHatch.data.counts[0]![0]).toBe(4); // the 200 µm hatch record comes in
      const all = await getCoverage({ ...FIXTURE_GRID });
      expect(all.ok && all.data.nRecords).toBe(12);
      expect(all.ok && all.data.window).toBeNull();
      expect(all.ok && all.data.windowUnavailable).toMatch(/choose one alloy/);
    });

    test("the window plane comes from the filters, else the selection's median", async () => {
      const r = await getCoverage({ alloy: "316L", hatch: "80-120um", layer: "30um", ...FIXTURE_GRID });
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      expect([r.data.window?.hatchSpacingUm, r.data.window?.layerThicknessUm, r.data.window?.spotDiameterUm]).toEqual([100, 30, 80]);
      expect(r.data.window?.basis).toEqual({ hatch: "filter", layer: "filter", spot: "median of the selection" });
      expect(r.data.window?.boundaries.map((b) => b.mechanism)).toEqual(["lack_of_fusion", "keyhole", "balling"]);
      const chosen = await getCoverage({ alloy: "316L", windowHatch: "0.12mm", ...FIXTURE_GRID });
      expect(chosen.ok && chosen.data.window?.hatchSpacingUm).toBe(120);
      expect(chosen.ok && chosen.data.window?.basis.hatch).toBe("chosen");
    });

    test("the command-line JSON carries the documented keys", async () => {
      const r = await getCoverage({ alloy: "316L", hatch: "80-120um", layer: "30um", ...FIXTURE_GRID, k: 2 });
      if (!r.ok) throw new Error(r.error.message);
      const j = coverageJson(r.data);
      for (const key of ["power_w_edges", "speed_mm_s_edges", "counts", "sparse_cells", "score", "n_records"]) expect(j).toHaveProperty(key);
      expect(j.sparse_cells[0]).toEqual({ power_index: 0, speed_index: 1, power_w: [100, 200], speed_mm_s: [1000, 1500], count: 0, in_window: r.data.window!.mask[0]![1] });
    });

    test("an empty selection is explained, not drawn", async () => {
      const r = await getCoverage({ alloy: "316L", hatch: "500um" });
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      expect(r.data.empty).toBe(true);
      expect(r.data.emptyReason).toMatch(/No records match \(alloy 316L, .*hatch 500um\)/);
      expect(r.data.counts).toEqual([]);
    });

    test.each<[Record<string, string>, string, RegExp]>([
      [{ power: "400-100W" }, "power", /swap them/],
      [{ hatch: "wide" }, "hatch", /Cannot read .wide./],
      [{ layer: "40-20um" }, "layer", /swap them/],
      [{ k: "many" }, "k", /whole number/],
    ])("bad filters come back as field errors: %j", async (input, field, message) => {
      const r = await getCoverage(input);
      expect(r.ok).toBe(false);
      if (r.ok) return;
      expect(r.error.code).toBe("invalid_input");
      expect(r.error.details?.fieldErrors?.[field]?.join(" ")).toMatch(message);
    });
  });

  describe("suggestion sets", () => {
    const request = { alloy: "316L", n: 8, power: "100-400W", speed: "500-2000mm/s", hatch: "100um", layer: "30um", seed: 7, k: 2, powerBins: 6, speedBins: 6, speedScale: "linear" };

    test("inside the limits, not repeating a record, in cells holding fewer than k, stored and reproducible", async () => {
      const r = await createSuggestionSet(request, actor);
      if (!r.ok) throw new Error(JSON.stringify(r.error));
      const set = r.data;
      expect(set.seed).toBe(7);
      expect(set.suggestions.length).toBeGreaterThan(0);
      const plane = COVERAGE_RECORDS.filter((x) => x.alloy === "316L" && x.hatchUm === 100 && x.layerUm === 30);
      const pe = axisEdges({ min: 100, max: 400, bins: 6, scale: "linear" });
      const ve = axisEdges({ min: 500, max: 2000, bins: 6, scale: "linear" });
      for (const s of set.suggestions) {
        expect(s.laserPowerW).toBeGreaterThanOrEqual(100);
        expect(s.laserPowerW).toBeLessThanOrEqual(400);
        expect(s.scanSpeedMmPerS).toBeGreaterThanOrEqual(500);
        expect(s.scanSpeedMmPerS).toBeLessThanOrEqual(2000);
        expect([s.hatchSpacingUm, s.layerThicknessUm]).toEqual([100, 30]);
        expect(s.predictedRegime).toBe("dense");
        expect(s.reason).toMatch(/fewer than k = 2/);
        const inCell = plane.filter((x) => binIndex(pe, x.powerW) === binIndex(pe, s.laserPowerW) && binIndex(ve, x.speedMmPerS) === binIndex(ve, s.scanSpeedMmPerS));
        expect(inCell.length).toBeLessThan(2);
        for (const x of plane) {
          const nearDuplicate = Math.abs(x.powerW - s.laserPowerW) <= Math.max(2, 0.01 * x.powerW) && Math.abs(x.speedMmPerS - s.scanSpeedMmPerS) <= 0.01 * x.speedMmPerS;
          expect(nearDuplicate).toBe(false);
        }
      }
      const stored = await getSuggestionSetView(set.id);
      expect(stored.ok && stored.data.suggestions).toEqual(set.suggestions);
      expect(stored.ok && stored.data.inputs.request.seed).toBe(7);
      const again = await createSuggestionSet(request, actor);
      expect(again.ok && again.data.suggestions).toEqual(set.suggestions);
      expect(again.ok && again.data.id).not.toBe(set.id);
      expect(again.ok && again.data.inputs.data).toEqual(set.inputs.data);
    });

    test("a set without a seed gets one and keeps it", async () => {
      const { seed: _seed, ...noSeed } = request;
      const r = await createSuggestionSet(noSeed, actor, () => 123_456);
      expect(r.ok && r.data.seed).toBe(123_456);
    });

    test("the CSV starts with the safety caution and lists every suggestion", async () => {
      const r = await createSuggestionSet(request, actor);
      if (!r.ok) throw new Error(r.error.message);
      const lines = suggestionSetCsv(r.data).split("\r\n");
      expect(lines.slice(0, SUGGESTION_CAUTION.length)).toEqual(SUGGESTION_CAUTION.map((l) => `# ${l}`));
      expect(lines.find((l) => l.startsWith("index,"))).toBe("index,alloy,laser_power_w,scan_speed_mm_s,hatch_spacing_um,layer_thickness_um,spot_diameter_um,volumetric_energy_j_mm3,predicted_regime,criteria_past_threshold,cell_power_w,cell_speed_mm_s,cell_records,reason");
      expect(lines.filter((l) => /^\d+,316L,/.test(l))).toHaveLength(r.data.suggestions.length);
    });

    test.each<[Record<string, unknown>, string, RegExp]>([
      [{ power: "400-100W" }, "power", /minimum laser power \(400\) is above the maximum \(100\): swap them/],
      [{ power: "-100-400W" }, "power", /Laser power must be greater than 0 W; got -100 W/],
      [{ speed: "2000-500mm/s" }, "speed", /swap them/],
      [{ hatch: "0um" }, "hatch", /greater than 0 µm/],
    ])("impossible limits get a clear message: %j", async (change, field, message) => {
      const r = await createSuggestionSet({ ...request, ...change }, actor);
      expect(r.ok).toBe(false);
      if (r.ok) return;
      expect(r.error.code).toBe("invalid_input");
      expect(r.error.details?.fieldErrors?.[field]?.join(" ")).toMatch(message);
    });
  });

  describe("alloy property overrides", () => {
    test("a reviewer's override moves the window; an unusable value is left out", async () => {
      const query = { alloy: "316L", hatch: "80-120um", layer: "30um", ...FIXTURE_GRID, powerBins: "12", speedBins: "12" };
      const before = await getCoverage(query);
      if (!before.ok) throw new Error(before.error.message);
      const at = new Date("2026-11-30T10:00:00.000Z");
      const override = `INSERT INTO "AlloyPropertyOverride" ("alloyKey", "property", "value", "source", "createdAt") VALUES (?, ?, ?, ?, ?)`;
      // an absorptivity above 1 cannot be: skipped, the window stays as it was
      await sql().run(override, ["316L", "absorptivity", 1.5, "invented note", at]);
      clearCoverageCache();
      const skipped = await getCoverage(query);
      expect(skipped.ok && skipped.data.window?.mask).toEqual(before.data.window?.mask);
      await sql().run(override, ["316L", "k_w_m_k", 60, "invented measurement", at]);
      const moved = await getCoverage(query);
      if (!moved.ok) throw new Error(moved.error.message);
      expect(moved.data.window?.mask).not.toEqual(before.data.window?.mask);
      // another alloy's window is not touched
      const other = await getCoverage({ ...query, alloy: "IN718" });
      expect(other.ok && other.data.window).not.toBeNull();
    });
  });

  test("the same collection gives the same coverage and suggestions on both engines", async () => {
    const reports = [];
    for (const q of [{ alloy: "316L", hatch: "80-120um", layer: "30um", ...FIXTURE_GRID, k: 2 }, { ...FIXTURE_GRID }, { alloy: "IN718" }]) {
      const r = await getCoverage(q);
      if (!r.ok) throw new Error(r.error.message);
      reports.push({ json: coverageJson(r.data), points: r.data.points, bySource: r.data.bySource, histograms: r.data.histograms });
    }
    const set = await createSuggestionSet({ alloy: "316L", n: 8, power: "100-400W", speed: "500-2000mm/s", hatch: "100um", layer: "30um", seed: 3, k: 2 }, actor);
    if (!set.ok) throw new Error(set.error.message);
    const mine = { reports, suggestions: set.data.suggestions, data: set.data.inputs.data };
    expect(mine.suggestions.length).toBeGreaterThan(0);
    results.set(current().engine, mine);
    // the PostgreSQL block runs after the SQLite one and compares with what it computed
    if (current().engine === "postgresql") expect(mine).toEqual(results.get("sqlite"));
  });
});
