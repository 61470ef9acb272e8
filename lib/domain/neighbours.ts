/**
 * Nearest neighbours in normalized parameter space, within one alloy: the records a build record
 * should broadly agree with. Each parameter is compared on a log scale (the ratio matters, not the
 * difference) divided by its scale step, so one unit of distance is "one step" in P, v, h or t.
 * Hatch and layer count only when both records have them.
 *
 * A grid over (ln P, ln v) with cells one search radius wide keeps the search near-linear: a
 * record looks only at the 3 × 3 cells around its own.
 */
import { settingOf, type CheckSettings } from "./check-settings";
import type { CheckRecord } from "./checks/types";

export interface NeighbourParams {
  /** How many neighbours to return at most (k). */
  count: number;
  /** Largest distance of a neighbour. */
  radius: number;
  /** Relative scale steps: ln(x₁/x₂) / step is the distance along that parameter. */
  scale: { power: number; speed: number; hatch: number; layer: number };
}

export interface Neighbour {
  id: number;
  outcome: string;
  distance: number;
}

/**
 * The neighbour parameters a settings version holds.
 *
 * @example
 * neighbourParamsFrom(defaultCheckSettings()).count; // 7
 */
export function neighbourParamsFrom(settings: CheckSettings): NeighbourParams {
  return {
    count: Math.round(settingOf(settings, "neighbours.count")),
    radius: settingOf(settings, "neighbours.radius"),
    scale: {
      power: settingOf(settings, "neighbours.scale.power"),
      speed: settingOf(settings, "neighbours.scale.speed"),
      hatch: settingOf(settings, "neighbours.scale.hatch"),
      layer: settingOf(settings, "neighbours.scale.layer"),
    },
  };
}

interface Point {
  index: number;
  p: number;
  v: number;
  h: number | null;
  t: number | null;
}

function toPoint(r: CheckRecord, index: number, s: NeighbourParams["scale"]): Point | null {
  if (!(r.laserPowerW! > 0) || !(r.scanSpeedMmPerS! > 0)) return null;
  return {
    index,
    p: Math.log(r.laserPowerW!) / s.power,
    v: Math.log(r.scanSpeedMmPerS!) / s.speed,
    h: r.hatchSpacingUm !== null && r.hatchSpacingUm > 0 ? Math.log(r.hatchSpacingUm) / s.hatch : null,
    t: r.layerThicknessUm !== null && r.layerThicknessUm > 0 ? Math.log(r.layerThicknessUm) / s.layer : null,
  };
}

/**
 * Normalized distance between two records' parameters, or null when P or v is missing.
 *
 * @example
 * parameterDistance(a, { ...a, laserPowerW: a.laserPowerW * Math.exp(0.15) }, scale); // 1
 */
export function parameterDistance(a: CheckRecord, b: CheckRecord, scale: NeighbourParams["scale"]): number | null {
  const x = toPoint(a, 0, scale);
  const y = toPoint(b, 0, scale);
  return x && y ? distance(x, y) : null;
}

function distance(a: Point, b: Point): number {
  let d2 = (a.p - b.p) ** 2 + (a.v - b.v) ** 2;
  if (a.h !== null && b.h !== null) d2 += (a.h - b.h) ** 2;
  if (a.t !== null && b.t !== null) d2 += (a.t - b.t) ** 2;
  return Math.sqrt(d2);
}

/** Outcomes that say something; unknown outcomes neither judge nor are judged. */
export function isJudgedOutcome(outcome: string): boolean {
  return outcome !== "unknown" && outcome !== "";
}

/**
 * A k-d tree over the points of one alloy that share which coordinates they have. Coordinates are
 * copied into a flat array (4 per point, tree order) so the search loop touches no objects.
 */
interface KdTree {
  /** Record index of each point, in tree order. */
  recordIndex: Int32Array;
  /** Record id of each point, in tree order (ties are broken by id). */
  ids: Float64Array;
  /** 4 coordinates per point in tree order; NaN where missing. */
  xs: Float64Array;
  start: Int32Array;
  end: Int32Array;
  /** Split dimension, -1 for a leaf. */
  dim: Int8Array;
  split: Float64Array;
  left: Int32Array;
  right: Int32Array;
}

/**
 * Points per leaf. Measured over 100k records (4 alloys, all four coordinates): 32 took about two
 * thirds of the CPU time of 8; a flat scan of a leaf is cheaper than the node steps it saves.
 */
const LEAF_SIZE = 32;

function coordOf(pt: Point, d: number): number {
  return d === 0 ? pt.p : d === 1 ? pt.v : d === 2 ? (pt.h ?? Number.NaN) : (pt.t ?? Number.NaN);
}

