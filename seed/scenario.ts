/**
 * The invented demo scenario: a lab, its users, ten sources and about 3,000 build records over
 * 316L, Ti-6Al-4V, AlSi10Mg and IN718, with problems planted for the review work.
 *
 * Pure and seeded: the same seed gives the same scenario. Everything here is invented — lab,
 * people, titles, venues, machines and numbers. DOIs use the 10.5555 test prefix.
 *
 * The records come from a toy physics model: E_v = P/(v·h·t) with noise, labelled by
 * alloy-specific energy windows, and a relative density that falls smoothly outside the window.
 * The windows are rough figures of common practice, from memory, chosen so the demo looks like
 * the trade's data; they are not fitted to any data set and are no process advice.
 */
import { mapOutcome, type Outcome } from "../lib/domain/outcomes";
import { fromCanonical, normalizeUnit, type Quantity } from "../lib/domain/units";
import { createPrng, type Prng } from "./prng";
import {
  ALLOYS,
  ALSI_SPEED_CAP_MM_PER_S,
  CONTRIBUTORS,
  HOLE_316L,
  LAB,
  SOURCES,
  USERS,
  VOCABULARY,
  spec,
  type AlloyName,
  type PhysicalOutcome,
  type SourceSpec,
} from "./scenario-world";

export { ALSI_SPEED_CAP_MM_PER_S, DEMO_ALLOYS, DEMO_DENSE_WINDOWS_J_PER_MM3, HOLE_316L } from "./scenario-world";

export interface QuantityText {
  value: string;
  unit: string;
}

export interface ScenarioSource {
  key: string;
  kind: string;
  title: string;
  authors: string[];
  year: number | null;
  venue: string | null;
  doi: string | null;
  url: string | null;
  notes: string | null;
  densityMethod: string;
  outcomeEvidence: string;
  machineStated: boolean;
  spotSizeDefinition: string | null;
  powderReported: boolean;
  atmosphereReported: boolean;
}

export type ProvenanceField =
  | "laserPower"
  | "scanSpeed"
  | "hatchSpacing"
  | "layerThickness"
  | "spotDiameter"
  | "preheat"
  | "powderD10"
  | "powderD50"
  | "powderD90"
  | "relativeDensity";

export interface ScenarioRecord {
  key: string;
  sourceKey: string;
  locationPage: number | null;
  locationLabel: string | null;
  alloy: string;
  machine: string | null;
  laserPower: QuantityText;
  scanSpeed: QuantityText;
  hatchSpacing: QuantityText;
  layerThickness: QuantityText;
  spotDiameter: QuantityText;
  spotDefinition: "one_over_e2" | "d4sigma" | "fwhm" | null;
  preheat: QuantityText;
  atmosphere: string | null;
  scanStrategy: string | null;
  powderD10: QuantityText;
  powderD50: QuantityText;
  powderD90: QuantityText;
  outcome: Outcome;
  outcomeText: string | null;
  relativeDensity: QuantityText;
  provenance: Partial<Record<ProvenanceField, "reported" | "derived" | "assumed">>;
  createdBy: string;
  dayOffset: number;
}

export const PLANTED_PROBLEM_KINDS = [
  "exact_duplicate",
  "near_duplicate",
  "unit_slip",
  "implausible_value",
  "physics_contradiction",
  "label_conflict",
  "thin_region",
] as const;
export type PlantedProblemKind = (typeof PLANTED_PROBLEM_KINDS)[number];

export interface PlantedProblem {
  kind: PlantedProblemKind;
  recordKeys: string[];
  note: string;
}

export interface Scenario {
  lab: { name: string; city: string; description: string };
  users: { name: string; role: "contributor" | "reviewer" | "admin" }[];
  sources: ScenarioSource[];
  records: ScenarioRecord[];
  plantedProblems: PlantedProblem[];
}

export const DEFAULT_RECORD_COUNT = 3_000;
export const MIN_RECORD_COUNT = 200;
export const MAX_RECORD_COUNT = 4_000;

// ---------------------------------------------------------------------------------------------
// Toy physics

/** What actually happened to a build, before a source words it. */
interface Truth {
  sourceKey: string;
  alloy: AlloyName;
  powerW: number;
  speedMmPerS: number;
  hatchUm: number;
  layerUm: number;
  outcome: PhysicalOutcome;
  relativeDensityPct: number;
  /** The source does not say what happened. */
  withheld: boolean;
}

