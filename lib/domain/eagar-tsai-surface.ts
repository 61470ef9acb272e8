/**
 * A precomputed solution surface for the Eagar–Tsai melt pool, so a solve costs an interpolation
 * instead of thousands of quadratures.
 *
 * The dimensionless pool (W/σ, D/σ, L/σ) depends on u = v·σ/(2α) and θ only (see eagar-tsai.ts).
 * The surface is tabulated over x = ln u and ξ = logit(θ / G_peak(u)) = ln(s/(1 − s)), s = θ/G_peak:
 * in these coordinates ln W, ln D and ln L are smooth and tend to straight lines at both ends
 * (near the melting threshold W, L ∝ √(1 − s) and D ∝ 1 − s; for large pools they scale as 1/θ),
 * so bicubic (Catmull–Rom) interpolation of the logarithms is accurate to well under 1 %.
 * Long fast pools (u above about 3, small θ) have two local maxima of the width, a head behind the
 * beam and a section far back in the tail; the widest one changes from head to tail as θ falls, which
 * puts a kink in W(u, θ). The table therefore keeps the two branches apart (each smooth), continues
 * each one beyond the inputs where it ends as a curve falling away below the other branch, and the
 * reader takes the larger of the two interpolated branches. Every cell is checked against direct
 * integration when the table is built; the few cells near the cusp where the second section first
 * appears are marked, and there the reader integrates directly.
 * G_peak(u) has its own finer one-dimensional table because s near 1 is sensitive to it.
 * Outside the tabulated domain the caller falls back to direct integration.
 */
import { type DimensionlessPool, eagarTsaiPeak, halfWidthsAt, solveDimensionlessPool } from "./eagar-tsai";

/** A uniform grid axis: `count` nodes from `min` in steps of `step`. */
export interface SurfaceAxis {
  min: number;
  step: number;
  count: number;
}

/** The stored table (the shape of data/eagar-tsai-surface.json). */
export interface SurfaceTable {
  description: string;
  /** ln u axis of the 2-D tables. */
  lnU: SurfaceAxis;
  /** ξ axis of the 2-D tables. */
  xi: SurfaceAxis;
  /** ln u axis of the peak table. */
  peakLnU: SurfaceAxis;
  /** ln G_peak at each peakLnU node. */
  lnPeakG: number[];
  /**
   * Row-major [lnU index][ξ index] tables of ln(half-width) of the head branch and of the tail
   * branch (continued below the other branch where it does not exist), ln(depth) and ln(length).
   */
  lnHalfWidthHead: number[];
  lnHalfWidthTail: number[];
  /** Row-major per node: 1 where the pool has two local maxima of the width (both branches real). */
  twoMaxima: number[];
  lnDepth: number[];
  lnLength: number[];
  /**
   * Row-major [lnU cell][ξ cell] flags, 1 where interpolation inside the cell was checked against
   * direct integration at test points and found within `cellTolerance`, 0 where the reader must
   * integrate directly (around the cusp where the second widest section first appears).
   */
  cellOk: number[];
  /** Largest relative deviation allowed at the test points of a cell marked ok. */
  cellTolerance: number;
  /**
   * Optional half-width profiles: `profileSamples` values per node of ln(half-width) at
   * X = front − w²·length, w = k/(samples + 1). Interpolated at fixed w they are smooth even where
   * the widest section jumps, so a reader that maximizes the interpolated profile reproduces the
   * cusp exactly; used for the patch around the cusp.
   */
  profileSamples?: number;
  lnHalfWidthProfile?: number[];
}

export interface SurfaceSpec {
  lnU: SurfaceAxis;
  xi: SurfaceAxis;
  peakLnU: SurfaceAxis;
  cellTolerance: number;
  /** Sample the half-width profile at this many positions per node (see SurfaceTable). */
  profileSamples?: number;
}

