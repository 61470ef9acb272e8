/**
 * Use case: coverage of the power–speed plane for a selection of records — the count grid with its
 * sparse cells, the process window and its boundaries for one hatch, layer and spot, the coverage
 * score, the distributions of hatch, layer, spot and E_v, counts per outcome and per source, and a
 * sample of points for the scatter plot.
 */
import { resolveAlloyProperties } from "../domain/alloy-properties";
import { settingOf } from "../domain/check-settings";
import { resolveAlloy } from "../domain/alloys";
import {
  axisEdges,
  chooseScale,
  countGrid,
  coverageScore,
  niceAxis,
  scatterSample,
  sparseCells,
  windowMask,
  type AxisScale,
  type AxisSpec,
  type CoverageScore,
  type SparseCell,
} from "../domain/coverage-grid";
import { histogram, tally, type Histogram } from "../domain/histogram";
import { materialFromProperties } from "../domain/meltpool-analysis";
import { OUTCOMES } from "../domain/outcomes";
import { PLAUSIBLE_RANGES } from "../domain/units";
import { assessPoint, windowBoundaries, windowSettingsFromChecks, type WindowBoundary, type WindowCase, type WindowMargins } from "../domain/process-window";
import { loadPropertyOverrides } from "../db/check-inputs";
import { selectCoveragePoints, sourceTitles, type SelectionColumns } from "../db/coverage";
import { distinctAlloys } from "../db/records";
import { sql, type SqlExecutor } from "../db/sql";
import { coverageQuerySchema, type CoverageQuery, type RangeFilter } from "../schemas/coverage";
import { currentCheckSettings, type SettingsVersionInfo } from "./check-settings";
import { DEFAULT_AMBIENT_TEMPERATURE_K } from "./meltpool";
import { sourceOptionLabel } from "./records-facets";
import { guard, invalid, nulRefusal, ok, type AppError, type Result } from "./result";

/** Where the hatch, layer or spot of the window plane came from. */
export type PlaneValueBasis = "chosen" | "filter" | "median of the selection" | "default";

/**
 * The plane drawn when nothing else says which: values common in LPBF of steels and Ni alloys
 * (common practice, from memory); shown with their basis so nobody mistakes them for data.
 */
export const DEFAULT_WINDOW_PLANE = { hatchSpacingUm: 100, layerThicknessUm: 30, spotDiameterUm: 80 } as const;

/** Most points sent to the scatter plot; thin cells always keep all of theirs. */
export const SCATTER_POINT_LIMIT = 6000;

export interface CoverageWindow {
  alloyKey: string;
  alloyName: string;
  hatchSpacingUm: number;
  layerThicknessUm: number;
  spotDiameterUm: number;
  basis: { hatch: PlaneValueBasis; layer: PlaneValueBasis; spot: PlaneValueBasis };
  ambientTemperatureK: number;
  /** mask[i][j]: the centre of power bin i, speed bin j is inside the window. */
  mask: boolean[][];
  boundaries: WindowBoundary[];
  margins: WindowMargins;
  settingsVersion: number;
  propertiesBasis: string;
  notes: string[];
}

export interface CoverageReport {
  query: CoverageQuery;
  /** Records in the selection, with or without power and speed. */
  nRecords: number;
  /** Records with power and speed inside the grid. */
  nOnGrid: number;
  nWithoutPowerOrSpeed: number;
  /** Records with power and speed outside the grid (outside the range asked for, or implausible values outside the default range). */
  nOutsideGrid: number;
  /** True when the selection holds no record with power and speed; `emptyReason` says why. */
  empty: boolean;
  emptyReason: string | null;
  powerAxis: AxisSpec | null;
  speedAxis: AxisSpec | null;
  powerEdgesW: number[];
  speedEdgesMmPerS: number[];
  counts: number[][];
  countsByOutcome: Record<string, number[][]>;
  sparseCells: SparseCell[];
  window: CoverageWindow | null;
  /** Why no window is drawn (no single alloy chosen, no properties, ...). */
  windowUnavailable: string | null;
  score: CoverageScore;
  histograms: { hatchSpacingUm: Histogram | null; layerThicknessUm: Histogram | null; spotDiameterUm: Histogram | null; volumetricEnergyJMm3: Histogram | null };
  byOutcome: { outcome: string; count: number }[];
  bySource: { sourceId: number; label: string; count: number }[];
  /** The points drawn, column by column. */
  points: { laserPowerW: number[]; scanSpeedMmPerS: number[]; outcome: string[] };
  pointsNote: string | null;
}