/** E_v = P/(v·h·t) in J/mm³ with h and t converted from µm to mm. */
function volumetricEnergy(t: Pick<Truth, "powerW" | "speedMmPerS" | "hatchUm" | "layerUm">): number {
  return t.powerW / (t.speedMmPerS * (t.hatchUm / 1000) * (t.layerUm / 1000));
}

function physicalOutcome(rng: Prng, alloy: AlloyName, powerW: number, speedMmPerS: number, hatchUm: number, energy: number): PhysicalOutcome {
  const model = ALLOYS[alloy];
  const [low, high] = model.denseWindowJPerMm3;
  const felt = energy * Math.exp(rng.normal(0, 0.1)); // powder, gas flow, position on the plate
  if (speedMmPerS >= model.ballingMinSpeedMmPerS && powerW >= model.ballingMinPowerW && felt >= 0.8 * low && rng.chance(0.7)) {
    return "balling";
  }
  if (felt < low) return "lack_of_fusion";
  if (felt > high) return "keyhole";
  if (alloy === "IN718" && rng.chance(hatchUm <= 90 && powerW >= 300 ? 0.5 : 0.03)) return "cracking";
  return "dense";
}

/** Relative density falling smoothly on both sides of the window, steeper towards lack of fusion. */
function relativeDensity(rng: Prng, alloy: AlloyName, energy: number, outcome: PhysicalOutcome): number {
  const [low, high] = ALLOYS[alloy].denseWindowJPerMm3;
  const halfWidth = Math.log(high / low) / 2;
  const z = Math.log(energy / Math.sqrt(low * high)) / halfWidth; // -1 and +1 at the window edges
  const deficit =
    z < 0 ? 0.9 * z * z + 4 * Math.max(0, -z - 1) ** 2 : 0.5 * z * z + 1.5 * Math.max(0, z - 1) ** 2;
  const extra = outcome === "balling" ? 1.5 : outcome === "cracking" ? 0.3 : 0;
  const rd = 99.7 - deficit - extra + rng.normal(0, 0.15 + 0.05 * deficit);
  return Math.min(99.95, Math.max(60, rd));
}

// ---------------------------------------------------------------------------------------------
// Rendering a build as a source reports it

const DECIMALS: Record<string, number> = { W: 0, kW: 3, "mm/s": 0, "m/s": 3, "mm/min": 0, "m/min": 2, "in/s": 1, µm: 0, mm: 3, in: 4, mil: 2, "°C": 0, K: 0, "°F": 0 };

function trimNumber(x: number, decimals: number): string {
  let s = x.toFixed(decimals);
  if (s.includes(".")) s = s.replace(/0+$/, "").replace(/\.$/, "");
  return s === "-0" ? "0" : s;
}

const unitIds = new Map<string, string>();

function unitId(spelling: string): string {
  const known = unitIds.get(spelling);
  if (known !== undefined) return known;
  const id = normalizeUnit(spelling);
  if (id === null) throw new RangeError(`generateScenario: unknown unit spelling '${spelling}'`);
  unitIds.set(spelling, id);
  return id;
}

function text(canonical: number, spelling: string, quantity: Quantity, decimalComma: boolean, decimals?: number): QuantityText {
  const id = unitId(spelling);
  const s = trimNumber(fromCanonical(canonical, id, quantity), decimals ?? DECIMALS[id] ?? 3);
  return { value: decimalComma ? s.replace(".", ",") : s, unit: spelling };
}

const NOT_REPORTED: QuantityText = { value: "", unit: "" };

function densityText(s: SourceSpec, rd: number): QuantityText {
  if (s.densityDecimals === null) return NOT_REPORTED;
  const id = unitId(s.units.density);
  const decimals = id === "fraction" ? s.densityDecimals + 2 : s.densityDecimals;
  return text(rd, s.units.density, "relativeDensity", s.decimalComma, decimals);
}

function outcomeOf(s: SourceSpec, t: Truth): { outcome: Outcome; outcomeText: string | null } {
  const outcomeText = t.withheld ? s.outcomeWithheld.text : s.vocabulary(t.outcome, t.relativeDensityPct);
  return { outcome: outcomeText === null ? "unknown" : mapOutcome(outcomeText).outcome, outcomeText };
}