/** Main table: u from 1e-3 to 1e3, s = θ/G_peak from 1/(1 + e^7) ≈ 9e-4 to 1/(1 + e^−11.55) ≈ 1 − 1e-5. */
export const MAIN_SURFACE_SPEC: SurfaceSpec = {
  lnU: { min: Math.log(1e-3), step: Math.log(1e6) / 40, count: 41 },
  xi: { min: -7, step: 0.35, count: 54 },
  peakLnU: { min: Math.log(1e-3), step: Math.log(1e6) / 240, count: 241 },
  cellTolerance: 0.003,
};

/**
 * A twice finer patch with width profiles around the cusp (u ≈ 3.5, ξ ≈ −2.4) where the second widest section
 * appears; that region is common in LPBF (steels at 1 m/s with 50–100 µm spots).
 */
export const CUSP_PATCH_SPEC: SurfaceSpec = {
  lnU: { min: Math.log(1.4), step: Math.log(8 / 1.4) / 14, count: 15 },
  xi: { min: -6, step: 0.175, count: 32 },
  peakLnU: { min: Math.log(1.4), step: Math.log(8 / 1.4) / 80, count: 81 },
  cellTolerance: 0.003,
  profileSamples: 32,
};

/** The tables of the shipped surface, finest first (a lookup uses the first that covers it). */
export const DEFAULT_SURFACE_SPECS: readonly SurfaceSpec[] = [CUSP_PATCH_SPEC, MAIN_SURFACE_SPEC];

/** The shape of data/eagar-tsai-surface.json. */
export interface SurfaceFile {
  description: string;
  /** Finest first. */
  tables: SurfaceTable[];
}

/** Fractional positions inside a cell at which the interpolation is checked when building. */
const CELL_TEST_POINTS: readonly (readonly [number, number])[] = [
  [0.5, 0.5],
  [0.2, 0.8],
  [0.8, 0.2],
];

function axisValue(axis: SurfaceAxis, i: number): number {
  return axis.min + axis.step * i;
}

/**
 * Builds the surface by direct integration at every node (slow: run by the generator script, not at
 * run time). `onProgress` is called after each row.
 *
 * @example
 * const table = buildSurfaceTable({ lnU: {min: 0, step: 1, count: 4}, xi: {...}, peakLnU: {...} });
 */
export function buildSurfaceTable(
  spec: SurfaceSpec = MAIN_SURFACE_SPEC,
  onProgress: (doneRows: number, totalRows: number) => void = () => {},
): SurfaceTable {
  const lnPeakG: number[] = [];
  for (let i = 0; i < spec.peakLnU.count; i++) lnPeakG.push(Math.log(eagarTsaiPeak(Math.exp(axisValue(spec.peakLnU, i))).peakG));
  const lnHalfWidthHead: number[] = [];
  const lnHalfWidthTail: number[] = [];
  const twoMaxima: number[] = [];
  const lnDepth: number[] = [];
  const lnLength: number[] = [];
  const samples = spec.profileSamples ?? 0;
  const lnHalfWidthProfile: number[] = [];
  for (let i = 0; i < spec.lnU.count; i++) {
    const u = Math.exp(axisValue(spec.lnU, i));
    const peak = eagarTsaiPeak(u);
    const maxima: number[][] = [];
    for (let j = 0; j < spec.xi.count; j++) {
      const xi = axisValue(spec.xi, j);
      const s = 1 / (1 + Math.exp(-xi));
      const pool = solveDimensionlessPool(u, s * peak.peakG, peak);
      if (!pool) throw new RangeError(`buildSurfaceTable: no pool at u=${u}, s=${s}`);
      maxima.push(pool.halfWidthMaxima.map(Math.log));
      twoMaxima.push(pool.halfWidthMaxima.length >= 2 ? 1 : 0);
      lnDepth.push(Math.log(pool.depth));
      lnLength.push(Math.log(pool.length));
      if (samples > 0) {
        const positions = profilePositions(samples).map((w2) => pool.front - w2 * pool.length);
        for (const y of halfWidthsAt(u, s * peak.peakG, positions)) lnHalfWidthProfile.push(Math.log(Math.max(y, 1e-300)));
      }
    }
    const { head, tail } = widthBranches(maxima);
    lnHalfWidthHead.push(...head);
    lnHalfWidthTail.push(...tail);
    onProgress(i + 1, spec.lnU.count);
  }
  const table: SurfaceTable = {
    description:
      "Eagar–Tsai dimensionless melt pool over ln u and logit(θ/G_peak); generated by test/reference/build-eagar-tsai-surface.ts from the direct solver in lib/domain/eagar-tsai.ts",
    lnU: spec.lnU,
    xi: spec.xi,
    peakLnU: spec.peakLnU,
    lnPeakG,
    lnHalfWidthHead,
    lnHalfWidthTail,
    twoMaxima,
    lnDepth,
    lnLength,
    cellOk: new Array<number>((spec.lnU.count - 1) * (spec.xi.count - 1)).fill(1),
    cellTolerance: spec.cellTolerance,
    ...(samples > 0 ? { profileSamples: samples, lnHalfWidthProfile } : {}),
  };
  const reader = createTableReader(table);
  for (let i = 0; i + 1 < spec.lnU.count; i++) {
    for (let j = 0; j + 1 < spec.xi.count; j++) {
      const worst = Math.max(
        ...CELL_TEST_POINTS.map(([fu, fx]) => {
          const u = Math.exp(axisValue(spec.lnU, i + fu));
          const xi = axisValue(spec.xi, j + fx);
          const peak = eagarTsaiPeak(u);
          const theta = peak.peakG / (1 + Math.exp(-xi));
          const direct = solveDimensionlessPool(u, theta, peak);
          const read = reader.lookup(u, theta);
          if (!direct || read.kind !== "pool") return Infinity;
          return Math.max(
            Math.abs(read.pool.halfWidth / direct.halfWidth - 1),
            Math.abs(read.pool.depth / direct.depth - 1),
            Math.abs(read.pool.length / direct.length - 1),
          );
        }),
      );
      table.cellOk[i * (spec.xi.count - 1) + j] = worst <= spec.cellTolerance ? 1 : 0;
    }
  }
  return table;
}

