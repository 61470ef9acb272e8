/**
 * Calibration of a plotted figure's axes from two marked ticks per axis: the mapping between a
 * pixel of the rendered figure and a data value, on linear or logarithmic axes, and the reading
 * uncertainty in data units that one pixel's worth of placement error gives.
 *
 * Pixels are image coordinates of the rendered page or picture: x to the right, y downwards, in
 * device pixels (a pixel's centre is at i + 0.5). Axes are taken as aligned with the image (no
 * rotated scans): the x axis reads the pixel's x, the y axis its y.
 *
 * Interpolation is written as v0·(1 − f) + v1·f (on log10 values for a log axis), so a tick's own
 * pixel reads back exactly the value typed for it.
 */

export type AxisScale = "linear" | "log";
export type AxisName = "x" | "y";

/** A marked tick: its position along the axis (pixel x for the x axis, pixel y for the y axis) and its value. */
export interface AxisTick {
  pixel: number;
  value: number;
}

export interface AxisInput {
  scale: AxisScale;
  ticks: readonly [AxisTick, AxisTick];
}

/** A calibrated axis; build it with `calibrateAxis`. */
export interface AxisCalibration {
  axis: AxisName;
  scale: AxisScale;
  ticks: readonly [AxisTick, AxisTick];
  /** The ticks' values on the interpolation scale (the values, or their log10). */
  t0: number;
  t1: number;
}

export interface FigureCalibration {
  x: AxisCalibration;
  y: AxisCalibration;
}

export type CalibrationProblemCode = "not_finite" | "same_pixel" | "equal_values" | "log_non_positive";

export interface CalibrationProblem {
  axis: AxisName;
  code: CalibrationProblemCode;
  message: string;
}

export interface PixelPoint {
  x: number;
  y: number;
}

export interface DataPoint {
  x: number;
  y: number;
}

const AXIS_WORD: Record<AxisName, string> = { x: "horizontal", y: "vertical" };

/**
 * Checks two ticks and builds the axis mapping; problems (equal values, the same pixel, a log
 * axis with a value ≤ 0, a number that is not finite) come back as values.
 *
 * @example
 * const r = calibrateAxis("x", { scale: "linear", ticks: [{ pixel: 100, value: 0 }, { pixel: 500, value: 400 }] });
 * r.ok && pixelToValue(r.axis, 300); // 200
 */
export function calibrateAxis(axis: AxisName, input: AxisInput): { ok: true; axis: AxisCalibration } | { ok: false; problem: CalibrationProblem } {
  const [a, b] = input.ticks;
  const name = `The ${AXIS_WORD[axis]} (${axis}) axis`;
  const problem = (code: CalibrationProblemCode, message: string) => ({ ok: false as const, problem: { axis, code, message } });
  if (![a.pixel, a.value, b.pixel, b.value].every(Number.isFinite)) return problem("not_finite", `${name}: mark two ticks and type a number for each.`);
  if (a.value === b.value) return problem("equal_values", `${name}: the two marked ticks have the same value (${a.value}); mark two different values.`);
  if (Math.abs(a.pixel - b.pixel) < 1) return problem("same_pixel", `${name}: the two marked ticks sit on the same pixel; mark them further apart.`);
  if (input.scale === "log" && (a.value <= 0 || b.value <= 0)) {
    return problem("log_non_positive", `${name} is logarithmic, so both marked values must be greater than 0 (got ${a.value <= 0 ? a.value : b.value}).`);
  }
  const t = (v: number) => (input.scale === "log" ? Math.log10(v) : v);
  return { ok: true, axis: { axis, scale: input.scale, ticks: [a, b], t0: t(a.value), t1: t(b.value) } };
}

/**
 * Calibrates both axes; every problem of either axis is listed.
 *
 * @example
 * calibrateFigure({ x: { scale: "linear", ticks: [{ pixel: 0, value: 1 }, { pixel: 10, value: 1 }] }, y }).ok; // false (equal values)
 */
export function calibrateFigure(input: { x: AxisInput; y: AxisInput }): { ok: true; calibration: FigureCalibration } | { ok: false; problems: CalibrationProblem[] } {
  const x = calibrateAxis("x", input.x);
  const y = calibrateAxis("y", input.y);
  if (x.ok && y.ok) return { ok: true, calibration: { x: x.axis, y: y.axis } };
  return { ok: false, problems: [...(x.ok ? [] : [x.problem]), ...(y.ok ? [] : [y.problem])] };
}

/** Fraction of the way from the first tick to the second at a pixel. */
function fractionAt(axis: AxisCalibration, pixel: number): number {
  const [a, b] = axis.ticks;
  return (pixel - a.pixel) / (b.pixel - a.pixel);
}

/**
 * The data value at a pixel position along the axis (extrapolates beyond the ticks).
 *
 * @example
 * pixelToValue(logAxis, 200); // 100 when the ticks are 100 px → 10 and 300 px → 1000
 */
