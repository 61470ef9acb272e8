import { isOutcome, outcomeLabel } from "@/lib/domain/outcomes";

const STATUS_LABEL: Record<string, string> = {
  draft: "Draft",
  needs_review: "Needs review",
  accepted: "Accepted",
  rejected: "Rejected",
  merged: "Merged",
};

/** Label of a record status; an unknown status is shown as stored. */
export function statusLabel(status: string): string {
  return STATUS_LABEL[status] ?? status;
}

/** Display text of a stored outcome value; a value outside the vocabulary is shown as stored. */
export function outcomeText(outcome: string): string {
  return isOutcome(outcome) ? outcomeLabel(outcome) : outcome;
}

const SPOT_DEFINITION_LABEL: Record<string, string> = { one_over_e2: "1/e²", d4sigma: "D4σ", fwhm: "FWHM", unstated: "Not stated" };

/** Short label of a spot diameter definition. */
export function spotDefinitionShort(definition: string): string {
  return SPOT_DEFINITION_LABEL[definition] ?? definition;
}