/** w² at the profile samples, w = k/(samples + 1): dense near the front, where the head is. */
function profilePositions(samples: number): number[] {
  return Array.from({ length: samples }, (_v, k) => ((k + 1) / (samples + 1)) ** 2);
}

/** Largest value of a sampled profile y(w) (zero at w = 0 and 1), refined by a parabola. */
function profileMaximum(values: Float64Array, samples: number): number {
  let best = 0;
  for (let k = 1; k < samples; k++) if ((values[k] as number) > (values[best] as number)) best = k;
  const y0 = best === 0 ? 0 : (values[best - 1] as number);
  const y1 = values[best] as number;
  const y2 = best === samples - 1 ? 0 : (values[best + 1] as number);
  const denominator = y0 - 2 * y1 + y2;
  if (denominator >= 0) return y1;
  const offset = (0.5 * (y0 - y2)) / denominator;
  return y1 - 0.25 * (y0 - y2) * offset;
}

/** How fast (in ln units per ξ node) a continued branch falls away below the other one. */
const BRANCH_FALL_OFF = 0.1;

/**
 * Splits one row (ξ ascending) of width maxima into a head and a tail branch. Nodes with two maxima
 * (the band) give both. Above the band (smaller pools) the single maximum is the head; below it the
 * head has merged away and the single maximum is the tail. Beyond its end a branch is continued
 * parallel to the other one and falling away below it, so it never wins the max there.
 * A row without a band has one branch: head = tail.
 */