/** Reorders order[lo, hi) so order[k] holds the point whose coordinate would be there sorted (quickselect). */
function selectKth(order: Int32Array, coords: Float64Array, d: number, lo: number, hi: number, k: number): void {
  let l = lo;
  let r = hi - 1;
  while (l < r) {
    const pivot = coords[4 * order[(l + r) >> 1]! + d]!;
    let i = l;
    let j = r;
    while (i <= j) {
      while (coords[4 * order[i]! + d]! < pivot) i++;
      while (coords[4 * order[j]! + d]! > pivot) j--;
      if (i <= j) {
        const tmp = order[i]!;
        order[i] = order[j]!;
        order[j] = tmp;
        i++;
        j--;
      }
    }
    if (k <= j) r = j;
    else if (k >= i) l = i;
    else return;
  }
}

function buildTree(pts: readonly Point[], dims: readonly number[], records: readonly CheckRecord[]): KdTree {
  const n = pts.length;
  const coords = new Float64Array(4 * n);
  for (let i = 0; i < n; i++) for (let d = 0; d < 4; d++) coords[4 * i + d] = coordOf(pts[i]!, d);
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  const maxNodes = Math.max(1, 2 * Math.ceil(n / (LEAF_SIZE / 2)) + 1);
  const start = new Int32Array(maxNodes);
  const end = new Int32Array(maxNodes);
  const dim = new Int8Array(maxNodes);
  const split = new Float64Array(maxNodes);
  const left = new Int32Array(maxNodes);
  const right = new Int32Array(maxNodes);
  let count = 0;
  // Iterative build: a stack of (node, lo, hi).
  const stack: [number, number, number][] = [[count++, 0, n]];
  while (stack.length) {
    const [node, lo, hi] = stack.pop()!;
    start[node] = lo;
    end[node] = hi;
    dim[node] = -1;
    if (hi - lo <= LEAF_SIZE) continue;
    let bestDim = -1;
    let bestSpread = 0;
    for (const d of dims) {
      let mn = Infinity;
      let mx = -Infinity;
      for (let i = lo; i < hi; i++) {
        const x = coords[4 * order[i]! + d]!;
        if (x < mn) mn = x;
        if (x > mx) mx = x;
      }
      if (mx - mn > bestSpread) {
        bestSpread = mx - mn;
        bestDim = d;
      }
    }
    if (bestDim < 0) continue; // all points equal: one leaf, however large
    const mid = lo + ((hi - lo) >> 1);
    selectKth(order, coords, bestDim, lo, hi, mid);
    dim[node] = bestDim;
    split[node] = coords[4 * order[mid]! + bestDim]!;
    const l = count++;
    const r = count++;
    left[node] = l;
    right[node] = r;
    stack.push([l, lo, mid], [r, mid, hi]);
  }
  const recordIndex = new Int32Array(n);
  const ids = new Float64Array(n);
  const xs = new Float64Array(4 * n);
  for (let i = 0; i < n; i++) {
    const o = order[i]!;
    recordIndex[i] = pts[o]!.index;
    ids[i] = records[pts[o]!.index]!.id;
    for (let d = 0; d < 4; d++) xs[4 * i + d] = coords[4 * o + d]!;
  }
  return { recordIndex, ids, xs, start, end, dim, split, left, right };
}

/**
 * For each record with a known outcome (or each of `targets`, if given), its up-to-k nearest
 * same-alloy records with a known outcome within the radius, nearest first (ties by id).
 * Points are kept in k-d trees per alloy and per pattern of present coordinates (a missing hatch
 * or layer is not compared), so a query visits a few leaves instead of every record.
 *
 * @example
 * nearestNeighbours(records, neighbourParamsFrom(defaultCheckSettings())).get(42);
 * // [{ id: 17, outcome: "keyhole", distance: 0.31 }, ...]
 */
export function nearestNeighbours(records: readonly CheckRecord[], params: NeighbourParams, targets?: ReadonlySet<number>): Map<number, Neighbour[]> {
  const out = new Map<number, Neighbour[]>();
  forEachNeighbourhood(records, params, targets, (i, found, indices, distances) => {
    const list: Neighbour[] = new Array(found);
    for (let k = 0; k < found; k++) list[k] = { id: records[indices[k]!]!.id, outcome: records[indices[k]!]!.outcome, distance: distances[k]! };
    out.set(records[i]!.id, list);
  });
  return out;
}

/**
 * The search behind nearestNeighbours without building result objects: calls `visit` with the
 * record's index and its `found` neighbours (record indices and distances, nearest first, in
 * buffers reused between calls).
 */
