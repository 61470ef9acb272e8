/**
 * Eagar–Tsai moving Gaussian heat source (T. W. Eagar, N.-S. Tsai, Welding Journal 62(12):346s–355s,
 * 1983, Eq. 10, quasi-steady state), solved by direct numerical integration.
 *
 *   T − T0 = A·P / (π·ρ·c·√(4πα)) · ∫₀^∞ t^(−1/2) / (2αt + σ²)
 *            · exp( −((x + v·t)² + y²) / (4αt + 2σ²) − z² / (4αt) ) dt
 *
 * Dimensionless form (derived here): with lengths in units of σ (X = x/σ, ...), time τ = α·t/σ²
 * and τ = s², the prefactor becomes A·P/(2·π^(3/2)·k·σ) and
 *
 *   (T − T0) / (A·P / (2·π^(3/2)·k·σ)) = G(X, Y, Z; u)
 *   G = ∫₀^∞ 2/(1 + 2s²) · exp( −((X + 2u·s²)² + Y²)/(4s² + 2) − Z²/(4s²) ) ds,   u = v·σ/(2α).
 *
 * So the melting isotherm G = θ, θ = 2·π^(3/2)·k·σ·(T_melt − T0)/(A·P), and with it every
 * dimensionless melt-pool dimension (W/σ, D/σ, L/σ) depends on the two groups u and θ only.
 * G(0,0,0; 0) = π/√2 is the largest value G can take, so nothing melts when θ ≥ G_peak(u).
 */
import { findRoot, integrateAdaptive, minimize } from "./meltpool-numerics";

/** Relative tolerance of the quadrature in the direct method. */
const QUADRATURE_REL_TOL = 1e-10;

/**
 * The dimensionless Eagar–Tsai temperature G(X, Y, Z; u) (see the file comment), X ahead of the
 * beam positive, Z ≥ 0 into the part.
 *
 * @example
 * eagarTsaiG(0, 0, 0, 0); // ≈ π/√2 = 2.2214
 */
export function eagarTsaiG(X: number, Y: number, Z: number, u: number): number {
  const z2over4 = 0.25 * Z * Z;
  const y2 = Y * Y;
  const twoU = 2 * u;
  // s = t/(1 − t) maps [0, ∞) onto [0, 1); ds = dt/(1 − t)².
  const integrand = (t: number): number => {
    const om = 1 - t;
    const s = t / om;
    const s2 = s * s;
    const a = X + twoU * s2;
    let exponent = -(a * a + y2) / (4 * s2 + 2);
    if (z2over4 !== 0) exponent -= z2over4 / s2;
    return (2 / (1 + 2 * s2)) * Math.exp(exponent) / (om * om);
  };
  const features = [1];
  if (X < 0 && u > 0) features.push(Math.sqrt(-X / twoU));
  if (u > 0) features.push(1 / u);
  // Far from the beam the integrand is a narrow spike; put panel edges around it so the adaptive
  // quadrature cannot step over it.
  const spike = integrandSpike(X, Y, Z, u);
  if (spike) {
    for (const k of [-8, -4, -2, -1, 0, 1, 2, 4, 8]) {
      const s = spike.s + k * spike.width;
      if (s > 0) features.push(s);
    }
  }
  const breakpoints = features.map((s) => s / (1 + s));
  return integrateAdaptive(integrand, 0, 1, breakpoints, { relTol: QUADRATURE_REL_TOL, maxPanels: 600 }).value;
}

/** ln of the integrand of G in the variable s (without the dt/ds factor). */
function logIntegrand(X: number, Y: number, Z: number, u: number, s: number): number {
  const s2 = s * s;
  const a = X + 2 * u * s2;
  return Math.LN2 - Math.log1p(2 * s2) - (a * a + Y * Y) / (4 * s2 + 2) - (Z === 0 ? 0 : (Z * Z) / (4 * s2));
}

/**
 * Location and width (in s) of the maximum of the integrand, found on ln s by a coarse scan and a
 * golden-section refinement; null when the integrand is not peaked (maximum at s → 0 or ∞).
 */
