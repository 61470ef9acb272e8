/**
 * Suggested experiments: parameter sets that fill the thinnest cells of the power–speed plane
 * inside the predicted process window and inside the machine limits a shop enters.
 *
 * 1. The plane is cut into cells over the machine's power and speed range, once per hatch and
 *    layer the shop can run (a "shop plane"); records count in the plane whose hatch and layer
 *    they match within a tolerance.
 * 2. Candidate cells lie inside the window at their centre and hold fewer than k records.
 * 3. Cells are chosen one suggestion at a time: the lowest count (records plus suggestions
 *    already placed) first, and among those the cell farthest from the suggestions chosen so far
 *    (greedy maximin); the PRNG breaks ties. No more suggestions are made than it takes to bring
 *    every candidate cell to k.
 * 4. Within its cell each suggestion takes its offset from a seeded maximin Latin hypercube, so no
 *    two suggestions share a power or speed stratum of their cells. A position outside the window,
 *    or within the duplicate tolerance of a record or another suggestion, is drawn again.
 *
 * Power is rounded to whole watts and speed to whole mm/s, as machines take them (common practice).
 */
import { axisEdges, binIndex, countGrid, type AxisScale, type CountGrid } from "./coverage-grid";
import { energyDensities } from "./energy-density";
import { maximinLatinHypercube } from "./latin-hypercube";

export interface ShopPlane {
  hatchSpacingUm: number;
  layerThicknessUm: number;
}

/** What the physics says at one point of a shop plane. */
export interface PointVerdict {
  inWindow: boolean;
  /** Predicted regime, e.g. "dense" inside the window. */
  regime: string;
  /** Criteria past their threshold (inside the window: within their margin). */
  fired: readonly string[];
}

export type PlaneAssessor = (plane: ShopPlane, laserPowerW: number, scanSpeedMmPerS: number) => PointVerdict;

/** Existing records of the alloy, column by column; NaN where a value is missing. */
export interface RecordColumns {
  laserPowerW: ArrayLike<number>;
  scanSpeedMmPerS: ArrayLike<number>;
  hatchSpacingUm: ArrayLike<number>;
  layerThicknessUm: ArrayLike<number>;
}

export interface DuplicateTolerance {
  powerRelative: number;
  powerAbsW: number;
  speedRelative: number;
  hatchAbsUm: number;
  layerAbsUm: number;
}

/** DOMAIN.md near duplicates: P ±1 % or 2 W, v ±1 %, h and t ±1 µm. */
export const DEFAULT_DUPLICATE_TOLERANCE: Readonly<DuplicateTolerance> = { powerRelative: 0.01, powerAbsW: 2, speedRelative: 0.01, hatchAbsUm: 1, layerAbsUm: 1 };

/**
 * A record counts in a shop plane when its hatch and layer are within this fraction of the
 * plane's (project default, from memory; configurable).
 */
export const DEFAULT_PLANE_TOLERANCE = 0.1;

export interface SuggestionInput {
  n: number;
  k: number;
  powerRangeW: { min: number; max: number };
  speedRangeMmPerS: { min: number; max: number };
  hatchSpacingsUm: readonly number[];
  layerThicknessesUm: readonly number[];
  powerBins: number;
  speedBins: number;
  powerScale: AxisScale;
  speedScale: AxisScale;
  planeTolerance?: number;
  duplicateTolerance?: DuplicateTolerance;
}

export interface Suggestion {
  /** 1-based, in the order chosen. */
  index: number;
  laserPowerW: number;
  scanSpeedMmPerS: number;
  hatchSpacingUm: number;
  layerThicknessUm: number;
  volumetricEnergyJMm3: number;
  predictedRegime: string;
  criteriaPastThreshold: string[];
  cell: { powerIndex: number; speedIndex: number; powerRangeW: [number, number]; speedRangeMmPerS: [number, number]; records: number };
  reason: string;
}

export interface PlaneSummary extends ShopPlane {
  records: number;
  windowCells: number;
  /** Window cells holding fewer than k records. */
  sparseWindowCells: number;
  /** Records still missing to bring every window cell to k. */
  deficit: number;
}

export interface SuggestionResult {
  suggestions: Suggestion[];
  powerEdgesW: number[];
  speedEdgesMmPerS: number[];
  planes: PlaneSummary[];
  notes: string[];
}

/** Most hatch × layer combinations one request may ask for (each is a plane of physics). */
export const MAX_SHOP_PLANES = 36;

