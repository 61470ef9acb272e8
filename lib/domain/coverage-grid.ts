/**
 * Coverage of the power–speed plane: axis edges (linear or logarithmic), record counts per cell
 * and per outcome, the cells holding fewer than k records, a window mask evaluated at cell
 * centres, and the coverage score — the share of window cells holding at least k records.
 *
 * Orientation everywhere: `counts[i][j]` is power bin i (rows, low to high) and speed bin j
 * (columns, low to high). A bin holds values from its lower edge up to but excluding its upper
 * edge; the last bin also holds its upper edge, so a value equal to the axis maximum is counted.
 */

export type AxisScale = "linear" | "log";

export interface AxisSpec {
  min: number;
  max: number;
  bins: number;
  scale: AxisScale;
}

/** 15 significant digits: removes binary noise from sums such as 0.1 + 0.2 (a double holds 15). */
function clean(x: number): number {
  return x === 0 ? 0 : Number(x.toPrecision(15));
}

function requireAxis(fn: string, spec: AxisSpec): void {
  const { min, max, bins, scale } = spec;
  if (!Number.isInteger(bins) || bins < 1) throw new RangeError(`${fn}: bins must be a whole number from 1 up, got ${bins}`);
  if (!Number.isFinite(min) || !Number.isFinite(max) || !(min < max)) throw new RangeError(`${fn}: need finite min < max, got [${min}, ${max}]`);
  if (scale !== "linear" && scale !== "log") throw new RangeError(`${fn}: scale must be linear or log, got ${String(scale)}`);
  if (scale === "log" && !(min > 0)) throw new RangeError(`${fn}: a log axis needs min > 0, got ${min}`);
}

/**
 * The bins + 1 edges of an axis, evenly spaced (linear) or evenly spaced in the logarithm (log),
 * from min to max exactly.
 *
 * @example
 * axisEdges({ min: 0, max: 400, bins: 4, scale: "linear" }); // [0, 100, 200, 300, 400]
 * axisEdges({ min: 10, max: 1000, bins: 2, scale: "log" });  // [10, 100, 1000]
 */
export function axisEdges(spec: AxisSpec): number[] {
  requireAxis("axisEdges", spec);
  const { min, max, bins, scale } = spec;
  const edges = new Array<number>(bins + 1);
  for (let i = 0; i <= bins; i++) {
    const f = i / bins;
    edges[i] = i === 0 ? min : i === bins ? max : scale === "linear" ? clean(min + (max - min) * f) : clean(min * (max / min) ** f);
  }
  return edges;
}

/**
 * "log" when the values span at least `decades` decades (max/min ≥ 10^decades), else "linear".
 * Non-positive minima always give "linear".
 *
 * @example
 * chooseScale(50, 400);   // "linear"
 * chooseScale(20, 2000);  // "log"
 */
export function chooseScale(min: number, max: number, decades = 1): AxisScale {
  return min > 0 && max / min >= 10 ** decades ? "log" : "linear";
}

const NICE_STEPS = [1, 2, 2.5, 5, 10] as const;

function niceStep(rough: number): number {
  const power = 10 ** Math.floor(Math.log10(rough));
  const f = rough / power;
  const step = NICE_STEPS.find((s) => s >= f - 1e-9) ?? 10;
  return clean(step * power);
}

const LOG_LADDER = [1, 2, 5, 10] as const;

function niceFloorLog(x: number): number {
  const power = 10 ** Math.floor(Math.log10(x));
  const f = x / power;
  let best = 1;
  for (const s of LOG_LADDER) if (s <= f + 1e-9) best = s;
  const out = clean(best * power);
  // the tolerance absorbs binary noise (0.2 = 2·10⁻¹ exactly); it must never cut the data off
  return out <= x ? out : niceFloorLog(x * (1 - 1e-6));
}

function niceCeilLog(x: number): number {
  const power = 10 ** Math.floor(Math.log10(x));
  const f = x / power;
  const s = LOG_LADDER.find((v) => v >= f - 1e-9) ?? 10;
  const out = clean(s * power);
  return out >= x ? out : niceCeilLog(x * (1 + 1e-6));
}

