/**
 * Duplicate detection (DOMAIN.md, "Duplicates"):
 * - exact: same source and the same canonical values, each rounded to the precision it was entered
 *   with (so 0.1 mm and 100 µm agree, and conversion noise does not count);
 * - near: same alloy (each element within a tolerance) and every process value within tolerance,
 *   with the same result — republished data, double entry, fill-down errors;
 * - label conflict: the same process values (within tolerance) with different outcomes, or
 *   relative densities further apart than replicate specimens would be.
 * Same parameters with the same outcome but a moderately different density are replicate
 * specimens, not duplicates, and are not reported.
 *
 * Blocking on the alloy and a quantised (P, v) grid keeps the work near-linear: each record looks
 * only at the grid cells its tolerance box covers, never at all pairs.
 */
import { settingOf, type CheckSettings } from "./check-settings";
import { CHECKED_FIELDS } from "./checks/fields";
import type { CheckRecord } from "./checks/types";

export type PairKind = "exact" | "near" | "label_conflict";

export interface DuplicateTolerances {
  powerRelPct: number;
  powerAbsW: number;
  speedRelPct: number;
  hatchAbsUm: number;
  layerAbsUm: number;
  spotAbsUm: number;
  compositionWtPct: number;
  /** Densities within this many points are the same result. */
  densitySamePct: number;
  /** Densities further apart than this on the same parameters conflict. */
  densityConflictPct: number;
}

/** A pair of records; `a` is the smaller id. */
export interface DuplicatePair {
  a: number;
  b: number;
  kind: PairKind;
}

/**
 * The tolerances a settings version holds.
 *
 * @example
 * tolerancesFrom(defaultCheckSettings()).powerAbsW; // 2
 */
export function tolerancesFrom(settings: CheckSettings): DuplicateTolerances {
  return {
    powerRelPct: settingOf(settings, "duplicates.power.relPct"),
    powerAbsW: settingOf(settings, "duplicates.power.absW"),
    speedRelPct: settingOf(settings, "duplicates.speed.relPct"),
    hatchAbsUm: settingOf(settings, "duplicates.hatch.absUm"),
    layerAbsUm: settingOf(settings, "duplicates.layer.absUm"),
    spotAbsUm: settingOf(settings, "duplicates.spot.absUm"),
    compositionWtPct: settingOf(settings, "duplicates.composition.wtPct"),
    densitySamePct: settingOf(settings, "duplicates.density.samePct"),
    densityConflictPct: settingOf(settings, "duplicates.density.conflictPct"),
  };
}

function significantDigits(text: string): number | null {
  const mantissa = text.trim().replace(/^[+\-\u2212]/, "").replace(/[eE].*$/, "").replace(/[^\d.,]/g, "");
  const digits = mantissa.replace(/[.,]/g, "").replace(/^0+/, "");
  if (digits === "") return null;
  return Math.min(15, Math.max(1, digits.length));
}

function rounded(value: number | null, text: string | undefined): string {
  if (value === null || !Number.isFinite(value)) return "";
  const digits = (text !== undefined ? significantDigits(text) : null) ?? 12;
  return String(Number(value.toPrecision(digits)));
}

/**
 * The exact-duplicate key of a record: source, alloy, composition, every canonical value rounded
 * to the significant digits it was entered with, outcome, machine, atmosphere. Equal keys mean an
 * exact duplicate.
 *
 * @example
 * exactKeyOf(a) === exactKeyOf(b); // true when b repeats a row of the same source
 */
export function exactKeyOf(r: CheckRecord): string {
  const parts: string[] = [String(r.sourceId), r.alloyKey, compositionSignature(r.components)];
  for (const info of CHECKED_FIELDS) parts.push(rounded(r[info.key], r.entered[info.field]?.text));
  parts.push(r.outcome, r.machine ?? "", r.atmosphere ?? "", r.spotDefinition ?? "");
  return parts.join("|");
}

const signatureCache = new WeakMap<object, string>();
function compositionSignature(components: CheckRecord["components"]): string {
  const cached = signatureCache.get(components);
  if (cached !== undefined) return cached;
  const s = [...components]
    .sort((x, y) => (x.element < y.element ? -1 : x.element > y.element ? 1 : 0))
    .map((c) => `${c.element}${Number(c.amount.toPrecision(6))}`)
    .join(",");
  signatureCache.set(components, s);
  return s;
}