const OFFSET_MARGIN = 0.1; // keep suggestions a tenth of a cell away from its edges
const REDRAWS = 24;

interface Candidate {
  plane: number;
  i: number;
  j: number;
  records: number;
  placed: number;
  x: number;
  y: number;
}

function requireInput(input: SuggestionInput): void {
  const fn = "suggestExperiments";
  const { n, k, powerRangeW: p, speedRangeMmPerS: v } = input;
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`${fn}: n must be a whole number >= 0, got ${n}`);
  if (!Number.isInteger(k) || k < 1) throw new RangeError(`${fn}: k must be a whole number >= 1, got ${k}`);
  if (!(p.min > 0) || !(p.max > p.min) || !Number.isFinite(p.max)) throw new RangeError(`${fn}: power range must be positive with min < max, got [${p.min}, ${p.max}]`);
  if (!(v.min > 0) || !(v.max > v.min) || !Number.isFinite(v.max)) throw new RangeError(`${fn}: speed range must be positive with min < max, got [${v.min}, ${v.max}]`);
  for (const [name, list] of [["hatchSpacingsUm", input.hatchSpacingsUm], ["layerThicknessesUm", input.layerThicknessesUm]] as const) {
    if (list.length === 0 || list.some((x) => !(x > 0) || !Number.isFinite(x))) throw new RangeError(`${fn}: ${name} must be positive numbers, at least one`);
  }
  if (input.hatchSpacingsUm.length * input.layerThicknessesUm.length > MAX_SHOP_PLANES) {
    throw new RangeError(`${fn}: at most ${MAX_SHOP_PLANES} hatch × layer combinations, got ${input.hatchSpacingsUm.length * input.layerThicknessesUm.length}`);
  }
}

const scaled = (x: number, scale: AxisScale) => (scale === "log" ? Math.log(x) : x);
const unscaled = (x: number, scale: AxisScale) => (scale === "log" ? Math.exp(x) : x);

function fmt(x: number): string {
  const r = Math.round(x);
  return Math.abs(x - r) < 1e-9 ? String(r) : String(Number(x.toPrecision(4)));
}

/**
 * Suggests up to n experiments that fill the thinnest window cells of each shop plane.
 * Deterministic for a given `random` sequence. Throws RangeError for an input it cannot use
 * (callers validate user input first and report problems as messages).
 *
 * @example
 * const rng = createPrng(1);
 * suggestExperiments({ n: 12, k: 3, powerRangeW: { min: 50, max: 400 }, speedRangeMmPerS: { min: 200, max: 2000 },
 *   hatchSpacingsUm: [100], layerThicknessesUm: [30], powerBins: 12, speedBins: 12, powerScale: "linear", speedScale: "log" },
 *   records, assess, () => rng.next()).suggestions.length; // 12
 */