function integrandSpike(X: number, Y: number, Z: number, u: number): { s: number; width: number } | null {
  const lo = -12;
  const hi = 12;
  const n = 48;
  let best = 0;
  let bestValue = -Infinity;
  for (let i = 0; i <= n; i++) {
    const v = logIntegrand(X, Y, Z, u, Math.exp(lo + ((hi - lo) * i) / n));
    if (v > bestValue) {
      bestValue = v;
      best = i;
    }
  }
  if (best === 0 || best === n) return null;
  let a = lo + ((hi - lo) * (best - 1)) / n;
  let b = lo + ((hi - lo) * (best + 1)) / n;
  const g = 0.5 * (3 - Math.sqrt(5));
  let c = a + g * (b - a);
  let d = b - g * (b - a);
  let fc = logIntegrand(X, Y, Z, u, Math.exp(c));
  let fd = logIntegrand(X, Y, Z, u, Math.exp(d));
  for (let i = 0; i < 40; i++) {
    if (fc > fd) {
      b = d;
      d = c;
      fd = fc;
      c = a + g * (b - a);
      fc = logIntegrand(X, Y, Z, u, Math.exp(c));
    } else {
      a = c;
      c = d;
      fc = fd;
      d = b - g * (b - a);
      fd = logIntegrand(X, Y, Z, u, Math.exp(d));
    }
  }
  const sPeak = Math.exp(0.5 * (a + b));
  const h = 1e-3 * sPeak;
  const curvature =
    (logIntegrand(X, Y, Z, u, sPeak + h) - 2 * logIntegrand(X, Y, Z, u, sPeak) + logIntegrand(X, Y, Z, u, sPeak - h)) / (h * h);
  const width = curvature < 0 ? 1 / Math.sqrt(-curvature) : sPeak;
  return { s: sPeak, width: Math.min(width, sPeak) };
}

/** Hottest point of the dimensionless field: on the surface centre line, at X = peakX ≤ 0. */
export interface DimensionlessPeak {
  peakX: number;
  peakG: number;
}

/**
 * The peak of G(X, 0, 0; u) over X.
 *
 * @example
 * eagarTsaiPeak(0).peakG; // ≈ 2.2214 (stationary source)
 */
export function eagarTsaiPeak(u: number): DimensionlessPeak {
  // The hottest point trails the beam centre by less than a few σ for any speed.
  const lo = -Math.min(8, 1 + 2 * u);
  const { x, fx } = minimize((X) => -eagarTsaiG(X, 0, 0, u), lo, 0.5, 1e-9);
  return { peakX: x, peakG: -fx };
}

/** Melt-pool size in units of σ. */
export interface DimensionlessPool {
  /** Half-width: the largest Y on the isotherm at Z = 0. */
  halfWidth: number;
  /**
   * Half-widths of the local maxima along the pool, from the front: one for most pools; two for long
   * fast pools (a wide head behind the beam and a wide section far back in the tail).
   */
  halfWidthMaxima: number[];
  /** The largest Z on the isotherm at Y = 0. */
  depth: number;
  /** Front-to-back extent on Y = Z = 0. */
  length: number;
  front: number;
  rear: number;
  peakX: number;
  peakG: number;
}

/** Root of a function that is ≥ 0 at `start` and falls to < 0 further out (in direction `sign`). */
function rootOutward(f: (x: number) => number, start: number, sign: 1 | -1, firstStep: number, relTol: number): number {
  // At the ends of the pool the start value is zero up to quadrature noise: no extent there.
  if (f(start) <= 0) return start;
  let step = Math.max(firstStep, 1e-6);
  let inner = start;
  let outer = start + sign * step;
  let guard = 0;
  while (f(outer) >= 0) {
    inner = outer;
    step *= 2;
    outer = start + sign * step;
    if (++guard > 200) throw new RangeError("eagarTsai: isotherm does not close");
  }
  const scale = Math.max(Math.abs(outer - start), 1e-12);
  return findRoot(f, inner, outer, relTol * scale);
}

/**
 * Local maxima of an extent f(X) ≥ 0 over the pool [rear, front], ordered from the front.
 * A scan at distances from the front growing geometrically (fine near the beam, coarse in the long
 * tail) finds them, Brent's method refines each. Long fast pools have two: a wide head just behind
 * the beam and a wide section far back in the tail; which one is wider changes with the inputs.
 */