export function widthBranches(maxima: number[][]): { head: number[]; tail: number[] } {
  const n = maxima.length;
  const single = (j: number): number => Math.max(...(maxima[j] as number[]));
  const band = maxima.map((m, j) => (m.length >= 2 ? j : -1)).filter((j) => j >= 0);
  if (band.length === 0) {
    const w = maxima.map((_m, j) => single(j));
    return { head: w, tail: [...w] };
  }
  const lo = band[0] as number;
  const hi = band[band.length - 1] as number;
  const head: number[] = new Array<number>(n).fill(0);
  const tail: number[] = new Array<number>(n).fill(0);
  for (let j = lo; j <= hi; j++) {
    const m = maxima[j] as number[];
    head[j] = m.length >= 2 ? (m[0] as number) : single(j);
    tail[j] = m.length >= 2 ? Math.max(...m.slice(1)) : single(j);
  }
  const gapHigh = Math.max(0, (head[hi] as number) - (tail[hi] as number));
  for (let j = hi + 1; j < n; j++) {
    head[j] = single(j);
    tail[j] = (head[j] as number) - gapHigh - BRANCH_FALL_OFF * (j - hi);
  }
  const gapLow = Math.max(0, (tail[lo] as number) - (head[lo] as number));
  for (let j = lo - 1; j >= 0; j--) {
    tail[j] = single(j);
    head[j] = (tail[j] as number) - gapLow - BRANCH_FALL_OFF * (lo - j);
  }
  return { head, tail };
}

// Catmull–Rom weights for the four nodes around fractional position t ∈ [0, 1).
function catmullRom(t: number, w: Float64Array): void {
  const t2 = t * t;
  const t3 = t2 * t;
  w[0] = 0.5 * (-t3 + 2 * t2 - t);
  w[1] = 0.5 * (3 * t3 - 5 * t2 + 2);
  w[2] = 0.5 * (-3 * t3 + 4 * t2 + t);
  w[3] = 0.5 * (t3 - t2);
}

/** Position on an axis: base node index i (with i−1 … i+2 used) and fraction, or null outside. */
function locate(axis: SurfaceAxis, value: number): { i: number; t: number } | null {
  const f = (value - axis.min) / axis.step;
  if (!(f >= 0 && f <= axis.count - 1)) return null;
  let i = Math.floor(f);
  if (i > axis.count - 2) i = axis.count - 2;
  return { i, t: f - i };
}

function at(values: number[], count: number, i: number): number {
  if (i < 0) return 2 * (values[0] as number) - (values[1] as number);
  if (i >= count) return 2 * (values[count - 1] as number) - (values[count - 2] as number);
  return values[i] as number;
}

/** Interpolated pool, or a reason it could not be read from the table. */
export type SurfaceLookup =
  | { kind: "pool"; pool: Pick<DimensionlessPool, "halfWidth" | "depth" | "length" | "peakG"> }
  | { kind: "no-melting"; peakG: number }
  | { kind: "outside"; reason: string };

/** An interpolating reader over one table or several (finest first). */
export interface EagarTsaiSurface {
  lookup(u: number, theta: number): SurfaceLookup;
  peakG(u: number): number | null;
  tables: readonly SurfaceTable[];
}

/**
 * Wraps tables in an interpolating reader: each lookup is answered by the first table that covers
 * the inputs with a cell marked accurate; otherwise the answer is "outside" (integrate directly).
 *
 * @example
 * const surface = createSurface(file.tables);
 * surface.lookup(2.275, 0.3346); // { kind: "pool", pool: { halfWidth: ≈1.72, ... } }
 */
export function createSurface(tables: readonly SurfaceTable[]): EagarTsaiSurface {
  const readers = tables.map(createTableReader);
  return {
    tables,
    peakG(u) {
      for (const reader of readers) {
        const g = reader.peakG(u);
        if (g !== null) return g;
      }
      return null;
    },
    lookup(u, theta) {
      let last: SurfaceLookup = { kind: "outside", reason: "no table" };
      for (const reader of readers) {
        const found = reader.lookup(u, theta);
        if (found.kind !== "outside") return found;
        last = found;
      }
      return last;
    },
  };
}