/**
 * An axis covering [dataMin, dataMax] with readable edges: a linear axis is widened to whole
 * multiples of a 1-2-2.5-5 step (so the bin count may differ a little from `bins`), a log axis to
 * the 1-2-5 ladder with `bins` bins. A single value gets a small range around it.
 *
 * @example
 * niceAxis(52, 398, 8, "linear");  // { min: 50, max: 400, bins: 7, scale: "linear" } (step 50)
 * niceAxis(230, 1900, 10, "log");  // { min: 200, max: 2000, bins: 10, scale: "log" }
 */
export function niceAxis(dataMin: number, dataMax: number, bins: number, scale: AxisScale): AxisSpec {
  if (!Number.isFinite(dataMin) || !Number.isFinite(dataMax) || dataMin > dataMax) {
    throw new RangeError(`niceAxis: need finite dataMin <= dataMax, got [${dataMin}, ${dataMax}]`);
  }
  if (!Number.isInteger(bins) || bins < 1) throw new RangeError(`niceAxis: bins must be a whole number from 1 up, got ${bins}`);
  if (scale === "log") {
    if (!(dataMin > 0)) throw new RangeError(`niceAxis: a log axis needs positive data, got min ${dataMin}`);
    let lo = niceFloorLog(dataMin);
    let hi = niceCeilLog(dataMax);
    if (!(lo < hi)) {
      lo = niceFloorLog(dataMin / 2);
      hi = niceCeilLog(dataMax * 2);
    }
    return { min: lo, max: hi, bins, scale };
  }
  let lo = dataMin;
  let hi = dataMax;
  // A span below a billionth of the values is one value: steps that small drown in rounding.
  if (hi - lo <= Math.abs(lo) * 1e-9) {
    const pad = Math.abs(lo) * 0.05 || 1;
    lo -= pad;
    hi += pad;
  }
  const step = niceStep((hi - lo) / bins);
  let min = clean(Math.floor(lo / step + 1e-9) * step);
  if (min > lo) min = clean(min - step);
  if (min > lo) min = lo; // last resort: containing the data matters more than a round edge
  let top = clean(Math.ceil(hi / step - 1e-9) * step);
  if (top < hi) top = clean(top + step);
  if (top < hi) top = hi;
  const count = Math.max(1, Math.round((top - min) / step));
  return { min, max: top, bins: count, scale };
}

/**
 * The bin of a value, or -1 outside the edges (or for NaN). Binary search.
 *
 * @example
 * binIndex([0, 100, 200], 100); // 1
 * binIndex([0, 100, 200], 200); // 1 (the last bin holds its upper edge)
 * binIndex([0, 100, 200], 201); // -1
 */
export function binIndex(edges: readonly number[], value: number): number {
  const n = edges.length - 1;
  if (n < 1 || !(value >= edges[0]!) || !(value <= edges[n]!)) return -1;
  if (value === edges[n]) return n - 1;
  let lo = 0;
  let hi = n; // edges[lo] <= value < edges[hi]
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (value >= edges[mid]!) lo = mid;
    else hi = mid;
  }
  return lo;
}

/**
 * The centre of bin i: arithmetic on a linear axis, geometric on a log axis.
 *
 * @example
 * binCentre([0, 100, 200], 1, "linear"); // 150
 * binCentre([10, 100, 1000], 0, "log");  // 31.62…
 */
export function binCentre(edges: readonly number[], i: number, scale: AxisScale): number {
  const a = edges[i];
  const b = edges[i + 1];
  if (a === undefined || b === undefined) throw new RangeError(`binCentre: no bin ${i} in ${edges.length - 1} bins`);
  return scale === "log" ? Math.sqrt(a * b) : (a + b) / 2;
}