function localMaximaAlongPool(f: (X: number) => number, rear: number, front: number): number[] {
  const length = front - rear;
  const ratio = 1.3;
  const distances: number[] = [];
  for (let d = Math.min(0.1, length / 24); d < length; d *= ratio) distances.push(d);
  const xs = [front, ...distances.map((d) => front - d), rear];
  const values = xs.map((X, i) => (i === 0 || i === xs.length - 1 ? 0 : f(X)));
  const peaks: number[] = [];
  for (let i = 1; i + 1 < xs.length; i++) {
    if (values[i]! >= values[i - 1]! && values[i]! > values[i + 1]!) peaks.push(i);
  }
  // Keep a later peak only if the extent dips clearly between it and the previous kept one.
  const kept: number[] = [];
  for (const i of peaks) {
    const previous = kept[kept.length - 1];
    if (previous !== undefined) {
      let dip = Infinity;
      for (let k = previous; k <= i; k++) dip = Math.min(dip, values[k]!);
      if (dip >= (1 - 1e-4) * Math.min(values[previous]!, values[i]!)) {
        if (values[i]! > values[previous]!) kept[kept.length - 1] = i;
        continue;
      }
    }
    kept.push(i);
  }
  return kept.map((i) => {
    const refined = minimize((X) => -f(X), xs[i + 1]!, xs[i - 1]!, 1e-10 * length);
    return Math.max(-refined.fx, values[i]!);
  });
}

/**
 * Half-width of the melting isotherm at Z = 0 at each position X (0 outside the pool).
 *
 * @example
 * halfWidthsAt(2.275, 0.3346, [-1, 0]); // two half-widths in units of σ
 */
export function halfWidthsAt(u: number, theta: number, positions: readonly number[]): number[] {
  let lastY = 1;
  return positions.map((X) => {
    const r = rootOutward((Y) => eagarTsaiG(X, Y, 0, u) - theta, 0, 1, 0.5 * lastY, 1e-11);
    if (r > 0) lastY = r;
    return r;
  });
}

/**
 * Solves the melting isotherm G = θ for the dimensionless width, depth and length by direct
 * numerical integration (the reference method). Returns null when nothing melts (θ ≥ peak).
 *
 * @example
 * solveDimensionlessPool(2.275, 0.3341); // ≈ { halfWidth: 1.72, depth: 0.876, length: 5.66, ... }
 */
export function solveDimensionlessPool(u: number, theta: number, peak: DimensionlessPeak = eagarTsaiPeak(u)): DimensionlessPool | null {
  if (!(u >= 0) || !Number.isFinite(u)) throw new RangeError(`solveDimensionlessPool: u must be a finite number >= 0, got ${u}`);
  if (!(theta > 0) || !Number.isFinite(theta)) throw new RangeError(`solveDimensionlessPool: theta must be a positive number, got ${theta}`);
  const { peakX, peakG } = peak;
  if (theta >= peakG) return null;
  const onAxis = (X: number): number => eagarTsaiG(X, 0, 0, u) - theta;
  const front = rootOutward(onAxis, peakX, 1, 1, 1e-11);
  const rear = rootOutward(onAxis, peakX, -1, 1, 1e-11);
  const length = front - rear;

  let lastY = 0.5 * length;
  const halfWidthAt = (X: number): number => {
    if (X <= rear || X >= front) return 0;
    const r = rootOutward((Y) => eagarTsaiG(X, Y, 0, u) - theta, 0, 1, 0.5 * lastY, 1e-11);
    lastY = Math.max(r, 1e-9);
    return r;
  };
  const halfWidthMaxima = localMaximaAlongPool(halfWidthAt, rear, front);

  let lastZ = 0.25 * length;
  const depthAt = (X: number): number => {
    if (X <= rear || X >= front) return 0;
    const r = rootOutward((Z) => eagarTsaiG(X, 0, Z, u) - theta, 0, 1, 0.5 * lastZ, 1e-11);
    lastZ = Math.max(r, 1e-9);
    return r;
  };
  const depth = Math.max(0, ...localMaximaAlongPool(depthAt, rear, front));

  return {
    halfWidth: Math.max(0, ...halfWidthMaxima),
    halfWidthMaxima,
    depth,
    length,
    front,
    rear,
    peakX,
    peakG,
  };
}