export function pixelToValue(axis: AxisCalibration, pixel: number): number {
  const [a, b] = axis.ticks;
  const f = fractionAt(axis, pixel);
  if (f === 0) return a.value;
  if (f === 1) return b.value;
  const t = axis.t0 * (1 - f) + axis.t1 * f;
  return axis.scale === "log" ? 10 ** t : t;
}

/**
 * The pixel position along the axis of a data value; NaN for a value ≤ 0 on a log axis.
 *
 * @example
 * valueToPixel(linearAxis, 200); // 300 when the ticks are 100 px → 0 and 500 px → 400
 */
export function valueToPixel(axis: AxisCalibration, value: number): number {
  const [a, b] = axis.ticks;
  if (value === a.value) return a.pixel;
  if (value === b.value) return b.pixel;
  if (axis.scale === "log" && !(value > 0)) return Number.NaN;
  const t = axis.scale === "log" ? Math.log10(value) : value;
  const f = (t - axis.t0) / (axis.t1 - axis.t0);
  return a.pixel * (1 - f) + b.pixel * f;
}

/** Both coordinates of a pixel in data units. @example pixelToData(cal, { x: 300, y: 200 }); // { x: 200, y: 100 } */
export function pixelToData(calibration: FigureCalibration, pixel: PixelPoint): DataPoint {
  return { x: pixelToValue(calibration.x, pixel.x), y: pixelToValue(calibration.y, pixel.y) };
}

/** A data point's pixel position. @example dataToPixel(cal, { x: 200, y: 100 }); // { x: 300, y: 200 } */
export function dataToPixel(calibration: FigureCalibration, point: DataPoint): PixelPoint {
  return { x: valueToPixel(calibration.x, point.x), y: valueToPixel(calibration.y, point.y) };
}

/**
 * Half-width, in data units, of the values within ±`pixelUncertaintyPx` of a pixel along the axis:
 * |dv/dp|·Δp on a linear axis; on a log axis the larger of the two sides (the scale stretches
 * upwards), computed from the mapping itself.
 *
 * @example
 * valueUncertainty(linearAxis, 300, 0.5); // 0.5 when the ticks are 400 units over 400 px
 */
export function valueUncertainty(axis: AxisCalibration, pixel: number, pixelUncertaintyPx: number): number {
  if (!(pixelUncertaintyPx >= 0)) throw new RangeError(`valueUncertainty: pixelUncertaintyPx must be ≥ 0, got ${pixelUncertaintyPx}`);
  const [a, b] = axis.ticks;
  const perPixel = (axis.t1 - axis.t0) / (b.pixel - a.pixel);
  if (axis.scale === "linear") return Math.abs(perPixel) * pixelUncertaintyPx;
  const v = pixelToValue(axis, pixel);
  const dt = Math.abs(perPixel) * pixelUncertaintyPx;
  return Math.max(v * (10 ** dt - 1), v * (1 - 10 ** -dt));
}

/** Pixel placement error assumed for a point when the caller gives none: half a pixel (rounding to the pixel grid; common practice). */
export const DEFAULT_PIXEL_UNCERTAINTY_PX = 0.5;

export interface ReadPoint {
  pixel: PixelPoint;
  value: DataPoint;
  /** Half-widths in data units. */
  uncertainty: DataPoint;
}

/**
 * Reads a point: its data value and uncertainty, or a problem when it lies outside the span of the
 * marked ticks on either axis (by more than `marginPx`), where a reading would be extrapolated.
 *
 * @example
 * readPoint(cal, { x: 300, y: 200 }); // { ok: true, point: { value: { x: 200, y: 100 }, uncertainty: { x: 0.5, y: … }, … } }
 */
export function readPoint(
  calibration: FigureCalibration,
  pixel: PixelPoint,
  options: { pixelUncertaintyPx?: number; marginPx?: number } = {},
): { ok: true; point: ReadPoint } | { ok: false; message: string } {
  const margin = options.marginPx ?? 1;
  for (const axis of [calibration.x, calibration.y]) {
    const p = axis.axis === "x" ? pixel.x : pixel.y;
    const lo = Math.min(axis.ticks[0].pixel, axis.ticks[1].pixel) - margin;
    const hi = Math.max(axis.ticks[0].pixel, axis.ticks[1].pixel) + margin;
    if (!Number.isFinite(p) || p < lo || p > hi) {
      const [t0, t1] = axis.ticks;
      return {
        ok: false,
        message: `The point at px (${Math.round(pixel.x)}, ${Math.round(pixel.y)}) lies outside the marked ${AXIS_WORD[axis.axis]} axis (${Math.min(t0.value, t1.value)} to ${Math.max(t0.value, t1.value)}); mark ticks that span it.`,
      };
    }
  }
  const du = options.pixelUncertaintyPx ?? DEFAULT_PIXEL_UNCERTAINTY_PX;
  return {
    ok: true,
    point: {
      pixel,
      value: pixelToData(calibration, pixel),
      uncertainty: { x: valueUncertainty(calibration.x, pixel.x, du), y: valueUncertainty(calibration.y, pixel.y, du) },
    },
  };
}
