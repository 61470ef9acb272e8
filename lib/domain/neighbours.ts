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
 * For each record with a known outcome (or each of `targets`, if given), its up-to-k nearest
 * same-alloy records with a known outcome within the radius, nearest first (ties by id).
 *
 * @example
 * nearestNeighbours(records, neighbourParamsFrom(defaultCheckSettings())).get(42);
 * // [{ id: 17, outcome: "keyhole", distance: 0.31 }, ...]
 */
export function nearestNeighbours(records: readonly CheckRecord[], params: NeighbourParams, targets?: ReadonlySet<number>): Map<number, Neighbour[]> {
  const { radius, count } = params;
  if (!(radius > 0) || count < 1) throw new RangeError(`nearestNeighbours: radius and count must be positive, got ${radius} and ${count}`);
  const points: (Point | null)[] = records.map((r, i) => (isJudgedOutcome(r.outcome) ? toPoint(r, i, params.scale) : null));
  const grids = new Map<string, Map<string, Point[]>>();
  const cellOf = (pt: Point) => [Math.floor(pt.p / radius), Math.floor(pt.v / radius)] as const;
  for (let i = 0; i < records.length; i++) {
    const pt = points[i];
    if (!pt) continue;
    const alloy = records[i]!.alloyKey;
    let grid = grids.get(alloy);
    if (!grid) grids.set(alloy, (grid = new Map()));
    const [cp, cv] = cellOf(pt);
    const key = `${cp},${cv}`;
    const list = grid.get(key);
    if (list) list.push(pt);
    else grid.set(key, [pt]);
  }
  const out = new Map<number, Neighbour[]>();
  for (let i = 0; i < records.length; i++) {
    const r = records[i]!;
    if (targets && !targets.has(r.id)) continue;
    const pt = points[i];
    if (!pt) continue;
    const grid = grids.get(r.alloyKey)!;
    const [cp, cv] = cellOf(pt);
    const found: Neighbour[] = [];
    for (let dp = -1; dp <= 1; dp++) {
      for (let dv = -1; dv <= 1; dv++) {
        const list = grid.get(`${cp + dp},${cv + dv}`);
        if (!list) continue;
        for (const q of list) {
          if (q.index === i) continue;
          const d = distance(pt, q);
          if (d <= radius) {
            const other = records[q.index]!;
            found.push({ id: other.id, outcome: other.outcome, distance: d });
          }
        }
      }
    }
    found.sort((a, b) => a.distance - b.distance || a.id - b.id);
    out.set(r.id, found.slice(0, count));
  }
  return out;
}