function finiteValues(column: Float64Array): Float64Array {
  let n = 0;
  const out = new Float64Array(column.length);
  for (let i = 0; i < column.length; i++) if (Number.isFinite(column[i]!)) out[n++] = column[i]!;
  return out.subarray(0, n);
}

function median(values: Float64Array): number | null {
  if (values.length === 0) return null;
  const sorted = Float64Array.from(values).sort();
  return sorted[Math.floor(sorted.length / 2)]!;
}

function planeValue(explicit: number | null, filter: RangeFilter | null, column: Float64Array, fallback: number): { value: number; basis: PlaneValueBasis } {
  if (explicit !== null) return { value: explicit, basis: "chosen" };
  if (filter && filter.min !== null && filter.max !== null) return { value: (filter.min + filter.max) / 2, basis: "filter" };
  const m = median(finiteValues(column));
  return m !== null && m > 0 ? { value: m, basis: "median of the selection" } : { value: fallback, basis: "default" };
}

/**
 * The grid axis: the range asked for, else the data's range clipped to the plausible range of the
 * quantity (units.ts), so a unit slip (0.9 in a mm/s column) does not stretch the grid over three
 * decades; records outside are counted and reported.
 */
function axisFor(range: { min: number; max: number } | null, data: Float64Array, bins: number, choice: CoverageQuery["powerScale"], plausible: { min: number; max: number }): AxisSpec | null {
  if (range) return { min: range.min, max: range.max, bins, scale: choice === "auto" ? chooseScale(range.min, range.max) : choice };
  let lo = Infinity;
  let hi = -Infinity;
  let plausibleLo = Infinity;
  let plausibleHi = -Infinity;
  for (let i = 0; i < data.length; i++) {
    const v = data[i]!;
    if (!(v > 0)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
    if (v >= plausible.min && v <= plausible.max) {
      if (v < plausibleLo) plausibleLo = v;
      if (v > plausibleHi) plausibleHi = v;
    }
  }
  if (lo > hi) return null;
  if (plausibleLo <= plausibleHi) {
    lo = plausibleLo;
    hi = plausibleHi;
  }
  const scale: AxisScale = choice === "auto" ? chooseScale(lo, hi) : choice;
  return niceAxis(lo, hi, bins, scale);
}

function describeSelection(q: CoverageQuery): string {
  const parts = [q.alloy ? `alloy ${q.alloy}` : "every alloy", `status ${q.status.join(" or ")}`];
  if (q.hatch) parts.push(`hatch ${q.hatch.text}`);
  if (q.layer) parts.push(`layer ${q.layer.text}`);
  if (q.spot) parts.push(`spot ${q.spot.text}`);
  return parts.join(", ");
}

// Window boundaries cost a few thousand melt-pool solves; the same plane asked again is kept.
const WINDOW_CACHE_LIMIT = 32;
const windowCache = new Map<string, { mask: boolean[][]; boundaries: WindowBoundary[] }>();

/** Forgets the kept windows (benchmarks measure the cost of drawing one). */
export function clearCoverageCache(): void {
  windowCache.clear();
}

async function computeWindow(
  db: SqlExecutor, settings: SettingsVersionInfo, q: CoverageQuery, columns: SelectionColumns, powerAxis: AxisSpec, speedAxis: AxisSpec, powerEdgesW: number[], speedEdgesMmPerS: number[],
): Promise<{ window: CoverageWindow | null; reason: string | null }> {
  if (q.alloy === null) return { window: null, reason: "The process window depends on the alloy: choose one alloy to draw it and to score coverage inside it." };
  const resolved = resolveAlloy(q.alloy);
  const overrides = (await loadPropertyOverrides(db)).get(resolved.ok ? resolved.alloyKey : q.alloy) ?? {};
  const props = resolveAlloyProperties({
    alloyKey: resolved.ok ? resolved.alloyKey : q.alloy,
    composition: resolved.ok ? { basis: "wt", components: resolved.components } : null,
    overrides,
  });
  if (!props.ok) return { window: null, reason: `No process window for ${q.alloy}: ${props.message}.` };
  const hatch = planeValue(q.windowHatch, q.hatch, columns.hatchSpacingUm, DEFAULT_WINDOW_PLANE.hatchSpacingUm);
  const layer = planeValue(q.windowLayer, q.layer, columns.layerThicknessUm, DEFAULT_WINDOW_PLANE.layerThicknessUm);
  const spot = planeValue(q.windowSpot, q.spot, columns.spotDiameterUm, DEFAULT_WINDOW_PLANE.spotDiameterUm);
  let material;
  try {
    material = materialFromProperties(props.properties);
  } catch (error) {
    if (error instanceof RangeError) return { window: null, reason: `No process window for ${q.alloy}: ${error.message}.` };
    throw error;
  }
  const c: WindowCase = {
    material,
    hatchSpacingUm: hatch.value,
    layerThicknessUm: layer.value,
    spotDiameterUm: spot.value,
    ambientTemperatureK: DEFAULT_AMBIENT_TEMPERATURE_K,
    settings: windowSettingsFromChecks(settings.values),
  };
  const key = JSON.stringify([c, powerEdgesW, speedEdgesMmPerS, powerAxis.scale, speedAxis.scale]);
  let computed = windowCache.get(key);
  if (!computed) {
    try {
      computed = {
        mask: windowMask(powerEdgesW, speedEdgesMmPerS, powerAxis.scale, speedAxis.scale, (p, v) => assessPoint(c, p, v).inWindow),
        boundaries: windowBoundaries(c, { min: powerAxis.min, max: powerAxis.max, scale: powerAxis.scale }, { min: speedAxis.min, max: speedAxis.max, scale: speedAxis.scale }),
      };
    } catch (error) {
      if (error instanceof RangeError) return { window: null, reason: `The melt-pool model cannot draw this window: ${error.message}.` };
      throw error;
    }
    if (windowCache.size >= WINDOW_CACHE_LIMIT) windowCache.delete(windowCache.keys().next().value!);
    windowCache.set(key, computed);
  }
  const notes = [...props.notes];
  if (props.basis !== "curated") notes.push(`properties ${props.basis === "mixture" ? "estimated from the composition" : "from overrides"}: the window is rougher than for a curated alloy`);
  return {
    window: {
      alloyKey: resolved.ok ? resolved.alloyKey : q.alloy,
      alloyName: resolved.ok ? resolved.displayName : q.alloy,
      hatchSpacingUm: hatch.value,
      layerThicknessUm: layer.value,
      spotDiameterUm: spot.value,
      basis: { hatch: hatch.basis, layer: layer.basis, spot: spot.basis },
      ambientTemperatureK: DEFAULT_AMBIENT_TEMPERATURE_K,
      mask: computed.mask,
      boundaries: computed.boundaries,
      margins: c.settings.margins,
      settingsVersion: settings.version,
      propertiesBasis: props.basis,
      notes,
    },
    reason: null,
  };
}

/**
 * The coverage view of a selection. A selection without records is not an error: the report says
 * `empty` and why, so the page can explain instead of drawing an empty chart.
 *
 * @example
 * await getCoverage({ alloy: "316L", hatch: "80-120um", layer: "30um", k: 3 });
 * // { ok: true, data: { counts: [[…]], sparseCells: […], score: { share: 0.4, … }, … } }
 */
export async function getCoverage(input: unknown): Promise<Result<CoverageReport>> {
  return guard(async (): Promise<Result<CoverageReport>> => {
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = coverageQuerySchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "The coverage filters need attention.");
    const q = parsed.data;
    const resolved = q.alloy ? resolveAlloy(q.alloy) : null;
    const alloyKey = q.alloy === null ? null : resolved?.ok ? resolved.alloyKey : q.alloy;
    const db = sql();
    const columns = await selectCoveragePoints(db, { alloyKey, statuses: q.status, hatchSpacingUm: q.hatch, layerThicknessUm: q.layer, spotDiameterUm: q.spot });
    const query = { ...q, alloy: alloyKey };

    let withoutPv = 0;
    for (let i = 0; i < columns.length; i++) if (!(columns.laserPowerW[i]! > 0) || !(columns.scanSpeedMmPerS[i]! > 0)) withoutPv++;
    const powerAxis = axisFor(q.power, columns.laserPowerW, q.powerBins, q.powerScale, PLAUSIBLE_RANGES.laserPower);
    const speedAxis = axisFor(q.speed, columns.scanSpeedMmPerS, q.speedBins, q.speedScale, PLAUSIBLE_RANGES.scanSpeed);
    const outcomes = OUTCOMES.filter((o) => columns.outcome.includes(o));
    // Histograms over the plausible ranges of the check settings: a unit slip (a hatch of 0.07 in a
    // µm column) is counted as outside instead of stretching the axis over four decades.
    const settings = await currentCheckSettings(db);
    const plausible = (key: string) => ({ min: settingOf(settings.values, `${key}.min`), max: settingOf(settings.values, `${key}.max`) });
    const histograms = {
      hatchSpacingUm: histogram(columns.hatchSpacingUm, 20, undefined, plausible("range.hatchSpacing")),
      layerThicknessUm: histogram(columns.layerThicknessUm, 20, undefined, plausible("range.layerThickness")),
      spotDiameterUm: histogram(columns.spotDiameterUm, 20, undefined, plausible("range.spotDiameter")),
      volumetricEnergyJMm3: histogram(columns.volumetricEnergyJMm3, 24, undefined, plausible("energy.volumetric")),
    };
    const order = new Map<string, number>(OUTCOMES.map((o, i) => [o, i]));
    const byOutcome = tally(columns.outcome)
      .map((t) => ({ outcome: t.key, count: t.count }))
      .sort((a, b) => (order.get(a.outcome) ?? 99) - (order.get(b.outcome) ?? 99));
    const sourceCounts = tally(Array.from(columns.sourceId));
    const titles = new Map((await sourceTitles(db, sourceCounts.slice(0, 50).map((s) => s.key))).map((s) => [s.id, sourceOptionLabel(s)]));
    const bySource = sourceCounts.slice(0, 50).map((s) => ({ sourceId: s.key, label: titles.get(s.key) ?? `source ${s.key}`, count: s.count }));

    const emptyBase = {
      query, nRecords: columns.length, nOnGrid: 0, nWithoutPowerOrSpeed: withoutPv, nOutsideGrid: columns.length - withoutPv, powerAxis, speedAxis, powerEdgesW: [], speedEdgesMmPerS: [], counts: [], countsByOutcome: {},
      sparseCells: [], window: null, score: coverageScore(countGrid({ laserPowerW: [], scanSpeedMmPerS: [], outcome: [] }, [0, 1], [0, 1]), [[false]], q.k, outcomes),
      histograms, byOutcome, bySource, points: { laserPowerW: [], scanSpeedMmPerS: [], outcome: [] }, pointsNote: null,
    };
    if (!powerAxis || !speedAxis) {
      const what = describeSelection(query);
      const emptyReason = columns.length === 0
        ? `No records match (${what}). Widen the hatch, layer or spot range, include more statuses, or choose another alloy.`
        : `The ${columns.length.toLocaleString("en-US")} record(s) that match (${what}) have no laser power or scan speed, so there is nothing to place on the plane.`;
      return ok({ ...emptyBase, empty: true, emptyReason, windowUnavailable: null });
    }
    const powerEdgesW = axisEdges(powerAxis);
    const speedEdgesMmPerS = axisEdges(speedAxis);
    const plane = { laserPowerW: columns.laserPowerW, scanSpeedMmPerS: columns.scanSpeedMmPerS, outcome: columns.outcome };
    const grid = countGrid(plane, powerEdgesW, speedEdgesMmPerS);
    const { window, reason } = await computeWindow(db, settings, query, columns, powerAxis, speedAxis, powerEdgesW, speedEdgesMmPerS);
    const mask = window?.mask ?? null;
    const sample = scatterSample(plane, grid, SCATTER_POINT_LIMIT, q.k);
    const points = {
      laserPowerW: sample.map((i) => columns.laserPowerW[i]!),
      scanSpeedMmPerS: sample.map((i) => columns.scanSpeedMmPerS[i]!),
      outcome: sample.map((i) => columns.outcome[i]!),
    };
    const inside = grid.inside;
    if (inside === 0) {
      return ok({
        ...emptyBase, powerEdgesW, speedEdgesMmPerS, counts: grid.counts, countsByOutcome: grid.countsByOutcome, empty: true, window, windowUnavailable: reason,
        emptyReason: `None of the ${columns.length.toLocaleString("en-US")} matching record(s) lies inside the power and speed range of the grid: widen the range or clear it.`,
      });
    }
    return ok({
      query,
      nRecords: columns.length,
      nOnGrid: inside,
      nWithoutPowerOrSpeed: withoutPv,
      nOutsideGrid: grid.outside - withoutPv,
      empty: false,
      emptyReason: null,
      powerAxis,
      speedAxis,
      powerEdgesW,
      speedEdgesMmPerS,
      counts: grid.counts,
      countsByOutcome: grid.countsByOutcome,
      sparseCells: sparseCells(grid.counts, q.k, mask),
      window,
      windowUnavailable: reason,
      score: coverageScore(grid, mask, q.k, outcomes),
      histograms,
      byOutcome,
      bySource,
      points,
      pointsNote: sample.length < columns.length - withoutPv
        ? `${sample.length.toLocaleString("en-US")} of ${(columns.length - withoutPv).toLocaleString("en-US")} points drawn: every point of a cell with fewer than ${q.k} records, an even share of the rest.`
        : null,
    });
  });
}