function close(a: number | null, b: number | null, abs: number, rel: number): boolean {
  if (a === null || b === null) return a === b;
  return Math.abs(a - b) <= Math.max(abs, rel * Math.max(Math.abs(a), Math.abs(b))) + 1e-9;
}

/** `close` on numbers where NaN stands for a missing value (missing matches only missing). */
function closeFlat(a: number, b: number, abs: number, rel: number): boolean {
  if (a !== a || b !== b) return a !== a && b !== b;
  return Math.abs(a - b) <= Math.max(abs, rel * Math.max(Math.abs(a), Math.abs(b))) + 1e-9;
}

function sameComposition(x: CheckRecord["components"], y: CheckRecord["components"], tolerance: number): boolean {
  if (x === y || x.length === 0 || y.length === 0) return true;
  const amounts = new Map<string, number>();
  for (const c of x) amounts.set(c.element, c.amount);
  for (const c of y) {
    if (Math.abs((amounts.get(c.element) ?? 0) - c.amount) > tolerance + 1e-9) return false;
    amounts.delete(c.element);
  }
  for (const rest of amounts.values()) if (Math.abs(rest) > tolerance + 1e-9) return false;
  return true;
}

function knownOutcome(outcome: string): boolean {
  return outcome !== "unknown" && outcome !== "";
}

/** Whether the process values of two records agree within the tolerances (alloy not compared). */
function sameProcess(x: CheckRecord, y: CheckRecord, t: DuplicateTolerances): boolean {
  if (x.laserPowerW === null || y.laserPowerW === null || x.scanSpeedMmPerS === null || y.scanSpeedMmPerS === null) return false;
  return (
    close(x.laserPowerW, y.laserPowerW, t.powerAbsW, t.powerRelPct / 100) &&
    close(x.scanSpeedMmPerS, y.scanSpeedMmPerS, 0, t.speedRelPct / 100) &&
    close(x.hatchSpacingUm, y.hatchSpacingUm, t.hatchAbsUm, 0) &&
    close(x.layerThicknessUm, y.layerThicknessUm, t.layerAbsUm, 0) &&
    close(x.spotDiameterUm, y.spotDiameterUm, t.spotAbsUm, 0)
  );
}

/**
 * What two records are to each other: an exact duplicate (same exact key and, when both have P
 * and v, process values within tolerance), a near duplicate, a label conflict, or nothing (null).
 * `keyOf` lets a caller cache exact keys.
 *
 * @example
 * classifyPair(row, { ...row, id: 2 }, tolerances); // "exact"
 * classifyPair(row, { ...row, id: 2, sourceId: 9 }, tolerances); // "near" (republished elsewhere)
 * classifyPair(row, { ...row, id: 2, outcome: "keyhole" }, tolerances); // "label_conflict"
 */
export function classifyPair(x: CheckRecord, y: CheckRecord, t: DuplicateTolerances, keyOf: (r: CheckRecord) => string = exactKeyOf): PairKind | null {
  if (x.alloyKey !== y.alloyKey) return null;
  const hasPowerAndSpeed = x.laserPowerW !== null && y.laserPowerW !== null && x.scanSpeedMmPerS !== null && y.scanSpeedMmPerS !== null;
  if (!hasPowerAndSpeed) return keyOf(x) === keyOf(y) ? "exact" : null;
  if (!sameProcess(x, y, t)) return null;
  if (keyOf(x) === keyOf(y)) return "exact";
  if (!sameComposition(x.components, y.components, t.compositionWtPct)) return null;
  const bothKnown = knownOutcome(x.outcome) && knownOutcome(y.outcome);
  if (bothKnown && x.outcome !== y.outcome) return "label_conflict";
  const dx = x.relativeDensityPct;
  const dy = y.relativeDensityPct;
  if (dx !== null && dy !== null && Math.abs(dx - dy) > t.densityConflictPct + 1e-9) return "label_conflict";
  const sameDensity = dx === null || dy === null ? dx === dy : Math.abs(dx - dy) <= t.densitySamePct + 1e-9;
  return x.outcome === y.outcome && sameDensity ? "near" : null;
}

