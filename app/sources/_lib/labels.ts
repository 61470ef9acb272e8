import { DENSITY_METHOD_LABEL, OUTCOME_EVIDENCE_LABEL, SOURCE_KIND_LABEL, SPOT_DEFINITION_LABEL } from "@/lib/schemas/source";

const lookup = (labels: Record<string, string>) => (id: string | null | undefined) => (id ? (labels[id] ?? id) : "—");

/** Display labels of the stored source vocabularies; an unknown id is shown as stored. */
export const kindLabel = lookup(SOURCE_KIND_LABEL);
export const densityMethodLabel = lookup(DENSITY_METHOD_LABEL);
export const outcomeEvidenceLabel = lookup(OUTCOME_EVIDENCE_LABEL);
export const spotDefinitionLabel = lookup(SPOT_DEFINITION_LABEL);