function render(t: Truth, key: string, createdBy: string, dayOffset: number): ScenarioRecord {
  const s = spec(t.sourceKey);
  const comma = s.decimalComma;
  const grid = s.grids.find((g) => g.alloy === t.alloy);
  const hatchIndex = Math.max(0, grid ? grid.hatchUm.findIndex((h) => Math.abs(h - t.hatchUm) < 1.5) : 0);
  const location = s.locations[(hatchIndex + (grid ? s.grids.indexOf(grid) : 0)) % s.locations.length];
  const preheatC = s.preheatC[t.alloy];
  const powder = ALLOYS[t.alloy].powderUm;
  const provenance: ScenarioRecord["provenance"] = {
    laserPower: "reported",
    scanSpeed: "reported",
    hatchSpacing: "reported",
    layerThickness: "reported",
  };
  if (s.spotUm !== null) provenance.spotDiameter = s.spotProvenance;
  if (preheatC !== undefined) provenance.preheat = s.preheatProvenance;
  if (s.powder === "d10_d50_d90") Object.assign(provenance, { powderD10: "reported", powderD50: "reported", powderD90: "reported" });
  if (s.powder === "d50") provenance.powderD50 = "reported";
  if (s.densityDecimals !== null) provenance.relativeDensity = s.densityProvenance;
  const definition = s.source.spotSizeDefinition;
  return {
    key,
    sourceKey: s.source.key,
    locationPage: location?.page ?? null,
    locationLabel: location?.label ?? null,
    alloy: t.alloy,
    machine: s.machine,
    laserPower: text(t.powerW, s.units.power, "laserPower", comma),
    scanSpeed: text(t.speedMmPerS, s.units.speed, "scanSpeed", comma),
    hatchSpacing: text(t.hatchUm, s.units.hatch, "hatchSpacing", comma),
    layerThickness: text(t.layerUm, s.units.layer, "layerThickness", comma),
    spotDiameter: s.spotUm === null ? NOT_REPORTED : text(s.spotUm, s.units.spot, "spotDiameter", comma),
    spotDefinition:
      s.spotUm !== null && (definition === "one_over_e2" || definition === "d4sigma" || definition === "fwhm") ? definition : null,
    preheat: preheatC === undefined ? NOT_REPORTED : text(preheatC, s.units.preheat, "preheat", comma),
    atmosphere: s.source.atmosphereReported ? (t.alloy === "316L" && s.source.kind === "shop_trial" ? "nitrogen" : ALLOYS[t.alloy].atmosphere) : null,
    scanStrategy: s.scanStrategy,
    powderD10: s.powder === "d10_d50_d90" ? text(powder.d10, s.units.powder, "powderSize", comma) : NOT_REPORTED,
    powderD50: s.powder !== null ? text(powder.d50, s.units.powder, "powderSize", comma) : NOT_REPORTED,
    powderD90: s.powder === "d10_d50_d90" ? text(powder.d90, s.units.powder, "powderSize", comma) : NOT_REPORTED,
    ...outcomeOf(s, t),
    relativeDensity: densityText(s, t.relativeDensityPct),
    provenance,
    createdBy,
    dayOffset,
  };
}

// ---------------------------------------------------------------------------------------------
// Generation

function inHole316L(alloy: AlloyName, powerW: number, speedMmPerS: number): boolean {
  const h = HOLE_316L;
  return alloy === "316L" && powerW >= h.minPowerW && powerW <= h.maxPowerW && speedMmPerS >= h.minSpeedMmPerS && speedMmPerS <= h.maxSpeedMmPerS;
}

/** Splits `total` into integer parts proportional to `shares` (largest remainder). */
function apportion(total: number, shares: readonly number[]): number[] {
  const sum = shares.reduce((a, b) => a + b, 0);
  const exact = shares.map((s) => (total * s) / sum);
  const parts = exact.map(Math.floor);
  const order = exact.map((x, i) => ({ i, r: x - Math.floor(x) })).sort((a, b) => b.r - a.r || a.i - b.i);
  const remainder = total - parts.reduce((a, b) => a + b, 0);
  for (let k = 0; k < remainder; k += 1) {
    const slot = order[k % order.length];
    if (slot) parts[slot.i] = (parts[slot.i] ?? 0) + 1;
  }
  return parts;
}