export interface FindDuplicatesOptions {
  /** Pairs a reviewer marked distinct; never reported again. */
  isDistinct?: (a: number, b: number) => boolean;
}

const MIN_CELL = 1e-6;
/** The block key of records without a layer thickness (no real bucket is this low). */
const NO_LAYER = Number.MIN_SAFE_INTEGER;

interface Block {
  /** Record indices, ascending (the order records were met). */
  members: number[];
  /** (P cell, v cell) of each member, two numbers a member. */
  cells: number[];
  /** P, v, h, t, d of each member, five numbers a member (NaN where missing). */
  raw: number[];
  pMin: number;
  pMax: number;
  vMin: number;
  vMax: number;
  /** Cell number of each member, ascending. */
  keys: Float64Array;
  /** Record index of each member, in cell order (ties by index). */
  order: Int32Array;
  /** Where each cell's members begin in `order` (one past the last cell at the end), when the grid is dense enough to keep one. */
  starts: Int32Array | null;
  /** `raw` in cell order. */
  values: Float64Array;
}

const WIDTH = 5;
const EMPTY_F64 = new Float64Array(0);
const EMPTY_I32 = new Int32Array(0);

/**
 * Orders a block's members by (P, v) cell, ties by record index. A counting sort when the grid is
 * not much larger than the block (linear time, the usual case), a comparison sort otherwise.
 * Everything it reads is the block's own.
 */
function sortBlock(g: Block): void {
  const n = g.members.length;
  const vSpan = g.vMax - g.vMin + 1;
  const cells = (g.pMax - g.pMin + 1) * vSpan;
  const cellAt = new Float64Array(n);
  for (let m = 0; m < n; m++) cellAt[m] = (g.cells[2 * m]! - g.pMin) * vSpan + (g.cells[2 * m + 1]! - g.vMin);
  // perm[k] = the member position that comes k-th in cell order.
  const perm = new Int32Array(n);
  if (cells <= 4 * n + 1024) {
    // Members are already in ascending index order, and a counting sort is stable.
    const counts = new Int32Array(cells + 1);
    for (let m = 0; m < n; m++) counts[cellAt[m]! + 1]!++;
    for (let c = 0; c < cells; c++) counts[c + 1]! += counts[c]!;
    g.starts = Int32Array.from(counts);
    for (let m = 0; m < n; m++) perm[counts[cellAt[m]!]!++] = m;
  } else {
    // A sparse grid (values spread over decades): a comparison sort, ties by position.
    for (let m = 0; m < n; m++) perm[m] = m;
    perm.sort((a, b) => cellAt[a]! - cellAt[b]! || a - b);
  }
  const order = new Int32Array(n);
  const keys = new Float64Array(n);
  const values = new Float64Array(WIDTH * n);
  for (let k = 0; k < n; k++) {
    const m = perm[k]!;
    order[k] = g.members[m]!;
    keys[k] = cellAt[m]!;
    for (let c = 0; c < WIDTH; c++) values[WIDTH * k + c] = g.raw[WIDTH * m + c]!;
  }
  g.order = order;
  g.keys = keys;
  g.values = values;
  // The build lists are not needed any more.
  g.cells = [];
  g.raw = [];
}

/** Layer buckets 10 µm wide, edges at 7.5, 17.5, 27.5 µm…, so the common layers (20, 25, 30, 40 µm) sit well inside one. */
const LAYER_BUCKET_UM = 10;
const LAYER_OFFSET_UM = 2.5;

/**
 * Every exact, near and label-conflict pair among the records, each once with a < b, sorted by
 * (b, a). Blocking: records with P and v are put in cells of an (alloy, layer bucket, ln P, ln v)
 * grid whose (P, v) cell size is the relative tolerance; each record compares itself only with the records in the cells
 * its tolerance box covers. Records without P or v can only be exact duplicates (found by key).
 *
 * @example
 * findDuplicatePairs([r1, r2, r3], tolerancesFrom(defaultCheckSettings()));
 * // [{ a: 1, b: 3, kind: "exact" }]
 */
