/**
 * The zero contour of a field sampled on a rectangular lattice (marching squares), joined into
 * polylines. Used to draw where a defect criterion starts to be predicted on the power–speed
 * plane. Saddle cells are resolved by the mean of their four corners.
 */

export interface ContourPoint {
  x: number;
  y: number;
}

/**
 * Where the field crosses zero on the lattice edge from a (value fa ≥ 0 or < 0) to b (the other
 * sign). The default interpolates linearly in the coordinates given.
 */
export type CrossingSolver = (a: ContourPoint, fa: number, b: ContourPoint, fb: number) => ContourPoint;

const linearCrossing: CrossingSolver = (a, fa, b, fb) => {
  const t = fa / (fa - fb);
  return { x: a.x + (b.x - a.x) * t, y: a.y + (b.y - a.y) * t };
};

/**
 * Polylines along the boundary between f ≥ 0 and f < 0. `values[iy][ix]` is the field at
 * (xs[ix], ys[iy]). A closed loop repeats its first point at its end.
 *
 * @example
 * // f = x − 0.5 on the unit square: one vertical line at x = 0.5
 * zeroContour([0, 1], [0, 1], [[-0.5, 0.5], [-0.5, 0.5]]); // [[{ x: 0.5, y: 0 }, { x: 0.5, y: 1 }]]
 */
export function zeroContour(xs: readonly number[], ys: readonly number[], values: readonly (readonly number[])[], crossing: CrossingSolver = linearCrossing): ContourPoint[][] {
  const nx = xs.length;
  const ny = ys.length;
  if (values.length !== ny || values.some((row) => row.length !== nx)) throw new RangeError(`zeroContour: values must be ${ny} rows of ${nx}`);
  if (nx < 2 || ny < 2) return [];
  const f = (ix: number, iy: number) => values[iy]![ix]!;
  const inside = (ix: number, iy: number) => f(ix, iy) >= 0;
  // Edge ids: horizontal edge from (ix, iy) to (ix + 1, iy) is iy·nx + ix; vertical edge from
  // (ix, iy) to (ix, iy + 1) is H + iy·nx + ix.
  const H = nx * ny;
  const points = new Map<number, ContourPoint>();
  const pointOf = (edge: number): ContourPoint => {
    let p = points.get(edge);
    if (p) return p;
    const vertical = edge >= H;
    const e = vertical ? edge - H : edge;
    const ix = e % nx;
    const iy = Math.floor(e / nx);
    const [bx, by] = vertical ? [ix, iy + 1] : [ix + 1, iy];
    p = crossing({ x: xs[ix]!, y: ys[iy]! }, f(ix, iy), { x: xs[bx]!, y: ys[by]! }, f(bx, by));
    points.set(edge, p);
    return p;
  };
  const segments: [number, number][] = [];
  for (let iy = 0; iy < ny - 1; iy++) {
    for (let ix = 0; ix < nx - 1; ix++) {
      const c00 = inside(ix, iy);
      const c10 = inside(ix + 1, iy);
      const c11 = inside(ix + 1, iy + 1);
      const c01 = inside(ix, iy + 1);
      const bottom = iy * nx + ix;
      const top = (iy + 1) * nx + ix;
      const left = H + iy * nx + ix;
      const right = H + iy * nx + ix + 1;
      const crossings: number[] = [];
      if (c00 !== c10) crossings.push(bottom);
      if (c10 !== c11) crossings.push(right);
      if (c11 !== c01) crossings.push(top);
      if (c01 !== c00) crossings.push(left);
      if (crossings.length === 2) segments.push([crossings[0]!, crossings[1]!]);
      else if (crossings.length === 4) {
        // Saddle: the corners whose side differs from the centre's are cut off one by one.
        const centre = (f(ix, iy) + f(ix + 1, iy) + f(ix + 1, iy + 1) + f(ix, iy + 1)) / 4 >= 0;
        if (c00 !== centre) segments.push([bottom, left]);
        if (c10 !== centre) segments.push([bottom, right]);
        if (c11 !== centre) segments.push([right, top]);
        if (c01 !== centre) segments.push([top, left]);
      }
    }
  }
  return joinSegments(segments).map((chain) => chain.map(pointOf));
}

/** Chains segments that share an edge id into polylines (ends first, then closed loops). */
function joinSegments(segments: readonly [number, number][]): number[][] {
  const byEdge = new Map<number, number[]>();
  segments.forEach(([a, b], s) => {
    for (const e of [a, b]) {
      const list = byEdge.get(e);
      if (list) list.push(s);
      else byEdge.set(e, [s]);
    }
  });
  const used = new Uint8Array(segments.length);
  const walk = (start: number, from: number): number[] => {
    const chain = [from];
    let s = start;
    let at = from;
    while (s >= 0 && !used[s]) {
      used[s] = 1;
      const [a, b] = segments[s]!;
      const next = a === at ? b : a;
      chain.push(next);
      at = next;
      s = (byEdge.get(next) ?? []).find((t) => !used[t]) ?? -1;
    }
    return chain;
  };
  const chains: number[][] = [];
  // Open chains start at an edge that only one segment touches (the lattice border).
  for (const [edge, list] of byEdge) {
    if (list.length === 1 && !used[list[0]!]) chains.push(walk(list[0]!, edge));
  }
  for (let s = 0; s < segments.length; s++) if (!used[s]) chains.push(walk(s, segments[s]![0]));
  return chains;
}
