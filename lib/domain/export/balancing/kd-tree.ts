/**
 * k nearest neighbours inside one set of points, by a k-d tree (Bentley, CACM 18(9):509–517,
 * 1975): split on the dimension of widest spread at the median, search the near side first and
 * the far side only when the splitting plane is closer than the k-th neighbour so far. Ties in
 * distance go to the lower index, so results do not depend on the tree's shape.
 */

export interface NeighbourIndex {
  /** The k nearest other points of point `i`, nearest first (fewer when the set is smaller). */
  neighboursOf(i: number, k: number): number[];
}

interface Node {
  /** Leaf: indices; inner: split. */
  leaf: number[] | null;
  dim: number;
  value: number;
  left: Node | null;
  right: Node | null;
}

const LEAF_SIZE = 12;

function checkPoints(points: readonly (readonly number[])[], who: string): number {
  const d = points[0]?.length ?? 0;
  for (let i = 0; i < points.length; i++) {
    const p = points[i]!;
    if (p.length !== d) throw new RangeError(`${who}: point ${i} has ${p.length} dimensions, expected ${d}`);
    for (const x of p) if (!Number.isFinite(x)) throw new RangeError(`${who}: point ${i} has a value that is not a finite number (${x})`);
  }
  return d;
}

function sqDist(a: readonly number[], b: readonly number[]): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) {
    const t = a[i]! - b[i]!;
    s += t * t;
  }
  return s;
}

/** Inserts (dist, idx) into the sorted best lists, keeping at most k. */
function offer(bestD: number[], bestI: number[], k: number, dist: number, idx: number): void {
  const n = bestD.length;
  if (n === k && (dist > bestD[n - 1]! || (dist === bestD[n - 1]! && idx > bestI[n - 1]!))) return;
  let pos = n;
  while (pos > 0 && (bestD[pos - 1]! > dist || (bestD[pos - 1]! === dist && bestI[pos - 1]! > idx))) pos--;
  bestD.splice(pos, 0, dist);
  bestI.splice(pos, 0, idx);
  if (bestD.length > k) {
    bestD.pop();
    bestI.pop();
  }
}

/**
 * A k-d tree over the points (all of one dimension, finite).
 *
 * @example buildKdTree([[0], [1], [3]]).neighboursOf(0, 1); // [1]
 */
export function buildKdTree(points: readonly (readonly number[])[]): NeighbourIndex {
  const d = checkPoints(points, "buildKdTree");
  const build = (idx: number[]): Node => {
    if (idx.length <= LEAF_SIZE || d === 0) return { leaf: idx, dim: 0, value: 0, left: null, right: null };
    let dim = 0;
    let widest = -1;
    for (let j = 0; j < d; j++) {
      let lo = Infinity;
      let hi = -Infinity;
      for (const i of idx) {
        const v = points[i]![j]!;
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
      if (hi - lo > widest) {
        widest = hi - lo;
        dim = j;
      }
    }
    if (widest <= 0) return { leaf: idx, dim: 0, value: 0, left: null, right: null };
    const sorted = [...idx].sort((a, b) => points[a]![dim]! - points[b]![dim]! || a - b);
    const mid = sorted.length >> 1;
    const value = points[sorted[mid]!]![dim]!;
    return { leaf: null, dim, value, left: build(sorted.slice(0, mid)), right: build(sorted.slice(mid)) };
  };
  const root = build(points.map((_, i) => i));

  return {
    neighboursOf(i, k) {
      const q = points[i];
      if (!q) throw new RangeError(`buildKdTree.neighboursOf: no point ${i}`);
      const kk = Math.min(k, points.length - 1);
      const bestD: number[] = [];
      const bestI: number[] = [];
      if (kk <= 0) return [];
      const visit = (node: Node): void => {
        if (node.leaf) {
          for (const j of node.leaf) if (j !== i) offer(bestD, bestI, kk, sqDist(q, points[j]!), j);
          return;
        }
        const diff = q[node.dim]! - node.value;
        const [near, far] = diff < 0 ? [node.left!, node.right!] : [node.right!, node.left!];
        visit(near);
        if (bestD.length < kk || diff * diff <= bestD[bestD.length - 1]!) visit(far);
      };
      visit(root);
      return bestI;
    },
  };
}

/**
 * The same neighbours by comparing with every point: the reference the tree is tested against.
 *
 * @example bruteForceNeighbours([[0], [1], [3]], 2, 1); // [1]
 */
export function bruteForceNeighbours(points: readonly (readonly number[])[], i: number, k: number): number[] {
  checkPoints(points, "bruteForceNeighbours");
  const q = points[i]!;
  const bestD: number[] = [];
  const bestI: number[] = [];
  const kk = Math.min(k, points.length - 1);
  if (kk <= 0) return [];
  for (let j = 0; j < points.length; j++) if (j !== i) offer(bestD, bestI, kk, sqDist(q, points[j]!), j);
  return bestI;
}