/** Points on the plane, column by column (the database hands them over this way). */
export interface PlanePoints {
  laserPowerW: ArrayLike<number>;
  scanSpeedMmPerS: ArrayLike<number>;
  outcome: ArrayLike<string>;
}

export interface CountGrid {
  powerEdgesW: readonly number[];
  speedEdgesMmPerS: readonly number[];
  /** counts[i][j]: records in power bin i and speed bin j. */
  counts: number[][];
  /** The same per outcome; only outcomes that occur are keys. */
  countsByOutcome: Record<string, number[][]>;
  /** Points inside the edges. */
  inside: number;
  /** Points outside the edges, or with a power or speed that is not a number. */
  outside: number;
}

function zeros(rows: number, cols: number): number[][] {
  return Array.from({ length: rows }, () => new Array<number>(cols).fill(0));
}

/**
 * Counts points per cell and per outcome.
 *
 * @example
 * const g = countGrid({ laserPowerW: [150, 250], scanSpeedMmPerS: [500, 500], outcome: ["dense", "keyhole"] }, [100, 200, 300], [0, 1000]);
 * g.counts;                    // [[1], [1]]
 * g.countsByOutcome.keyhole;   // [[0], [1]]
 */
export function countGrid(points: PlanePoints, powerEdgesW: readonly number[], speedEdgesMmPerS: readonly number[]): CountGrid {
  const rows = powerEdgesW.length - 1;
  const cols = speedEdgesMmPerS.length - 1;
  if (rows < 1 || cols < 1) throw new RangeError(`countGrid: need at least two edges on each axis, got ${powerEdgesW.length} and ${speedEdgesMmPerS.length}`);
  const n = points.laserPowerW.length;
  if (points.scanSpeedMmPerS.length !== n || points.outcome.length !== n) throw new RangeError("countGrid: the point columns differ in length");
  const counts = zeros(rows, cols);
  const countsByOutcome: Record<string, number[][]> = {};
  let inside = 0;
  for (let p = 0; p < n; p++) {
    const i = binIndex(powerEdgesW, points.laserPowerW[p]!);
    if (i < 0) continue;
    const j = binIndex(speedEdgesMmPerS, points.scanSpeedMmPerS[p]!);
    if (j < 0) continue;
    inside++;
    counts[i]![j]! += 1;
    const o = points.outcome[p]!;
    const grid = (countsByOutcome[o] ??= zeros(rows, cols));
    grid[i]![j]! += 1;
  }
  return { powerEdgesW, speedEdgesMmPerS, counts, countsByOutcome, inside, outside: n - inside };
}

export interface SparseCell {
  powerIndex: number;
  speedIndex: number;
  count: number;
  /** Whether the cell is inside the window; null when there is no window. */
  inWindow: boolean | null;
}

/**
 * Cells holding fewer than k records (empty cells included), thinnest first, then by power and
 * speed index.
 *
 * @example
 * sparseCells([[0, 5], [2, 3]], 3); // [{ powerIndex: 0, speedIndex: 0, count: 0, … }, { powerIndex: 1, speedIndex: 0, count: 2, … }]
 */
export function sparseCells(counts: readonly (readonly number[])[], k: number, mask: readonly (readonly boolean[])[] | null = null): SparseCell[] {
  if (!Number.isInteger(k) || k < 1) throw new RangeError(`sparseCells: k must be a whole number from 1 up, got ${k}`);
  const out: SparseCell[] = [];
  counts.forEach((row, i) =>
    row.forEach((count, j) => {
      if (count < k) out.push({ powerIndex: i, speedIndex: j, count, inWindow: mask ? (mask[i]?.[j] ?? false) : null });
    }),
  );
  return out.sort((a, b) => a.count - b.count || a.powerIndex - b.powerIndex || a.speedIndex - b.speedIndex);
}

/**
 * A mask over the cells: `inWindow(power, speed)` evaluated at each cell centre.
 *
 * @example
 * windowMask([0, 100, 200], [0, 10], "linear", "linear", (p) => p > 100); // [[false], [true]]
 */
