import { outcomeText } from "./labels";
import { outcomeColour } from "./palette";

export { outcomeText };

/** An outcome as a colour swatch plus its name (the name carries the meaning). */
export function OutcomeLabel({ outcome }: { outcome: string }) {
  return (
    <span style={{ whiteSpace: "nowrap" }}>
      <span className="swatch" style={{ background: outcomeColour(outcome) }} aria-hidden="true" />
      {outcomeText(outcome)}
    </span>
  );
}