export function suggestExperiments(input: SuggestionInput, records: RecordColumns, assess: PlaneAssessor, random: () => number): SuggestionResult {
  requireInput(input);
  const tol = input.duplicateTolerance ?? DEFAULT_DUPLICATE_TOLERANCE;
  const planeTol = input.planeTolerance ?? DEFAULT_PLANE_TOLERANCE;
  const powerEdgesW = axisEdges({ ...input.powerRangeW, bins: input.powerBins, scale: input.powerScale });
  const speedEdgesMmPerS = axisEdges({ ...input.speedRangeMmPerS, bins: input.speedBins, scale: input.speedScale });
  const planes: ShopPlane[] = input.hatchSpacingsUm.flatMap((h) => input.layerThicknessesUm.map((t) => ({ hatchSpacingUm: h, layerThicknessUm: t })));

  // Records of each plane: the nearest plane within the tolerance.
  const n = records.laserPowerW.length;
  const members: number[][] = planes.map(() => []);
  for (let r = 0; r < n; r++) {
    const h = records.hatchSpacingUm[r]!;
    const t = records.layerThicknessUm[r]!;
    if (!(h > 0) || !(t > 0)) continue;
    let best = -1;
    let bestDistance = Infinity;
    planes.forEach((pl, q) => {
      const dh = Math.abs(h - pl.hatchSpacingUm) / pl.hatchSpacingUm;
      const dt = Math.abs(t - pl.layerThicknessUm) / pl.layerThicknessUm;
      if (dh <= planeTol && dt <= planeTol && dh + dt < bestDistance) {
        best = q;
        bestDistance = dh + dt;
      }
    });
    if (best >= 0) members[best]!.push(r);
  }
  const grids: CountGrid[] = members.map((rows) =>
    countGrid(
      { laserPowerW: rows.map((r) => records.laserPowerW[r]!), scanSpeedMmPerS: rows.map((r) => records.scanSpeedMmPerS[r]!), outcome: rows.map(() => "") },
      powerEdgesW,
      speedEdgesMmPerS,
    ),
  );

  // Candidate cells: inside the window at the centre, fewer than k records.
  const ps = input.powerScale;
  const vs = input.speedScale;
  const rows = input.powerBins;
  const cols = input.speedBins;
  const centre = (edges: number[], i: number, scale: AxisScale) => unscaled((scaled(edges[i]!, scale) + scaled(edges[i + 1]!, scale)) / 2, scale);
  const candidates: Candidate[] = [];
  const summaries: PlaneSummary[] = planes.map((pl, q) => {
    let windowCells = 0;
    let sparse = 0;
    let deficit = 0;
    for (let i = 0; i < rows; i++) {
      for (let j = 0; j < cols; j++) {
        if (!assess(pl, centre(powerEdgesW, i, ps), centre(speedEdgesMmPerS, j, vs)).inWindow) continue;
        windowCells++;
        const count = grids[q]!.counts[i]![j]!;
        if (count >= input.k) continue;
        sparse++;
        deficit += input.k - count;
        candidates.push({ plane: q, i, j, records: count, placed: 0, x: (j + 0.5) / cols, y: (i + 0.5) / rows });
      }
    }
    return { ...pl, records: members[q]!.length, windowCells, sparseWindowCells: sparse, deficit };
  });

  const notes: string[] = [];
  const totalDeficit = summaries.reduce((s, p) => s + p.deficit, 0);
  if (candidates.length === 0) {
    notes.push(
      summaries.every((s) => s.windowCells === 0)
        ? "No cell of the machine's range lies inside the predicted window for these hatch and layer values: widen the power or speed range, or check the alloy's properties."
        : `Every window cell already holds at least k = ${input.k} records: nothing to fill.`,
    );
    return { suggestions: [], powerEdgesW, speedEdgesMmPerS, planes: summaries, notes };
  }
  const wanted = Math.min(input.n, totalDeficit);
  if (wanted < input.n) notes.push(`${wanted} suggestion(s) bring every window cell to k = ${input.k} records; more were asked for than needed.`);

  // Offsets within cells: one maximin Latin hypercube over the whole set.
  const offsets = maximinLatinHypercube(wanted, 2, random, { jitter: true });
  const chosen: { c: Candidate; laserPowerW: number; scanSpeedMmPerS: number; verdict: PointVerdict }[] = [];
  const planeGap = planes.length > 1 ? 0.5 : 0;
  const distanceToChosen = (c: Candidate) => {
    let best = Infinity;
    for (const s of chosen) {
      const d = (c.x - s.c.x) ** 2 + (c.y - s.c.y) ** 2 + (c.plane === s.c.plane ? 0 : planeGap ** 2);
      if (d < best) best = d;
    }
    return best;
  };
  const isDuplicate = (q: number, p: number, v: number) => {
    const pl = planes[q]!;
    const near = (a: number, b: number, rel: number, abs: number) => Math.abs(a - b) <= Math.max(rel * Math.abs(b), abs);
    for (const r of members[q]!) {
      if (
        Math.abs(records.hatchSpacingUm[r]! - pl.hatchSpacingUm) <= tol.hatchAbsUm &&
        Math.abs(records.layerThicknessUm[r]! - pl.layerThicknessUm) <= tol.layerAbsUm &&
        near(p, records.laserPowerW[r]!, tol.powerRelative, tol.powerAbsW) &&
        near(v, records.scanSpeedMmPerS[r]!, tol.speedRelative, 0)
      ) return true;
    }
    return chosen.some((s) => s.c.plane === q && near(p, s.laserPowerW, tol.powerRelative, tol.powerAbsW) && near(v, s.scanSpeedMmPerS, tol.speedRelative, 0));
  };
  const pMin = Math.ceil(input.powerRangeW.min);
  const pMax = Math.floor(input.powerRangeW.max);
  const vMin = Math.ceil(input.speedRangeMmPerS.min);
  const vMax = Math.floor(input.speedRangeMmPerS.max);
  const place = (c: Candidate, u: number, w: number) => {
    const at = (edges: number[], i: number, scale: AxisScale, f: number) => {
      const a = scaled(edges[i]!, scale);
      const b = scaled(edges[i + 1]!, scale);
      return unscaled(a + (b - a) * (OFFSET_MARGIN + (1 - 2 * OFFSET_MARGIN) * f), scale);
    };
    const p = Math.min(pMax, Math.max(pMin, Math.round(at(powerEdgesW, c.i, ps, u))));
    const v = Math.min(vMax, Math.max(vMin, Math.round(at(speedEdgesMmPerS, c.j, vs, w))));
    if (binIndex(powerEdgesW, p) !== c.i || binIndex(speedEdgesMmPerS, v) !== c.j) return null;
    if (isDuplicate(c.plane, p, v)) return null;
    const verdict = assess(planes[c.plane]!, p, v);
    return verdict.inWindow ? { laserPowerW: p, scanSpeedMmPerS: v, verdict } : null;
  };

  const open = new Set(candidates);
  while (chosen.length < wanted && open.size > 0) {
    let lowest = Infinity;
    for (const c of open) lowest = Math.min(lowest, c.records + c.placed);
    let pick: Candidate | null = null;
    let pickDistance = -1;
    let ties = 0;
    for (const c of open) {
      if (c.records + c.placed !== lowest) continue;
      const d = distanceToChosen(c);
      if (d > pickDistance + 1e-12) {
        pick = c;
        pickDistance = d;
        ties = 1;
      } else if (Math.abs(d - pickDistance) <= 1e-12 && random() * ++ties < 1) {
        pick = c; // reservoir choice among equally distant cells
      }
    }
    const c = pick!;
    const offset = offsets[chosen.length]!;
    let placed = place(c, offset[0]!, offset[1]!);
    for (let r = 0; !placed && r < REDRAWS; r++) placed = place(c, random(), random());
    placed ??= place(c, 0.5, 0.5);
    if (!placed) {
      open.delete(c); // no free position inside the window in this cell
      continue;
    }
    c.placed++;
    if (c.records + c.placed >= input.k) open.delete(c);
    chosen.push({ c, ...placed });
  }
  if (chosen.length < wanted) notes.push(`Only ${chosen.length} of ${wanted} suggestion(s) found a position inside the window that repeats no record.`);

  const suggestions = chosen.map((s, idx): Suggestion => {
    const pl = planes[s.c.plane]!;
    const powerRangeW: [number, number] = [powerEdgesW[s.c.i]!, powerEdgesW[s.c.i + 1]!];
    const speedRangeMmPerS: [number, number] = [speedEdgesMmPerS[s.c.j]!, speedEdgesMmPerS[s.c.j + 1]!];
    const ev = energyDensities({ laserPowerW: s.laserPowerW, scanSpeedMmPerS: s.scanSpeedMmPerS, hatchSpacingUm: pl.hatchSpacingUm, layerThicknessUm: pl.layerThicknessUm }).volumetricJPerMm3!;
    const sameCell = chosen.filter((o) => o.c === s.c).length - 1;
    const others = sameCell > 0 ? ` (with ${sameCell} other suggestion(s) in the same cell)` : "";
    const why = idx === 0 ? "it is among the thinnest cells" : "among the thinnest cells left it is the farthest from the suggestions chosen before it";
    return {
      index: idx + 1,
      laserPowerW: s.laserPowerW,
      scanSpeedMmPerS: s.scanSpeedMmPerS,
      hatchSpacingUm: pl.hatchSpacingUm,
      layerThicknessUm: pl.layerThicknessUm,
      volumetricEnergyJMm3: Number(ev.toPrecision(4)),
      predictedRegime: s.verdict.regime,
      criteriaPastThreshold: [...s.verdict.fired],
      cell: { powerIndex: s.c.i, speedIndex: s.c.j, powerRangeW, speedRangeMmPerS, records: s.c.records },
      reason:
        `Cell ${fmt(powerRangeW[0])}–${fmt(powerRangeW[1])} W × ${fmt(speedRangeMmPerS[0])}–${fmt(speedRangeMmPerS[1])} mm/s at h ${fmt(pl.hatchSpacingUm)} µm, t ${fmt(pl.layerThicknessUm)} µm ` +
        `holds ${s.c.records} record(s), fewer than k = ${input.k}, and lies inside the predicted window (${s.verdict.regime}); ` +
        `${why}${others}.`,
    };
  });
  return { suggestions, powerEdgesW, speedEdgesMmPerS, planes: summaries, notes };
}
