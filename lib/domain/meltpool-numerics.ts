/**
 * Numerical building blocks for the melt-pool models: adaptive Gauss–Kronrod quadrature, Brent's
 * root finder and Brent's minimizer. Textbook algorithms (R. P. Brent, "Algorithms for Minimization
 * without Derivatives", 1973; Gauss–Kronrod 7/15 nodes and weights as tabulated in QUADPACK,
 * Piessens et al. 1983).
 */

// Gauss–Kronrod 15-point nodes (positive half) and weights, and the embedded 7-point Gauss weights.
const XGK = [
  0.9914553711208126, 0.9491079123427585, 0.8648644233597691,
  0.7415311855993945, 0.5860872354676911, 0.4058451513773972,
  0.20778495500789848, 0,
] as const;
const WGK = [
  0.022935322010529224, 0.06309209262997856, 0.10479001032225019,
  0.14065325971552592, 0.1690047266392679, 0.19035057806478542,
  0.20443294007529889, 0.20948214108472782,
] as const;
const WG = [
  0.1294849661688697, 0.27970539148927664, 0.3818300505051189,
  0.4179591836734694,
] as const;

interface Panel {
  a: number;
  b: number;
  value: number;
  error: number;
}

function gk15(f: (x: number) => number, a: number, b: number): Panel {
  const center = 0.5 * (a + b);
  const half = 0.5 * (b - a);
  const fc = f(center);
  let kronrod = fc * WGK[7];
  let gauss = fc * WG[3];
  for (let j = 0; j < 7; j++) {
    const dx = half * XGK[j]!;
    const sum = f(center - dx) + f(center + dx);
    kronrod += WGK[j]! * sum;
    if (j % 2 === 1) gauss += WG[(j - 1) / 2]! * sum;
  }
  return { a, b, value: kronrod * half, error: Math.abs((kronrod - gauss) * half) };
}

export interface QuadratureOptions {
  relTol?: number;
  absTol?: number;
  maxPanels?: number;
}

/**
 * Integrates f over [a, b] (finite), starting from the panels between `breakpoints`, bisecting the
 * panel with the largest error estimate until the total estimate is within tolerance.
 *
 * @example
 * integrateAdaptive((x) => Math.exp(-x * x), 0, 10); // ≈ √π / 2
 */
export function integrateAdaptive(
  f: (x: number) => number,
  a: number,
  b: number,
  breakpoints: readonly number[] = [],
  options: QuadratureOptions = {},
): { value: number; error: number; panels: number } {
  const relTol = options.relTol ?? 1e-10;
  const absTol = options.absTol ?? 1e-300;
  const maxPanels = options.maxPanels ?? 400;
  const edges = [a, ...breakpoints.filter((p) => p > a && p < b).sort((x, y) => x - y), b];
  const panels: Panel[] = [];
  for (let i = 0; i + 1 < edges.length; i++) panels.push(gk15(f, edges[i]!, edges[i + 1]!));
  for (;;) {
    let value = 0;
    let error = 0;
    let worst = 0;
    for (let i = 0; i < panels.length; i++) {
      const p = panels[i]!;
      value += p.value;
      error += p.error;
      if (p.error > panels[worst]!.error) worst = i;
    }
    if (error <= Math.max(absTol, relTol * Math.abs(value)) || panels.length >= maxPanels) {
      return { value, error, panels: panels.length };
    }
    const p = panels[worst]!;
    const mid = 0.5 * (p.a + p.b);
    panels[worst] = gk15(f, p.a, mid);
    panels.push(gk15(f, mid, p.b));
  }
}

/**
 * Brent's root finder on a bracket [a, b] with f(a)·f(b) ≤ 0.
 *
 * @example
 * findRoot((x) => x * x - 2, 0, 2); // ≈ 1.41421356
 */
export function findRoot(f: (x: number) => number, a0: number, b0: number, xTol = 1e-12, maxIter = 200): number {
  let a = a0;
  let b = b0;
  let fa = f(a);
  let fb = f(b);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (fa * fb > 0) throw new RangeError(`findRoot: [${a0}, ${b0}] does not bracket a root`);
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let iter = 0; iter < maxIter; iter++) {
    if (fb * fc > 0) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 0.5 * xTol;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      let p: number;
      let q: number;
      const s = fb / fa;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qa = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = m;
      }
    } else {
      d = m;
      e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return b;
}

const GOLDEN = 0.5 * (3 - Math.sqrt(5));

/**
 * Brent's minimizer (golden section with parabolic steps) on [a, b].
 *
 * @example
 * minimize((x) => (x - 1) ** 2, -3, 4).x; // ≈ 1
 */
export function minimize(
  f: (x: number) => number,
  a0: number,
  b0: number,
  xTol = 1e-10,
  maxIter = 200,
): { x: number; fx: number } {
  let a = a0;
  let b = b0;
  let x = a + GOLDEN * (b - a);
  let w = x;
  let v = x;
  let fx = f(x);
  let fw = fx;
  let fv = fx;
  let d = 0;
  let e = 0;
  for (let iter = 0; iter < maxIter; iter++) {
    const m = 0.5 * (a + b);
    const tol = Math.sqrt(Number.EPSILON) * Math.abs(x) * 1e-2 + xTol / 3;
    const tol2 = 2 * tol;
    if (Math.abs(x - m) <= tol2 - 0.5 * (b - a)) break;
    let useGolden = true;
    if (Math.abs(e) > tol) {
      const r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      if (Math.abs(p) < Math.abs(0.5 * q * e) && p > q * (a - x) && p < q * (b - x)) {
        e = d;
        d = p / q;
        const u = x + d;
        if (u - a < tol2 || b - u < tol2) d = x < m ? tol : -tol;
        useGolden = false;
      }
    }
    if (useGolden) {
      e = (x < m ? b : a) - x;
      d = GOLDEN * e;
    }
    const u = Math.abs(d) >= tol ? x + d : x + (d > 0 ? tol : -tol);
    const fu = f(u);
    if (fu <= fx) {
      if (u < x) b = x;
      else a = x;
      v = w;
      fv = fw;
      w = x;
      fw = fx;
      x = u;
      fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return { x, fx };
}
