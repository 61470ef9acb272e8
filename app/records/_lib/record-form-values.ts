/**
 * The record form's state and its mapping to the input shape of recordInputSchema. Pure and
 * client-safe: the form, the edit page and the server action agree on one shape.
 */
import { normalizeUnit, unitOptions } from "@/lib/domain/units";
import { PROVENANCE, RECORD_QUANTITY_FIELD_NAMES, RECORD_QUANTITY_FIELDS, type Provenance, type RecordInput, type RecordQuantityField } from "@/lib/schemas/record";

export interface QuantityInput {
  value: string;
  unit: string;
  provenance: Provenance;
}

export interface RecordFormValues {
  sourceId: string;
  locationPage: string;
  locationLabel: string;
  alloy: string;
  useMeasuredComposition: boolean;
  composition: string;
  machine: string;
  quantities: Record<RecordQuantityField, QuantityInput>;
  spotDefinition: string;
  atmosphere: string;
  scanStrategy: string;
  outcome: string;
  outcomeText: string;
  status: "needs_review" | "draft";
  reason: string;
}

function defaultUnit(field: RecordQuantityField): string {
  return unitOptions(RECORD_QUANTITY_FIELDS[field])[0]?.id ?? "";
}

/** A blank form; `sourceId` preselects the source. */
export function emptyRecordFormValues(sourceId?: number | null): RecordFormValues {
  const quantities = Object.fromEntries(RECORD_QUANTITY_FIELD_NAMES.map((f) => [f, { value: "", unit: defaultUnit(f), provenance: "reported" }])) as Record<RecordQuantityField, QuantityInput>;
  return {
    sourceId: sourceId ? String(sourceId) : "",
    locationPage: "",
    locationLabel: "",
    alloy: "",
    useMeasuredComposition: false,
    composition: "",
    machine: "",
    quantities,
    spotDefinition: "one_over_e2",
    atmosphere: "",
    scanStrategy: "",
    outcome: "unknown",
    outcomeText: "",
    status: "needs_review",
    reason: "",
  };
}

/** The stored record fields the form starts from when editing. */
export interface EditableRecord {
  sourceId: number;
  locationPage: number | null;
  locationLabel: string | null;
  machine: string | null;
  spotDefinition: string | null;
  atmosphere: string | null;
  scanStrategy: string | null;
  outcome: string;
  outcomeText: string | null;
  status: string;
  enteredValues: Partial<Record<RecordQuantityField, { text: string; unit: string; provenance: string }>>;
  material: { designation: string; basis: string; compositionKind: string; components: { element: string; amount: number; isBalance: boolean }[] };
}

/** A measured composition written back as an element list the parser reads ("Fe bal, Cr 17"). */
export function compositionText(material: EditableRecord["material"]): string {
  const suffix = material.basis === "at" ? " at%" : "";
  return material.components.map((c) => (c.isBalance ? `${c.element} bal` : `${c.element} ${c.amount}${suffix}`)).join(", ");
}

/** The form state for editing a stored record: the values as they were typed, with their units. */
export function recordFormValuesOf(r: EditableRecord): RecordFormValues {
  const base = emptyRecordFormValues(r.sourceId);
  for (const field of RECORD_QUANTITY_FIELD_NAMES) {
    const entered = r.enteredValues[field];
    if (!entered) continue;
    const unit = normalizeUnit(entered.unit) ?? entered.unit;
    const provenance = (PROVENANCE as readonly string[]).includes(entered.provenance) ? (entered.provenance as Provenance) : "reported";
    base.quantities[field] = { value: entered.text, unit, provenance };
  }
  const measured = r.material.compositionKind === "measured";
  return {
    ...base,
    locationPage: r.locationPage === null ? "" : String(r.locationPage),
    locationLabel: r.locationLabel ?? "",
    alloy: r.material.designation,
    useMeasuredComposition: measured,
    composition: measured ? compositionText(r.material) : "",
    machine: r.machine ?? "",
    spotDefinition: r.spotDefinition ?? "one_over_e2",
    atmosphere: r.atmosphere ?? "",
    scanStrategy: r.scanStrategy ?? "",
    outcome: r.outcome,
    outcomeText: r.outcomeText ?? "",
    status: r.status === "draft" ? "draft" : "needs_review",
  };
}

/** The form state in the input shape of recordInputSchema. */
export function recordInputOf(v: RecordFormValues): RecordInput {
  const quantities = {} as Record<RecordQuantityField, { value: string; unit: string }>;
  const provenance: Partial<Record<RecordQuantityField, Provenance>> = {};
  for (const field of RECORD_QUANTITY_FIELD_NAMES) {
    const q = v.quantities[field];
    quantities[field] = { value: q.value, unit: q.unit };
    if (q.value.trim() !== "") provenance[field] = q.provenance;
  }
  return {
    sourceId: v.sourceId, // the schema coerces; "" gives its "choose a source" message
    locationPage: v.locationPage,
    locationLabel: v.locationLabel,
    alloy: v.alloy,
    composition: v.useMeasuredComposition ? v.composition : null,
    machine: v.machine,
    ...quantities,
    spotDefinition: v.quantities.spotDiameter.value.trim() === "" ? null : ((v.spotDefinition || null) as RecordInput["spotDefinition"]),
    atmosphere: v.atmosphere,
    scanStrategy: v.scanStrategy,
    outcome: v.outcome as RecordInput["outcome"],
    outcomeText: v.outcomeText,
    provenance,
    status: v.status,
  };
}