interface Built {
  truth: Truth;
  record: ScenarioRecord;
}

function baseRecords(rng: Prng, count: number, nextKey: () => string): Built[] {
  const out: Built[] = [];
  const perSource = apportion(count, SOURCES.map((s) => s.share));
  SOURCES.forEach((s, si) => {
    const perAlloy = apportion(perSource[si] ?? 0, s.grids.map((g) => g.share));
    let entered = 0;
    s.grids.forEach((g, gi) => {
      const combos: [number, number, number, number][] = [];
      for (const p of g.powerW)
        for (const v of g.speedMmPerS)
          for (const h of g.hatchUm) for (const t of g.layerUm) if (!inHole316L(g.alloy, p, v)) combos.push([p, v, h, t]);
      const wanted = perAlloy[gi] ?? 0;
      if (wanted > combos.length) {
        throw new RangeError(`generateScenario: source ${s.source.key} has ${combos.length} ${g.alloy} parameter sets, ${wanted} wanted`);
      }
      for (const [powerW, speedMmPerS, hatchUm, layerUm] of rng.shuffle(combos).slice(0, wanted)) {
        const energy = volumetricEnergy({ powerW, speedMmPerS, hatchUm, layerUm });
        const outcome = physicalOutcome(rng, g.alloy, powerW, speedMmPerS, hatchUm, energy);
        const truth: Truth = {
          sourceKey: s.source.key,
          alloy: g.alloy,
          powerW,
          speedMmPerS,
          hatchUm,
          layerUm,
          outcome,
          relativeDensityPct: relativeDensity(rng, g.alloy, energy, outcome),
          withheld: rng.chance(s.outcomeWithheld.share),
        };
        const dayOffset = s.firstDay + Math.floor(entered / 60); // about 60 records a day
        entered += 1;
        out.push({ truth, record: render(truth, nextKey(), s.createdBy, dayOffset) });
      }
    });
  });
  return out;
}

/** A number for notes: thousands separated by commas, at most `digits` decimals. */
function fmt(x: number, digits = 0): string {
  const [whole = "", fraction] = trimNumber(x, digits).split(".");
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  return fraction === undefined ? grouped : `${grouped}.${fraction}`;
}

interface Planter {
  rng: Prng;
  base: Built[];
  used: Set<string>;
  added: ScenarioRecord[];
  problems: PlantedProblem[];
  nextKey: () => string;
}

/** Picks up to `n` unused base records that pass `accept`, and marks them used. */
function take(p: Planter, n: number, accept: (b: Built) => boolean): Built[] {
  const candidates = p.base.filter((b) => !p.used.has(b.record.key) && accept(b));
  const chosen: Built[] = [];
  // partial Fisher–Yates: the first n places of a shuffle
  for (let i = 0; i < Math.min(n, candidates.length); i += 1) {
    const j = p.rng.int(i, candidates.length - 1);
    const picked = candidates[j] as Built;
    candidates[j] = candidates[i] as Built;
    candidates[i] = picked;
    chosen.push(picked);
  }
  for (const b of chosen) p.used.add(b.record.key);
  return chosen;
}

function laterDay(p: Planter): number {
  return p.rng.int(75, 120);
}

function plantThinAlSi(p: Planter): void {
  const keys: string[] = [];
  for (const speedMmPerS of [2000, 2200, 2400]) {
    const powerW = p.rng.pick([380, 400]);
    const hatchUm = 160;
    const layerUm = 30;
    const energy = volumetricEnergy({ powerW, speedMmPerS, hatchUm, layerUm });
    const outcome = physicalOutcome(p.rng, "AlSi10Mg", powerW, speedMmPerS, hatchUm, energy);
    const truth: Truth = {
      sourceKey: "S08",
      alloy: "AlSi10Mg",
      powerW,
      speedMmPerS,
      hatchUm,
      layerUm,
      outcome,
      relativeDensityPct: relativeDensity(p.rng, "AlSi10Mg", energy, outcome),
      withheld: false,
    };
    const r = render(truth, p.nextKey(), "Maelis", 52);
    p.added.push(r);
    keys.push(r.key);
  }
  p.problems.push({
    kind: "thin_region",
    recordKeys: keys,
    note: `AlSi10Mg above ${fmt(ALSI_SPEED_CAP_MM_PER_S)} mm/s: only ${keys.length} records, all in one source.`,
  });
  p.problems.push({
    kind: "thin_region",
    recordKeys: [],
    note: `316L has no records at ${HOLE_316L.minPowerW}–${HOLE_316L.maxPowerW} W and ${fmt(HOLE_316L.minSpeedMmPerS)}–${fmt(HOLE_316L.maxSpeedMmPerS)} mm/s: a hole in the power–speed plane.`,
  });
}

