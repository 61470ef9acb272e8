/**
 * The process window on the power–speed plane for one alloy, hatch, layer and spot: where the
 * melt-pool criteria (criteria.ts on the Eagar–Tsai pool, meltpool-analysis.ts) strongly predict
 * lack of fusion, keyhole or balling, and the boundaries of those regions.
 *
 * "Strongly predicted" is the rule of the outcome-versus-physics check (checks/physics.ts): every
 * evaluable criterion of the mechanism fires and the strongest is beyond the mechanism's margin.
 * The conduction-mode criteria alone fire over most of a realistic plane (the Eagar–Tsai pool of
 * common dense parameter sets already has L/W of 3–7), so the margins are what make the window a
 * window; they and the thresholds come from the check settings, so the coverage page and the
 * review queue judge a parameter set the same way.
 */
import type { AxisScale } from "./coverage-grid";
import { settingOf, type CheckSettings } from "./check-settings";
import { criterionMargin } from "./checks/physics";
import { zeroContour, type ContourPoint } from "./contour";
import type { CriteriaThresholds, CriterionName, CriterionResult, Mechanism } from "./criteria";
import { analyzeMeltPool, type MeltPoolMaterial } from "./meltpool-analysis";
import { predictRegime, type RegimeLabel } from "./regime";

export const MECHANISMS: readonly Mechanism[] = ["lack_of_fusion", "keyhole", "balling"];

export type WindowMargins = Record<Mechanism, number>;

export interface WindowSettings {
  thresholds: Partial<CriteriaThresholds>;
  margins: WindowMargins;
}

/**
 * The thresholds and margins the outcome-versus-physics check reads, from a settings version.
 *
 * @example
 * windowSettingsFromChecks(defaultCheckSettings()).margins; // { lack_of_fusion: 0.75, keyhole: 0.75, balling: 3 }
 */
export function windowSettingsFromChecks(settings: CheckSettings): WindowSettings {
  return {
    thresholds: {
      lackOfFusionOverlap: settingOf(settings, "physics.lackOfFusion.overlap"),
      ballingLengthToWidth: settingOf(settings, "physics.balling.lengthToWidth"),
      keyholeWidthToDepth: settingOf(settings, "physics.keyhole.widthToDepth"),
    },
    margins: {
      lack_of_fusion: settingOf(settings, "physics.margin.lackOfFusion"),
      keyhole: settingOf(settings, "physics.margin.keyhole"),
      balling: settingOf(settings, "physics.margin.balling"),
    },
  };
}

/** One plane: everything but power and speed fixed. */
export interface WindowCase {
  material: MeltPoolMaterial;
  hatchSpacingUm: number;
  layerThicknessUm: number;
  /** 1/e² diameter. */
  spotDiameterUm: number;
  ambientTemperatureK: number;
  settings: WindowSettings;
}

export interface PointAssessment {
  laserPowerW: number;
  scanSpeedMmPerS: number;
  melted: boolean;
  /** Mechanisms strongly predicted (every criterion fires, the strongest beyond its margin). */
  indicated: Mechanism[];
  /** No mechanism strongly predicted and the powder melts. */
  inWindow: boolean;
  /** The regime from the strongly predicted mechanisms only: "dense" inside the window. */
  regime: RegimeLabel;
  /** Criteria past their threshold, whether or not beyond the margin. */
  fired: CriterionName[];
  criteria: CriterionResult[];
  /** Per mechanism, a continuous field ≥ 0 exactly where it is strongly predicted (for contours). */
  fields: Record<Mechanism, number>;
}

/**
 * Whether a mechanism is strongly predicted, and a continuous field whose sign says so:
 * min(every margin, strongest margin − margin of the mechanism). No evaluable criterion gives −1.
 *
 * @example
 * mechanismField(criteria, "balling", 3); // { indicated: false, field: -2.55 } for L/W 3.34 (margin 0.45)
 */
export function mechanismField(criteria: readonly CriterionResult[], mechanism: Mechanism, margin: number): { indicated: boolean; field: number } {
  let agree = true;
  let any = false;
  let lowest = Infinity;
  let strongest = -Infinity;
  for (const c of criteria) {
    if (c.mechanism !== mechanism) continue;
    const m = criterionMargin({ mode: c.mechanism, name: c.rule, value: c.value, threshold: c.threshold, comparison: c.comparison, fired: c.fired, margin: c.margin });
    if (m === null) continue;
    any = true;
    if (!c.fired) agree = false;
    if (m < lowest) lowest = m;
    if (m > strongest) strongest = m;
  }
  if (!any) return { indicated: false, field: -1 };
  return { indicated: agree && strongest >= margin, field: Math.min(lowest, strongest - margin) };
}

/**
 * The criteria, the strongly predicted mechanisms and the window verdict at one power and speed.
 * Throws the RangeError of the melt-pool model for inputs it cannot use (zero power, say).
 *
 * @example
 * assessPoint(case316L, 200, 800); // { inWindow: true, regime: "dense", fired: ["balling_aspect", …], … }
 */