/**
 * The report in the snake_case JSON of the command line, with units in the keys.
 *
 * @example
 * coverageJson(report).power_w_edges; // [50, 75, …]
 */
export function coverageJson(r: CoverageReport) {
  return {
    n_records: r.nRecords,
    n_on_grid: r.nOnGrid,
    n_without_power_or_speed: r.nWithoutPowerOrSpeed,
    n_outside_grid: r.nOutsideGrid,
    empty: r.empty,
    ...(r.emptyReason ? { note: r.emptyReason } : {}),
    power_w_edges: r.powerEdgesW,
    speed_mm_s_edges: r.speedEdgesMmPerS,
    power_scale: r.powerAxis?.scale ?? null,
    speed_scale: r.speedAxis?.scale ?? null,
    counts: r.counts,
    counts_by_outcome: r.countsByOutcome,
    sparse_cells: r.sparseCells.map((c) => ({
      power_index: c.powerIndex,
      speed_index: c.speedIndex,
      power_w: [r.powerEdgesW[c.powerIndex], r.powerEdgesW[c.powerIndex + 1]],
      speed_mm_s: [r.speedEdgesMmPerS[c.speedIndex], r.speedEdgesMmPerS[c.speedIndex + 1]],
      count: c.count,
      in_window: c.inWindow,
    })),
    score: {
      k: r.score.k,
      share: r.score.share,
      covered_cells: r.score.covered,
      window_cells: r.score.windowCells,
      over: r.window ? "window" : "whole grid",
      by_outcome: r.score.byOutcome,
    },
    window: r.window
      ? {
          alloy: r.window.alloyKey,
          hatch_spacing_um: r.window.hatchSpacingUm,
          layer_thickness_um: r.window.layerThicknessUm,
          spot_diameter_um: r.window.spotDiameterUm,
          basis: r.window.basis,
          margins: r.window.margins,
          settings_version: r.window.settingsVersion,
          properties: r.window.propertiesBasis,
          mask: r.window.mask,
        }
      : null,
    window_unavailable: r.windowUnavailable,
  };
}

export interface CoveragePage {
  /** Alloy keys present in the collection, for the alloy filter. */
  alloys: string[];
  report: CoverageReport | null;
  /** Why the filters in the address bar were refused (shown beside them). */
  queryError: AppError | null;
}

/** What the coverage page needs on first render: the alloy choices and the report for the address bar's filters. */
export async function getCoveragePage(input: unknown): Promise<Result<CoveragePage>> {
  return guard(async (): Promise<Result<CoveragePage>> => {
    const alloys = await distinctAlloys(sql());
    const report = await getCoverage(input);
    if (report.ok) return ok({ alloys, report: report.data, queryError: null });
    if (report.error.code === "invalid_input") return ok({ alloys, report: null, queryError: report.error });
    return report;
  });
}
