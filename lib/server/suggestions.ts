/**
 * Use case: suggested experiments for one alloy inside a machine's limits, kept as a suggestion
 * set with its seed and inputs so the same request on the same data gives the same set again.
 */
import { resolveAlloyProperties } from "../domain/alloy-properties";
import { resolveAlloy } from "../domain/alloys";
import { chooseScale } from "../domain/coverage-grid";
import { materialFromProperties } from "../domain/meltpool-analysis";
import { assessPoint, windowSettingsFromChecks, type WindowCase } from "../domain/process-window";
import { createPrng } from "../domain/prng";
import { SUGGESTION_CAUTION } from "../domain/safety";
import { suggestExperiments, type PlaneSummary, type Suggestion } from "../domain/suggestions";
import { suggestionsCsv } from "../domain/suggestions-csv";
import { loadPropertyOverrides } from "../db/check-inputs";
import { selectCoveragePoints } from "../db/coverage";
import { sql } from "../db/sql";
import { getSuggestionSet, insertSuggestionSet, listSuggestionSets } from "../db/suggestions";
import { suggestionRequestSchema, type SuggestionRequest } from "../schemas/coverage";
import { requireRole, type Actor } from "./actor";
import { currentCheckSettings } from "./check-settings";
import { DEFAULT_WINDOW_PLANE } from "./coverage";
import { DEFAULT_AMBIENT_TEMPERATURE_K } from "./meltpool";
import { fail, guard, invalid, nulRefusal, ok, type Result } from "./result";
import { isRowId } from "../schemas/ids";

/** What a set was made from: enough to make it again. */
export interface SuggestionInputs {
  request: SuggestionRequest;
  alloyName: string;
  spotDiameterUm: number;
  spotBasis: "chosen" | "median of the alloy's records" | "default";
  ambientTemperatureK: number;
  powerScale: "linear" | "log";
  speedScale: "linear" | "log";
  settingsVersion: number;
  propertiesBasis: string;
  /** The records the set was computed from: their number and a hash of their values. */
  data: { records: number; fingerprint: string };
}

export interface SuggestionSetView {
  id: number;
  alloyKey: string;
  seed: number;
  createdAt: string;
  inputs: SuggestionInputs;
  suggestions: Suggestion[];
  planes: PlaneSummary[];
  powerEdgesW: number[];
  speedEdgesMmPerS: number[];
  notes: string[];
  caution: readonly string[];
}

interface StoredSuggestions {
  suggestions: Suggestion[];
  planes: PlaneSummary[];
  powerEdgesW: number[];
  speedEdgesMmPerS: number[];
  notes: string[];
}

/** FNV-1a over the values, 32 bits, hex: a change in the data shows as another fingerprint. */
function fingerprint(columns: readonly Float64Array[]): string {
  let h = 0x811c9dc5;
  const bytes = new Uint8Array(8);
  const view = new DataView(bytes.buffer);
  for (const column of columns) {
    for (let i = 0; i < column.length; i++) {
      view.setFloat64(0, column[i]!);
      for (let b = 0; b < 8; b++) {
        h ^= bytes[b]!;
        h = Math.imul(h, 0x01000193) >>> 0;
      }
    }
  }
  return h.toString(16).padStart(8, "0");
}

function medianPositive(column: Float64Array): number | null {
  const values = column.filter((v) => v > 0);
  if (!values.length) return null;
  values.sort();
  return values[Math.floor(values.length / 2)]!;
}

/**
 * Computes and stores a suggestion set. A request the physics cannot serve (an alloy with no
 * property set) is `invalid_input` with the reason; a window with no sparse cell is a set with no
 * suggestions and a note.
 *
 * @example
 * await createSuggestionSet({ alloy: "316L", n: 12, power: "50-400W", speed: "200-2000mm/s", hatch: "100um", layer: "30um", seed: 1 }, actor);
 * // { ok: true, data: { id: 1, seed: 1, suggestions: [12 × { laserPowerW, scanSpeedMmPerS, predictedRegime, reason, … }], caution: [...] } }
 */
