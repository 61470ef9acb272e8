import { isOutcome, outcomeLabel } from "@/lib/domain/outcomes";
import { outcomeColour } from "./palette";

/** Display text of a stored outcome value; a value outside the vocabulary is shown as stored. */
export function outcomeText(outcome: string): string {
  return isOutcome(outcome) ? outcomeLabel(outcome) : outcome;
}

/** An outcome as a colour swatch plus its name (the name carries the meaning). */
export function OutcomeLabel({ outcome }: { outcome: string }) {
  return (
    <span style={{ whiteSpace: "nowrap" }}>
      <span className="swatch" style={{ background: outcomeColour(outcome) }} aria-hidden="true" />
      {outcomeText(outcome)}
    </span>
  );
}