function plantExactDuplicates(p: Planter, n: number): void {
  for (const b of take(p, n, () => true)) {
    const copy: ScenarioRecord = { ...structuredClone(b.record), key: p.nextKey(), createdBy: p.rng.pick(CONTRIBUTORS), dayOffset: laterDay(p) };
    p.added.push(copy);
    p.problems.push({ kind: "exact_duplicate", recordKeys: [b.record.key, copy.key], note: `Record ${b.record.key} of ${b.record.sourceKey} entered a second time.` });
  }
}

/** Republication: part of S01's data set appears again in S07 with values rounded differently. */
function plantNearDuplicates(p: Planter, n: number): void {
  for (const b of take(p, n, (x) => x.truth.sourceKey === "S01")) {
    const powerW = b.truth.powerW + p.rng.pick([-1, 0, 1]); // within ±2 W
    const speedMmPerS = Math.round(b.truth.speedMmPerS * (1 + p.rng.pick([-0.005, 0, 0.005]))); // within ±1 %
    const hatchUm = b.truth.hatchUm + p.rng.pick([-1, 0, 1]); // within ±1 µm
    const truth: Truth = { ...b.truth, sourceKey: "S07", powerW, speedMmPerS, hatchUm, withheld: false };
    const copy = render(truth, p.nextKey(), "Corvin", laterDay(p));
    p.added.push(copy);
    p.problems.push({
      kind: "near_duplicate",
      recordKeys: [b.record.key, copy.key],
      note: `S07 republishes ${b.record.key} of S01 (P ${fmt(b.truth.powerW)} → ${fmt(powerW)} W, v ${fmt(b.truth.speedMmPerS)} → ${fmt(speedMmPerS)} mm/s, h ${fmt(b.truth.hatchUm)} → ${fmt(hatchUm)} µm).`,
    });
  }
}

// targets whose units print these parameters exactly (no inch rounding)
const OTHER_SOURCE_SAME_ALLOY: Record<string, string> = { S01: "S04", S02: "S05", S04: "S06", S03: "S08", S10: "S02" };

function conflictingOutcome(t: Truth): PhysicalOutcome {
  if (t.outcome !== "dense") return "dense";
  const [low, high] = ALLOYS[t.alloy].denseWindowJPerMm3;
  return volumetricEnergy(t) < Math.sqrt(low * high) ? "lack_of_fusion" : "keyhole";
}

/** Same parameters, different outcome: half as a replicate in the same source, half in another source. */
function plantLabelConflicts(p: Planter, n: number): void {
  const chosen = take(p, n, (b) => {
    if (b.truth.withheld || b.record.outcome === "unknown") return false;
    const target = OTHER_SOURCE_SAME_ALLOY[b.truth.sourceKey];
    const t = target ? spec(target) : undefined;
    return !!t && t.grids.some((g) => g.alloy === b.truth.alloy);
  });
  chosen.forEach((b, i) => {
    const sameSource = i % 2 === 0;
    const sourceKey = sameSource ? b.truth.sourceKey : (OTHER_SOURCE_SAME_ALLOY[b.truth.sourceKey] ?? b.truth.sourceKey);
    const outcome = conflictingOutcome(b.truth);
    const relativeDensityPct = outcome === "dense" ? Math.max(b.truth.relativeDensityPct, 99.4) : Math.min(b.truth.relativeDensityPct, 96.5);
    const truth: Truth = { ...b.truth, sourceKey, outcome, relativeDensityPct, withheld: false };
    const copy = render(truth, p.nextKey(), p.rng.pick(CONTRIBUTORS), laterDay(p));
    if (copy.outcome === b.record.outcome) return; // the source's words cannot tell the two apart
    p.added.push(copy);
    p.problems.push({
      kind: "label_conflict",
      recordKeys: [b.record.key, copy.key],
      note: sameSource
        ? `A replicate specimen in ${sourceKey} with the parameters of ${b.record.key}: '${b.record.outcomeText}' vs '${copy.outcomeText}'.`
        : `${sourceKey} reports the parameters of ${b.record.key} (${b.truth.sourceKey}) with another outcome: '${b.record.outcomeText}' vs '${copy.outcomeText}'.`,
    });
  });
}