export async function createSuggestionSet(input: unknown, actor: Actor, now: () => number = Date.now): Promise<Result<SuggestionSetView>> {
  return guard(async (): Promise<Result<SuggestionSetView>> => {
    requireRole(actor, "contributor");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = suggestionRequestSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "The suggestion request needs attention.");
    const request = parsed.data;
    // A request without a seed gets one from the clock; the set keeps it.
    const seed = request.seed ?? Math.floor(now() % 2 ** 31);
    const resolved = resolveAlloy(request.alloy);
    const alloyKey = resolved.ok ? resolved.alloyKey : request.alloy;
    const db = sql();
    const props = resolveAlloyProperties({
      alloyKey,
      composition: resolved.ok ? { basis: "wt", components: resolved.components } : null,
      overrides: (await loadPropertyOverrides(db)).get(alloyKey) ?? {},
    });
    if (!props.ok) return fail("invalid_input", `Cannot predict a process window for ${request.alloy}: ${props.message}.`, { fieldErrors: { alloy: [props.message] } });
    const material = materialFromProperties(props.properties);
    const columns = await selectCoveragePoints(db, { alloyKey, statuses: request.status });
    const spotMedian = medianPositive(columns.spotDiameterUm);
    const spotDiameterUm = request.spot ?? spotMedian ?? DEFAULT_WINDOW_PLANE.spotDiameterUm;
    const spotBasis = request.spot !== null ? "chosen" : spotMedian !== null ? "median of the alloy's records" : "default";
    const settings = await currentCheckSettings(db);
    const windowSettings = windowSettingsFromChecks(settings.values);
    const powerScale = request.powerScale === "auto" ? chooseScale(request.power!.min, request.power!.max) : request.powerScale;
    const speedScale = request.speedScale === "auto" ? chooseScale(request.speed!.min, request.speed!.max) : request.speedScale;
    const cases = new Map<string, WindowCase>();
    const result = suggestExperiments(
      {
        n: request.n,
        k: request.k,
        powerRangeW: request.power!,
        speedRangeMmPerS: request.speed!,
        hatchSpacingsUm: request.hatch,
        layerThicknessesUm: request.layer,
        powerBins: request.powerBins,
        speedBins: request.speedBins,
        powerScale,
        speedScale,
      },
      columns,
      (plane, p, v) => {
        const key = `${plane.hatchSpacingUm}|${plane.layerThicknessUm}`;
        let c = cases.get(key);
        if (!c) cases.set(key, (c = { material, ...plane, spotDiameterUm, ambientTemperatureK: DEFAULT_AMBIENT_TEMPERATURE_K, settings: windowSettings }));
        const a = assessPoint(c, p, v);
        return { inWindow: a.inWindow, regime: a.regime, fired: a.fired };
      },
      (() => {
        const rng = createPrng(seed);
        return () => rng.next();
      })(),
    );
    const inputs: SuggestionInputs = {
      request: { ...request, alloy: alloyKey, seed },
      alloyName: resolved.ok ? resolved.displayName : request.alloy,
      spotDiameterUm,
      spotBasis,
      ambientTemperatureK: DEFAULT_AMBIENT_TEMPERATURE_K,
      powerScale,
      speedScale,
      settingsVersion: settings.version,
      propertiesBasis: props.basis,
      data: { records: columns.length, fingerprint: fingerprint([columns.laserPowerW, columns.scanSpeedMmPerS, columns.hatchSpacingUm, columns.layerThicknessUm]) },
    };
    const stored: StoredSuggestions = { suggestions: result.suggestions, planes: result.planes, powerEdgesW: result.powerEdgesW, speedEdgesMmPerS: result.speedEdgesMmPerS, notes: result.notes };
    const row = await insertSuggestionSet({ alloyKey, seed, inputs, suggestions: stored, createdById: actor.id });
    return ok({ id: row.id, alloyKey, seed, createdAt: row.createdAt.toISOString(), inputs, ...stored, caution: SUGGESTION_CAUTION });
  });
}

/** A stored set by id. */
export async function getSuggestionSetView(id: unknown): Promise<Result<SuggestionSetView>> {
  return guard(async (): Promise<Result<SuggestionSetView>> => {
    const n = Number(id);
    if (!isRowId(n)) return fail("not_found", "No such suggestion set.");
    const row = await getSuggestionSet(n);
    if (!row) return fail("not_found", `Suggestion set ${n} does not exist.`);
    const stored = row.suggestions as StoredSuggestions;
    return ok({ id: row.id, alloyKey: row.alloyKey, seed: row.seed, createdAt: row.createdAt.toISOString(), inputs: row.inputs as SuggestionInputs, ...stored, caution: SUGGESTION_CAUTION });
  });
}

/** The newest sets (id, alloy, seed, when, how many), optionally of one alloy. */
export async function listSuggestionSetSummaries(alloy: string | null): Promise<Result<{ id: number; alloyKey: string; seed: number; createdAt: string; n: number }[]>> {
  return guard(async () => {
    const resolved = alloy ? resolveAlloy(alloy) : null;
    const rows = await listSuggestionSets(resolved?.ok ? resolved.alloyKey : alloy, 10);
    return ok(rows.map((r) => ({ id: r.id, alloyKey: r.alloyKey, seed: r.seed, createdAt: r.createdAt.toISOString(), n: (r.inputs as SuggestionInputs | null)?.request?.n ?? 0 })));
  });
}

/**
 * The set as CSV for the shop floor, the safety caution at its head.
 *
 * @example
 * suggestionSetCsv(view).split("\n")[0]; // "# Safety: LPBF machines use Class 4 lasers (IEC 60825-1)."
 */
export function suggestionSetCsv(view: SuggestionSetView): string {
  const r = view.inputs.request;
  return suggestionsCsv({
    caution: view.caution,
    about: [
      `Meltledger suggestion set ${view.id}; alloy ${view.inputs.alloyName}; seed ${view.seed}; created ${view.createdAt}`,
      `Machine limits: power ${r.power?.text ?? ""}; speed ${r.speed?.text ?? ""}; hatch ${r.hatch.join("/")} µm; layer ${r.layer.join("/")} µm; spot ${view.inputs.spotDiameterUm} µm (${view.inputs.spotBasis})`,
      `Grid ${r.powerBins} × ${r.speedBins} (${view.inputs.powerScale} × ${view.inputs.speedScale}); k = ${r.k}; window from check settings version ${view.inputs.settingsVersion}; properties ${view.inputs.propertiesBasis}; ${view.inputs.data.records} records (fingerprint ${view.inputs.data.fingerprint})`,
      ...view.notes,
    ],
    alloy: view.alloyKey,
    spotDiameterUm: view.inputs.spotDiameterUm,
    suggestions: view.suggestions,
  });
}