export function windowMask(
  powerEdgesW: readonly number[],
  speedEdgesMmPerS: readonly number[],
  powerScale: AxisScale,
  speedScale: AxisScale,
  inWindow: (laserPowerW: number, scanSpeedMmPerS: number) => boolean,
): boolean[][] {
  const speedCentres = Array.from({ length: speedEdgesMmPerS.length - 1 }, (_, j) => binCentre(speedEdgesMmPerS, j, speedScale));
  return Array.from({ length: powerEdgesW.length - 1 }, (_, i) => {
    const p = binCentre(powerEdgesW, i, powerScale);
    return speedCentres.map((v) => inWindow(p, v));
  });
}

export interface CoverageScore {
  k: number;
  /** Cells the score is taken over: the window cells, or every cell without a window. */
  windowCells: number;
  /** Window cells holding at least k records of any outcome. */
  covered: number;
  /** covered / windowCells; null when there are no window cells. */
  share: number | null;
  /** Per outcome: window cells holding at least k records of that outcome. */
  byOutcome: Record<string, { covered: number; share: number | null }>;
}

/**
 * The share of window cells holding at least k records, overall and per outcome. Without a mask
 * every cell is in the window.
 *
 * @example
 * coverageScore(countGrid(points, pEdges, vEdges), mask, 3, ["dense", "keyhole"]).share; // e.g. 0.42
 */
export function coverageScore(grid: CountGrid, mask: readonly (readonly boolean[])[] | null, k: number, outcomes: readonly string[]): CoverageScore {
  if (!Number.isInteger(k) || k < 1) throw new RangeError(`coverageScore: k must be a whole number from 1 up, got ${k}`);
  let windowCells = 0;
  let covered = 0;
  const coveredBy: Record<string, number> = Object.fromEntries(outcomes.map((o) => [o, 0]));
  grid.counts.forEach((row, i) =>
    row.forEach((count, j) => {
      if (mask && !mask[i]?.[j]) return;
      windowCells++;
      if (count >= k) covered++;
      for (const o of outcomes) if ((grid.countsByOutcome[o]?.[i]?.[j] ?? 0) >= k) coveredBy[o]! += 1;
    }),
  );
  const share = (x: number) => (windowCells === 0 ? null : x / windowCells);
  return {
    k,
    windowCells,
    covered,
    share: share(covered),
    byOutcome: Object.fromEntries(outcomes.map((o) => [o, { covered: coveredBy[o]!, share: share(coveredBy[o]!) }])),
  };
}

/**
 * Which points a scatter plot draws when there are too many to draw: every point in a cell holding
 * fewer than `keepBelow` records (thin regions stay exact), and an even stride through the rest
 * so the total stays near `maxPoints`. Returns point indices in ascending order; all of them when
 * there are no more than `maxPoints`.
 *
 * @example
 * scatterSample(grid, points, 5000, 3).length; // ≤ 5000 plus the points of sparse cells
 */
export function scatterSample(points: PlanePoints, grid: CountGrid, maxPoints: number, keepBelow: number): number[] {
  const n = points.laserPowerW.length;
  const all = () => Array.from({ length: n }, (_, i) => i);
  if (n <= maxPoints) return all();
  const cellCount = (p: number): number => {
    const i = binIndex(grid.powerEdgesW, points.laserPowerW[p]!);
    const j = i < 0 ? -1 : binIndex(grid.speedEdgesMmPerS, points.scanSpeedMmPerS[p]!);
    return j < 0 ? Infinity : grid.counts[i]![j]!;
  };
  const kept: number[] = [];
  let thin = 0;
  for (let p = 0; p < n; p++) if (cellCount(p) < keepBelow) thin++;
  const stride = Math.max(1, Math.ceil((n - thin) / Math.max(1, maxPoints - thin)));
  let seen = 0;
  for (let p = 0; p < n; p++) {
    if (cellCount(p) < keepBelow) kept.push(p);
    else if (seen++ % stride === 0) kept.push(p);
  }
  return kept;
}