/** Labelled dense at an energy density far below the alloy's window. */
function plantPhysicsContradictions(p: Planter, n: number): void {
  const eligible = (factor: number) => (b: Built) =>
    !b.truth.withheld &&
    spec(b.truth.sourceKey).vocabulary !== VOCABULARY.densityOnly &&
    volumetricEnergy(b.truth) < factor * ALLOYS[b.truth.alloy].denseWindowJPerMm3[0];
  const chosen = take(p, n, eligible(0.6));
  if (chosen.length < n) chosen.push(...take(p, n - chosen.length, eligible(0.75)));
  for (const b of chosen) {
    const s = spec(b.truth.sourceKey);
    const outcomeText = s.vocabulary("dense", b.truth.relativeDensityPct);
    b.record.outcomeText = outcomeText;
    b.record.outcome = mapOutcome(outcomeText).outcome;
    b.truth = { ...b.truth, outcome: "dense" };
    const [low] = ALLOYS[b.truth.alloy].denseWindowJPerMm3;
    p.problems.push({
      kind: "physics_contradiction",
      recordKeys: [b.record.key],
      note: `Labelled '${outcomeText}' at E_v = ${fmt(volumetricEnergy(b.truth), 1)} J/mm³; dense ${b.truth.alloy} in this scenario needs about ${low} J/mm³ or more.`,
    });
  }
}

type SlipKind = "speed" | "hatch" | "layer" | "power";

const SLIP_COLUMN_UNIT: Record<SlipKind, string> = { speed: "mm/s", hatch: "µm", layer: "µm", power: "W" };

/** A value typed in the wrong unit for its column: one standard factor (÷ 1,000) away. */
function plantUnitSlips(p: Planter, n: number): void {
  const kinds: SlipKind[] = ["speed", "hatch", "layer", "speed", "hatch", "power", "layer", "speed", "hatch", "speed"];
  for (let i = 0; i < n; i += 1) {
    const kind = kinds[i % kinds.length] ?? "speed";
    const [b] = take(p, 1, (x) => unitId(spec(x.truth.sourceKey).units[kind]) === SLIP_COLUMN_UNIT[kind]);
    if (!b) continue;
    const unit = spec(b.truth.sourceKey).units[kind];
    const r = b.record;
    let note: string;
    switch (kind) {
      case "speed":
        r.scanSpeed = { value: trimNumber(b.truth.speedMmPerS / 1000, 3), unit };
        note = `Scan speed ${r.scanSpeed.value} in a ${unit} column: likely m/s (${fmt(b.truth.speedMmPerS)} mm/s).`;
        break;
      case "hatch":
        r.hatchSpacing = { value: trimNumber(b.truth.hatchUm / 1000, 3), unit };
        note = `Hatch spacing ${r.hatchSpacing.value} in a ${unit} column: likely mm (${fmt(b.truth.hatchUm)} µm).`;
        break;
      case "layer":
        r.layerThickness = { value: trimNumber(b.truth.layerUm / 1000, 3), unit };
        note = `Layer thickness ${r.layerThickness.value} in a ${unit} column: likely mm (${fmt(b.truth.layerUm)} µm).`;
        break;
      case "power":
        r.laserPower = { value: trimNumber(b.truth.powerW / 1000, 3), unit };
        note = `Laser power ${r.laserPower.value} in a ${unit} column: likely kW (${fmt(b.truth.powerW)} W).`;
        break;
    }
    p.problems.push({ kind: "unit_slip", recordKeys: [r.key], note });
  }
}

type ImplausibleKind = "power" | "speed" | "layer" | "density";