function createTableReader(table: SurfaceTable): Omit<EagarTsaiSurface, "tables"> {
  const { lnU, xi, peakLnU } = table;
  const nXi = xi.count;
  const wu = new Float64Array(4);
  const wx = new Float64Array(4);
  const wp = new Float64Array(4);
  const samples = table.profileSamples ?? 0;
  const profile = table.lnHalfWidthProfile ?? [];
  const sampled = new Float64Array(samples);
  const weights = new Float64Array(16);
  const nodeIndex = new Int32Array(16);
  const clampedNode = (i: number, j: number): number => Math.min(Math.max(i, 0), lnU.count - 1) * nXi + Math.min(Math.max(j, 0), nXi - 1);
  // One stencil value; ghost nodes beyond the edges extrapolate the logarithms linearly.
  const value = (grid: number[], i: number, j: number): number => {
    const ii = Math.min(Math.max(i, 0), lnU.count - 1);
    const jj = Math.min(Math.max(j, 0), nXi - 1);
    const edge = grid[ii * nXi + jj] as number;
    let v = edge;
    if (i !== ii) v += edge - (grid[(ii + (i < 0 ? 1 : -1)) * nXi + jj] as number);
    if (j !== jj) v += edge - (grid[ii * nXi + jj + (j < 0 ? 1 : -1)] as number);
    return v;
  };

  const peakG = (u: number): number | null => {
    const p = locate(peakLnU, Math.log(u));
    if (!p) return null;
    catmullRom(p.t, wp);
    let sum = 0;
    for (let a = 0; a < 4; a++) sum += (wp[a] as number) * at(table.lnPeakG, peakLnU.count, p.i - 1 + a);
    return Math.exp(sum);
  };

  const lookup = (u: number, theta: number): SurfaceLookup => {
    const gPeak = peakG(u);
    if (gPeak === null) return { kind: "outside", reason: `u = ${u} is outside the surface's range` };
    if (theta >= gPeak) return { kind: "no-melting", peakG: gPeak };
    const s = theta / gPeak;
    const xiValue = Math.log(s / (1 - s));
    const pu = locate(lnU, Math.log(u));
    const px = locate(xi, xiValue);
    if (!pu || !px) return { kind: "outside", reason: `θ/G_peak = ${s} is outside the surface's range` };
    if (table.cellOk[pu.i * (nXi - 1) + px.i] !== 1) {
      return { kind: "outside", reason: "the surface is not accurate enough here (where a second widest section appears in long pools)" };
    }
    catmullRom(pu.t, wu);
    catmullRom(px.t, wx);
    let head = 0;
    let tail = 0;
    let widest = 0;
    let bandNodes = 0;
    let d = 0;
    let l = 0;
    for (let a = 0; a < 4; a++) {
      const i = pu.i - 1 + a;
      const ca = wu[a] as number;
      for (let b = 0; b < 4; b++) {
        const j = px.i - 1 + b;
        const c = ca * (wx[b] as number);
        const h = value(table.lnHalfWidthHead, i, j);
        const t = value(table.lnHalfWidthTail, i, j);
        head += c * h;
        tail += c * t;
        widest += c * Math.max(h, t);
        bandNodes += table.twoMaxima[Math.min(Math.max(i, 0), lnU.count - 1) * nXi + Math.min(Math.max(j, 0), nXi - 1)] ?? 0;
        d += c * value(table.lnDepth, i, j);
        l += c * value(table.lnLength, i, j);
      }
    }
    let halfWidth: number;
    if (samples > 0) {
      // Interpolate the profile at every sample, then take its maximum. Edge ghosts are not needed:
      // profile tables are patches used only well inside their domain (clamped stencil).
      for (let a = 0, n = 0; a < 4; a++) {
        for (let b = 0; b < 4; b++, n++) {
          weights[n] = (wu[a] as number) * (wx[b] as number);
          nodeIndex[n] = clampedNode(pu.i - 1 + a, px.i - 1 + b) * samples;
        }
      }
      for (let k = 0; k < samples; k++) {
        let v = 0;
        for (let n = 0; n < 16; n++) v += (weights[n] as number) * (profile[(nodeIndex[n] as number) + k] as number);
        sampled[k] = Math.exp(v);
      }
      halfWidth = profileMaximum(sampled, samples);
    } else {
      // Away from two-maxima nodes the widest section is one smooth function: interpolate it as such;
      // where they are in the stencil, interpolate the branches and take the wider.
      halfWidth = Math.exp(bandNodes === 0 ? widest : Math.max(head, tail));
    }
    return { kind: "pool", pool: { halfWidth, depth: Math.exp(d), length: Math.exp(l), peakG: gPeak } };
  };

  return { lookup, peakG };
}