export function findDuplicatePairs(records: readonly CheckRecord[], t: DuplicateTolerances, options: FindDuplicatesOptions = {}): DuplicatePair[] {
  const isDistinct = options.isDistinct ?? (() => false);
  // Exact keys are built only for records that meet a candidate: most records never do.
  const keys = new Map<CheckRecord, string>();
  const keyOf = (r: CheckRecord) => {
    let k = keys.get(r);
    if (k === undefined) keys.set(r, (k = exactKeyOf(r)));
    return k;
  };
  const pairs: DuplicatePair[] = [];
  const push = (i: number, j: number, kind: PairKind) => {
    const a = Math.min(records[i]!.id, records[j]!.id);
    const b = Math.max(records[i]!.id, records[j]!.id);
    if (!isDistinct(a, b)) pairs.push({ a, b, kind });
  };

  const powerRel = t.powerRelPct / 100;
  const speedRel = t.speedRelPct / 100;
  const wP = Math.max(Math.log1p(powerRel), MIN_CELL);
  const wV = Math.max(Math.log1p(speedRel), MIN_CELL);
  const num = (x: number | null) => (x === null ? Number.NaN : x);
  // Records without P or v can only be exact duplicates, found by key.
  const byKey = new Map<string, number[]>();
  // Blocks: alloy, then a coarse layer-thickness bucket (layers come in few values, so this splits
  // the work several ways; NO_LAYER holds records without a layer). Nested maps, so a lookup builds
  // no key string. Each block keeps its members' cells and values in its own arrays, so the
  // candidate loop reads small contiguous arrays, not the record objects.
  const layerBucket = (t: number) => Math.floor((t + LAYER_OFFSET_UM) / LAYER_BUCKET_UM);
  const blocksByAlloy = new Map<string, Map<number, Block>>();
  for (let i = 0; i < records.length; i++) {
    const r = records[i]!;
    const p = r.laserPowerW;
    const v = r.scanSpeedMmPerS;
    if (p === null || v === null || !(p > 0) || !(v > 0)) {
      const k = keyOf(r);
      const list = byKey.get(k);
      if (list) list.push(i);
      else byKey.set(k, [i]);
      continue;
    }
    const pc = Math.floor(Math.log(p) / wP);
    const vc = Math.floor(Math.log(v) / wV);
    const bucket = r.layerThicknessUm === null ? NO_LAYER : layerBucket(r.layerThicknessUm);
    let byBucket = blocksByAlloy.get(r.alloyKey);
    if (!byBucket) blocksByAlloy.set(r.alloyKey, (byBucket = new Map()));
    let g = byBucket.get(bucket);
    if (!g) {
      g = { members: [], cells: [], raw: [], pMin: pc, pMax: pc, vMin: vc, vMax: vc, keys: EMPTY_F64, order: EMPTY_I32, starts: null, values: EMPTY_F64 };
      byBucket.set(bucket, g);
    }
    g.members.push(i);
    g.cells.push(pc, vc);
    g.raw.push(p, v, num(r.hatchSpacingUm), num(r.layerThicknessUm), num(r.spotDiameterUm));
    if (pc < g.pMin) g.pMin = pc;
    if (pc > g.pMax) g.pMax = pc;
    if (vc < g.vMin) g.vMin = vc;
    if (vc > g.vMax) g.vMax = vc;
  }
  for (const list of byKey.values()) {
    for (let x = 0; x < list.length; x++) for (let y = x + 1; y < list.length; y++) push(list[x]!, list[y]!, "exact");
  }
  // Each block's records sorted by cell number: a row of the (P, v) grid is then one contiguous
  // run of cell numbers, and its records sit next to each other.
  for (const byBucket of blocksByAlloy.values()) for (const g of byBucket.values()) sortBlock(g);

  // Queries go block by block in cell order, so a record's candidates are usually the ones the
  // previous query touched: the values sit in the blocks' own arrays, read in order.
  for (const byBucket of blocksByAlloy.values()) {
    for (const gq of byBucket.values()) {
      const qv = gq.values;
      for (let kq = 0; kq < gq.order.length; kq++) {
        const i = gq.order[kq]!;
        const p = qv[5 * kq]!;
        const v = qv[5 * kq + 1]!;
        const qh = qv[5 * kq + 2]!;
        const layer = qv[5 * kq + 3]!;
        const qd = qv[5 * kq + 4]!;
        // The box that holds every power within tolerance of p (either side's relative bound).
        const pLo = Math.min(p - t.powerAbsW, p * (1 - powerRel)) - 1e-9;
        const pHi = Math.max(p + t.powerAbsW, powerRel < 1 ? p / (1 - powerRel) : Number.POSITIVE_INFINITY) + 1e-9;
        const vLo = v * (1 - speedRel) - 1e-9;
        const vHi = (speedRel < 1 ? v / (1 - speedRel) : Number.POSITIVE_INFINITY) + 1e-9;
        const hasLayer = layer === layer;
        const b0 = hasLayer ? layerBucket(layer - t.layerAbsUm - 1e-9) : NO_LAYER;
        const b1 = hasLayer ? layerBucket(layer + t.layerAbsUm + 1e-9) : NO_LAYER;
        for (let bucket = b0; bucket <= b1; bucket++) {
          const g = byBucket.get(bucket);
          if (!g) continue;
          const { keys, order, values, starts } = g;
          const vSpan = g.vMax - g.vMin + 1;
          const p0 = Math.max(g.pMin, pLo > 0 ? Math.floor(Math.log(pLo) / wP) : g.pMin);
          const p1 = Math.min(g.pMax, Math.floor(Math.log(pHi) / wP));
          const v0 = Math.max(g.vMin, vLo > 0 ? Math.floor(Math.log(vLo) / wV) : g.vMin);
          const v1 = Math.min(g.vMax, Math.floor(Math.log(vHi) / wV));
          for (let pc = p0; pc <= p1; pc++) {
            const from = (pc - g.pMin) * vSpan + (v0 - g.vMin);
            const to = (pc - g.pMin) * vSpan + (v1 - g.vMin);
            let lo: number;
            let end: number;
            if (starts) {
              lo = starts[from]!;
              end = starts[to + 1]!;
            } else {
              lo = 0;
              let hi = keys.length;
              while (lo < hi) {
                const mid = (lo + hi) >> 1;
                if (keys[mid]! < from) lo = mid + 1;
                else hi = mid;
              }
              end = keys.length;
            }
            for (let k = lo; k < end && keys[k]! <= to; k++) {
              const j = order[k]!;
              if (j >= i) continue;
              // Cheap screen on the flat arrays (the same tolerances as sameProcess); the full
              // classification runs only for the few candidates that pass.
              const o = 5 * k;
              if (!closeFlat(p, values[o]!, t.powerAbsW, powerRel) || !closeFlat(v, values[o + 1]!, 0, speedRel)) continue;
              if (!closeFlat(qh, values[o + 2]!, t.hatchAbsUm, 0) || !closeFlat(layer, values[o + 3]!, t.layerAbsUm, 0) || !closeFlat(qd, values[o + 4]!, t.spotAbsUm, 0)) continue;
              const kind = classifyPair(records[i]!, records[j]!, t, keyOf);
              if (kind) push(j, i, kind);
            }
          }
        }
      }
    }
  }
  return pairs.sort((x, y) => x.b - y.b || x.a - y.a);
}

/**
 * One pair per record and kind, the way review shows them: each record that repeats or conflicts
 * with earlier ones is paired with the earliest of them (the likely original); `others` lists every
 * earlier match of that kind. A record is never paired with a later one, so a cluster of n copies
 * gives n − 1 pairs.
 *
 * @example
 * pairsForReview([{ a: 1, b: 3, kind: "exact" }, { a: 2, b: 3, kind: "exact" }]);
 * // [{ recordId: 3, relatedId: 1, kind: "exact", others: [1, 2] }]
 */
export function pairsForReview(pairs: readonly DuplicatePair[]): { recordId: number; relatedId: number; kind: PairKind; others: number[] }[] {
  const grouped = new Map<string, { recordId: number; relatedId: number; kind: PairKind; others: number[] }>();
  for (const p of pairs) {
    const key = `${p.b}|${p.kind}`;
    const g = grouped.get(key);
    if (!g) grouped.set(key, { recordId: p.b, relatedId: p.a, kind: p.kind, others: [p.a] });
    else {
      g.others.push(p.a);
      if (p.a < g.relatedId) g.relatedId = p.a;
    }
  }
  return [...grouped.values()].map((g) => ({ ...g, others: g.others.sort((x, y) => x - y) }));
}
