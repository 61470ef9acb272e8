import { resolveAlloy } from "../domain/alloys";
import { parseComposition } from "../domain/composition";
import type { MaterialSpec } from "../db/materials";
import type { RecordWrite } from "../db/records";
import { normalizeQuantities, type RecordValues } from "../schemas/record";
import type { ParsedQuantities } from "../schemas/record-fast";
import type { FieldErrors } from "../schemas/issues";

export type PreparedRecord = { ok: true; write: Omit<RecordWrite, "materialId">; material: MaterialSpec } | { ok: false; fieldErrors: FieldErrors };

/**
 * Turns validated input into what is stored: canonical quantities, E_v, the material (a named
 * grade's nominal composition, or the measured composition the user typed). An alloy name the
 * grade library does not know is kept as written with no composition; the checks flag it.
 */
export function prepareRecord(values: RecordValues, parsed?: ParsedQuantities): PreparedRecord {
  const normalized = normalizeQuantities(values, parsed);
  const material = materialFor(values.alloy, values.composition);
  if (!material.ok) return { ok: false, fieldErrors: { composition: [material.message] } };
  // Every field written out (no spread): one object shape for every record of a batch.
  const n = normalized;
  return {
    ok: true,
    material: material.spec,
    write: {
      laserPowerW: n.laserPowerW,
      scanSpeedMmPerS: n.scanSpeedMmPerS,
      hatchSpacingUm: n.hatchSpacingUm,
      layerThicknessUm: n.layerThicknessUm,
      spotDiameterUm: n.spotDiameterUm,
      preheatC: n.preheatC,
      powderD10Um: n.powderD10Um,
      powderD50Um: n.powderD50Um,
      powderD90Um: n.powderD90Um,
      relativeDensityPct: n.relativeDensityPct,
      volumetricEnergyJMm3: n.volumetricEnergyJMm3,
      enteredValues: n.enteredValues,
      sourceId: values.sourceId,
      locationPage: values.locationPage,
      locationLabel: values.locationLabel,
      alloyKey: material.spec.alloyKey,
      machine: values.machine,
      spotDefinition: values.spotDefinition,
      atmosphere: values.atmosphere,
      scanStrategy: values.scanStrategy,
      outcome: values.outcome,
      outcomeText: values.outcomeText,
      status: values.status,
      qualityScore: null,
    },
  };
}

type MaterialResult = { ok: true; spec: MaterialSpec } | { ok: false; message: string };

// A batch names a handful of alloys many times over; resolving each spelling once is enough.
const MATERIAL_MEMO_LIMIT = 5_000;
const materialMemo = new Map<string, MaterialResult>();

function materialFor(alloy: string, composition: string | null): MaterialResult {
  const key = `${alloy}\u0000${composition ?? ""}`;
  let result = materialMemo.get(key);
  if (result === undefined) {
    result = resolveMaterial(alloy, composition);
    if (materialMemo.size >= MATERIAL_MEMO_LIMIT) materialMemo.clear();
    materialMemo.set(key, result);
  }
  return result;
}

function resolveMaterial(alloy: string, composition: string | null): MaterialResult {
  const resolved = resolveAlloy(alloy);
  let material: MaterialSpec;
  if (composition) {
    const parsed = parseComposition(composition);
    if (!parsed.ok) return { ok: false, message: parsed.message };
    material = {
      designation: alloy,
      alloyKey: resolved.ok ? resolved.alloyKey : alloy.trim(),
      basis: parsed.composition.basis,
      compositionKind: "measured",
      components: parsed.composition.components,
    };
  } else if (resolved.ok) {
    material = { designation: alloy, alloyKey: resolved.alloyKey, basis: "wt", compositionKind: "nominal", components: resolved.components };
  } else {
    material = { designation: alloy, alloyKey: alloy.trim().replace(/\s+/g, " "), basis: "wt", compositionKind: "nominal", components: [] };
  }
  return { ok: true, spec: material };
}
