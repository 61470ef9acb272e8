import { resolveAlloy } from "../domain/alloys";
import { parseComposition } from "../domain/composition";
import type { MaterialSpec } from "../db/materials";
import type { RecordWrite } from "../db/records";
import { normalizeQuantities, type RecordValues } from "../schemas/record";
import type { FieldErrors } from "../schemas/issues";

export type PreparedRecord = { ok: true; write: Omit<RecordWrite, "materialId">; material: MaterialSpec } | { ok: false; fieldErrors: FieldErrors };

/**
 * Turns validated input into what is stored: canonical quantities, E_v, the material (a named
 * grade's nominal composition, or the measured composition the user typed). An alloy name the
 * grade library does not know is kept as written with no composition; the checks flag it.
 */
export function prepareRecord(values: RecordValues): PreparedRecord {
  const normalized = normalizeQuantities(values);
  const resolved = resolveAlloy(values.alloy);
  let material: MaterialSpec;
  if (values.composition) {
    const parsed = parseComposition(values.composition);
    if (!parsed.ok) return { ok: false, fieldErrors: { composition: [parsed.message] } };
    material = {
      designation: values.alloy,
      alloyKey: resolved.ok ? resolved.alloyKey : values.alloy.trim(),
      basis: parsed.composition.basis,
      compositionKind: "measured",
      components: parsed.composition.components,
    };
  } else if (resolved.ok) {
    material = { designation: values.alloy, alloyKey: resolved.alloyKey, basis: "wt", compositionKind: "nominal", components: resolved.components };
  } else {
    material = { designation: values.alloy, alloyKey: values.alloy.trim().replace(/\s+/g, " "), basis: "wt", compositionKind: "nominal", components: [] };
  }
  return {
    ok: true,
    material,
    write: {
      ...normalized,
      sourceId: values.sourceId,
      locationPage: values.locationPage,
      locationLabel: values.locationLabel,
      alloyKey: material.alloyKey,
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