export function assessPoint(c: WindowCase, laserPowerW: number, scanSpeedMmPerS: number): PointAssessment {
  const analysis = analyzeMeltPool(
    {
      laserPowerW,
      scanSpeedMmPerS,
      spotDiameterUm: c.spotDiameterUm,
      hatchSpacingUm: c.hatchSpacingUm,
      layerThicknessUm: c.layerThicknessUm,
      ambientTemperatureK: c.ambientTemperatureK,
      material: c.material,
    },
    { criteria: { thresholds: c.settings.thresholds } },
  );
  const fields = {} as Record<Mechanism, number>;
  const indicated: Mechanism[] = [];
  for (const m of MECHANISMS) {
    const r = mechanismField(analysis.criteria, m, c.settings.margins[m]);
    fields[m] = r.field;
    if (r.indicated) indicated.push(m);
  }
  const melted = analysis.pool.melted;
  const strong = new Set(indicated);
  const regime = predictRegime(analysis.criteria.map((x) => ({ ...x, fired: x.fired && strong.has(x.mechanism) })), melted).label;
  return {
    laserPowerW,
    scanSpeedMmPerS,
    melted,
    indicated,
    inWindow: melted && indicated.length === 0,
    regime,
    fired: analysis.criteria.filter((x) => x.fired).map((x) => x.name),
    criteria: analysis.criteria,
    fields,
  };
}

export interface PlaneAxis {
  min: number;
  max: number;
  scale: AxisScale;
}

export interface WindowBoundary {
  mechanism: Mechanism;
  /** Polylines on the plane; the mechanism is strongly predicted on one side of each. */
  lines: { laserPowerW: number; scanSpeedMmPerS: number }[][];
}

const toScaled = (x: number, scale: AxisScale) => (scale === "log" ? Math.log(x) : x);
const fromScaled = (x: number, scale: AxisScale) => (scale === "log" ? Math.exp(x) : x);

/**
 * The boundaries of the lack-of-fusion, keyhole and balling regions over a power and speed range:
 * the field of each mechanism on a `resolution` × `resolution` lattice (evenly spaced in each
 * axis's scale), its zero contour by marching squares, and each crossing refined by bisection on
 * the model itself (`refineSteps` halvings of the lattice step).
 *
 * @example
 * windowBoundaries(case316L, { min: 50, max: 400, scale: "linear" }, { min: 200, max: 2000, scale: "log" })
 *   .find((b) => b.mechanism === "keyhole")?.lines[0]?.[0]; // { laserPowerW: …, scanSpeedMmPerS: … }
 */
export function windowBoundaries(c: WindowCase, power: PlaneAxis, speed: PlaneAxis, resolution = 32, refineSteps = 6): WindowBoundary[] {
  if (!Number.isInteger(resolution) || resolution < 2) throw new RangeError(`windowBoundaries: resolution must be a whole number from 2 up, got ${resolution}`);
  for (const [name, a] of [["power", power], ["speed", speed]] as const) {
    if (!(a.min > 0) || !(a.max > a.min) || !Number.isFinite(a.max)) throw new RangeError(`windowBoundaries: ${name} range must be positive with min < max, got [${a.min}, ${a.max}]`);
  }
  // Lattice in scaled coordinates: x = speed, y = power.
  const xs = Array.from({ length: resolution }, (_, i) => toScaled(speed.min, speed.scale) + ((toScaled(speed.max, speed.scale) - toScaled(speed.min, speed.scale)) * i) / (resolution - 1));
  const ys = Array.from({ length: resolution }, (_, i) => toScaled(power.min, power.scale) + ((toScaled(power.max, power.scale) - toScaled(power.min, power.scale)) * i) / (resolution - 1));
  const at = (x: number, y: number) => assessPoint(c, fromScaled(y, power.scale), fromScaled(x, speed.scale));
  const lattice = ys.map((y) => xs.map((x) => at(x, y)));
  return MECHANISMS.map((mechanism) => {
    const values = lattice.map((row) => row.map((p) => p.fields[mechanism]));
    const refine = (a: ContourPoint, fa: number, b: ContourPoint, _fb: number): ContourPoint => {
      let lo = a;
      let hi = b;
      const loInside = fa >= 0;
      for (let s = 0; s < refineSteps; s++) {
        const mid = { x: (lo.x + hi.x) / 2, y: (lo.y + hi.y) / 2 };
        const inside = at(mid.x, mid.y).fields[mechanism] >= 0;
        if (inside === loInside) lo = mid;
        else hi = mid;
      }
      return { x: (lo.x + hi.x) / 2, y: (lo.y + hi.y) / 2 };
    };
    const lines = zeroContour(xs, ys, values, refine).map((line) =>
      line.map((p) => ({ laserPowerW: fromScaled(p.y, power.scale), scanSpeedMmPerS: fromScaled(p.x, speed.scale) })),
    );
    return { mechanism, lines };
  });
}
