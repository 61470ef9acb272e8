/**
 * Missing process values, filled so that physics features and synthetic rows can be computed:
 * the median of the training rows of the same alloy, else of all training rows. The medians come
 * from training rows only, so validation and test rows never inform them.
 */
import { PROCESS_FIELDS, type ProcessField, type ProcessPoint } from "./process-point";

export interface FillReport {
  field: ProcessField;
  /** Rows (validation and test included) that had no value. */
  missing: number;
  /** How they were filled; null when nothing was missing. */
  method: string | null;
  /** The medians used, by alloy ("*" = all training rows), rounded for display. */
  values: Record<string, number>;
  /** Rows left empty because no training row had a value. */
  leftEmpty: number;
}

function median(values: number[]): number | null {
  if (!values.length) return null;
  const s = [...values].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
}

/**
 * Fills missing process values in place of copies; returns the filled points and one report per
 * field. `informs[i]` says whether row i is a training row (only those give medians).
 *
 * @example
 * fillMissing([{ ...p, spotDiameterUm: null }, p], ["316L", "316L"], [true, true]).points[0].spotDiameterUm; // p.spotDiameterUm
 */
export function fillMissing(points: readonly ProcessPoint[], alloys: readonly string[], informs: readonly boolean[]): { points: ProcessPoint[]; reports: FillReport[] } {
  if (points.length !== alloys.length || points.length !== informs.length) {
    throw new RangeError(`fillMissing: points (${points.length}), alloys (${alloys.length}) and informs (${informs.length}) must have the same length`);
  }
  const out = points.map((p) => ({ ...p }));
  const reports: FillReport[] = [];
  for (const field of PROCESS_FIELDS) {
    let missing = 0;
    for (const p of points) if (p[field] === null) missing += 1;
    if (missing === 0) {
      reports.push({ field, missing: 0, method: null, values: {}, leftEmpty: 0 });
      continue;
    }
    const byAlloy = new Map<string, number[]>();
    const all: number[] = [];
    points.forEach((p, i) => {
      const v = p[field];
      if (v === null || !informs[i]) return;
      all.push(v);
      const alloy = alloys[i]!;
      let list = byAlloy.get(alloy);
      if (!list) byAlloy.set(alloy, (list = []));
      list.push(v);
    });
    const overall = median(all);
    const medians = new Map<string, number | null>();
    const values: Record<string, number> = {};
    let leftEmpty = 0;
    out.forEach((p, i) => {
      if (p[field] !== null) return;
      const alloy = alloys[i]!;
      if (!medians.has(alloy)) medians.set(alloy, median(byAlloy.get(alloy) ?? []));
      const own = medians.get(alloy) ?? null;
      const v = own ?? overall;
      if (v === null) {
        leftEmpty += 1;
        return;
      }
      p[field] = v;
      values[own !== null ? alloy : "*"] = Math.round(v * 1e6) / 1e6;
    });
    reports.push({
      field,
      missing,
      method: "median of the real training rows of the same alloy; of all real training rows when the alloy has none",
      values: Object.fromEntries(Object.entries(values).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))),
      leftEmpty,
    });
  }
  return { points: out, reports };
}