const IMPLAUSIBLE_ELIGIBLE: Record<ImplausibleKind, (b: Built) => boolean> = {
  power: (b) => unitId(spec(b.truth.sourceKey).units.power) === "W",
  speed: (b) => unitId(spec(b.truth.sourceKey).units.speed) === "mm/s",
  layer: (b) => unitId(spec(b.truth.sourceKey).units.layer) === "µm",
  density: (b) => b.record.relativeDensity.value !== "" && unitId(spec(b.truth.sourceKey).units.density) === "%",
};

/** Values outside the plausible range that no single unit factor explains well. */
function plantImplausibleValues(p: Planter, n: number): void {
  const kinds: ImplausibleKind[] = ["power", "speed", "layer", "density"];
  for (let i = 0; i < n; i += 1) {
    const kind = kinds[i % kinds.length] ?? "power";
    const [b] = take(p, 1, IMPLAUSIBLE_ELIGIBLE[kind]);
    if (!b) continue;
    const r = b.record;
    let note: string;
    switch (kind) {
      case "power":
        r.laserPower = { ...r.laserPower, value: "1800" };
        note = "Laser power 1,800 W: beyond the plausible range for this machine class.";
        break;
      case "speed":
        r.scanSpeed = { ...r.scanSpeed, value: "9" };
        note = "Scan speed 9 mm/s: far below LPBF practice.";
        break;
      case "layer":
        r.layerThickness = { ...r.layerThickness, value: "400" };
        note = "Layer thickness 400 µm: far thicker than LPBF layers.";
        break;
      case "density":
        r.relativeDensity = { ...r.relativeDensity, value: spec(b.truth.sourceKey).decimalComma ? "100,6" : "100.6" };
        note = "Relative density 100.6 %: above 100 %, a reference-density issue.";
        break;
    }
    p.problems.push({ kind: "implausible_value", recordKeys: [r.key], note });
  }
}

/**
 * Generates the demo scenario.
 *
 * @example
 * const s = generateScenario(20261201);
 * s.records.length;           // 3000
 * s.plantedProblems[0]?.kind; // "thin_region"
 */
export function generateScenario(seed: number, options?: { recordCount?: number }): Scenario {
  const recordCount = options?.recordCount ?? DEFAULT_RECORD_COUNT;
  if (!Number.isInteger(recordCount) || recordCount < MIN_RECORD_COUNT || recordCount > MAX_RECORD_COUNT) {
    throw new RangeError(
      `generateScenario: recordCount must be a whole number from ${MIN_RECORD_COUNT} to ${fmt(MAX_RECORD_COUNT)}, got ${recordCount}`,
    );
  }
  const rng = createPrng(seed);
  const scale = recordCount / DEFAULT_RECORD_COUNT;
  const scaled = (n: number, min = 1) => Math.max(min, Math.round(n * scale));
  const counts = {
    exact: scaled(15),
    near: scaled(15),
    conflicts: scaled(10, 2),
    thin: 3,
    contradictions: scaled(15),
    slips: scaled(10, 3),
    implausible: scaled(8, 4),
  };
  const added = counts.exact + counts.near + counts.conflicts + counts.thin;

  let serial = 0;
  const nextKey = () => `R${String((serial += 1)).padStart(4, "0")}`;
  const base = baseRecords(rng, recordCount - added, nextKey);
  const planter: Planter = { rng, base, used: new Set(), added: [], problems: [], nextKey };

  plantThinAlSi(planter);
  plantExactDuplicates(planter, counts.exact);
  plantNearDuplicates(planter, counts.near);
  plantLabelConflicts(planter, counts.conflicts);
  plantPhysicsContradictions(planter, counts.contradictions);
  plantUnitSlips(planter, counts.slips);
  plantImplausibleValues(planter, counts.implausible);

  // a conflict the source's words could not express is skipped: top up with exact duplicates
  const shortfall = recordCount - base.length - planter.added.length;
  if (shortfall > 0) plantExactDuplicates(planter, shortfall);

  return {
    lab: { ...LAB },
    users: USERS.map((u) => ({ ...u })),
    sources: SOURCES.map((s) => ({ ...s.source, authors: [...s.source.authors] })),
    records: [...base.map((b) => b.record), ...planter.added],
    plantedProblems: planter.problems,
  };
}