export function forEachNeighbourhood(
  records: readonly CheckRecord[],
  params: NeighbourParams,
  targets: ReadonlySet<number> | undefined,
  visit: (index: number, found: number, indices: Int32Array, distances: Float64Array) => void,
): void {
  const { radius, count } = params;
  if (!(radius > 0) || count < 1) throw new RangeError(`nearestNeighbours: radius and count must be positive, got ${radius} and ${count}`);
  const points: (Point | null)[] = records.map((r, i) => (isJudgedOutcome(r.outcome) ? toPoint(r, i, params.scale) : null));

  const groups = new Map<string, Point[][]>();
  for (const pt of points) {
    if (!pt) continue;
    const alloy = records[pt.index]!.alloyKey;
    let list = groups.get(alloy);
    if (!list) groups.set(alloy, (list = [[], [], [], []]));
    list[(pt.h === null ? 0 : 1) | (pt.t === null ? 0 : 2)]!.push(pt);
  }
  const trees = new Map<string, KdTree[]>();
  for (const [alloy, list] of groups) {
    const built: KdTree[] = [];
    list.forEach((pts, pattern) => {
      if (pts.length) built.push(buildTree(pts, [0, 1, ...(pattern & 1 ? [2] : []), ...(pattern & 2 ? [3] : [])], records));
    });
    trees.set(alloy, built);
  }

  const bestD = new Float64Array(count);
  const bestId = new Float64Array(count);
  const bestIndex = new Int32Array(count);
  // A cheap prefilter on the squared distance, a hair loose so the exact test below decides ties.
  const radius2Loose = radius * radius * (1 + 1e-9);
  const stack = new Int32Array(256);
  const gaps = new Float64Array(256);
  const q = new Float64Array(4);
  for (let i = 0; i < records.length; i++) {
    const r = records[i]!;
    if (targets && !targets.has(r.id)) continue;
    const pt = points[i];
    if (!pt) continue;
    for (let d = 0; d < 4; d++) q[d] = coordOf(pt, d);
    const q0 = q[0]!;
    const q1 = q[1]!;
    const q2 = q[2]!;
    const q3 = q[3]!;
    const qh = q2 === q2;
    const qt = q3 === q3;
    let found = 0;
    for (const tree of trees.get(r.alloyKey)!) {
      const { xs, ids, start, end, dim, split, left, right } = tree;
      let top = 0;
      gaps[top] = 0;
      stack[top++] = 0;
      while (top > 0) {
        const node = stack[--top]!;
        // A far side is searched only if it can still hold something closer than the k-th best.
        if (gaps[top]! > (found === count ? Math.min(radius, bestD[count - 1]!) : radius)) continue;
        const nd = dim[node]!;
        if (nd < 0) {
          for (let k = start[node]!; k < end[node]!; k++) {
            const index = tree.recordIndex[k]!;
            if (index === i) continue;
            const o = 4 * k;
            const dp = q0 - xs[o]!;
            const dv = q1 - xs[o + 1]!;
            let d2 = dp * dp + dv * dv;
            if (qh) {
              const dh = q2 - xs[o + 2]!;
              if (dh === dh) d2 += dh * dh;
            }
            if (qt) {
              const dt = q3 - xs[o + 3]!;
              if (dt === dt) d2 += dt * dt;
            }
            if (d2 > radius2Loose) continue;
            const dist = Math.sqrt(d2);
            if (dist > radius) continue;
            const id = ids[k]!;
            if (found === count && (dist > bestD[count - 1]! || (dist === bestD[count - 1]! && id > bestId[count - 1]!))) continue;
            let at = found === count ? count - 1 : found++;
            while (at > 0 && (bestD[at - 1]! > dist || (bestD[at - 1]! === dist && bestId[at - 1]! > id))) {
              bestD[at] = bestD[at - 1]!;
              bestId[at] = bestId[at - 1]!;
              bestIndex[at] = bestIndex[at - 1]!;
              at--;
            }
            bestD[at] = dist;
            bestId[at] = id;
            bestIndex[at] = index;
          }
          continue;
        }
        const active = nd < 2 || (nd === 2 ? qh : qt);
        if (top + 2 > stack.length) throw new RangeError("nearestNeighbours: tree deeper than expected");
        const parentGap = gaps[top]!;
        if (!active) {
          gaps[top] = parentGap;
          stack[top++] = left[node]!;
          gaps[top] = parentGap;
          stack[top++] = right[node]!;
          continue;
        }
        const delta = q[nd]! - split[node]!;
        const near = delta < 0 ? left[node]! : right[node]!;
        const far = delta < 0 ? right[node]! : left[node]!;
        // The far side may hold points equal to the split value, so a zero gap is searched too.
        gaps[top] = Math.max(parentGap, Math.abs(delta));
        stack[top++] = far;
        gaps[top] = parentGap;
        stack[top++] = near;
      }
    }
    visit(i, found, bestIndex, bestD);
  }
}
