/**
 * The printing regime predicted from the defect criteria: the mechanisms whose criteria fired.
 * The labels follow the outcome vocabulary (dense, keyhole, lack of fusion, balling).
 */
import type { CriterionName, CriterionResult, Mechanism } from "./criteria";

export type RegimeLabel = "dense" | "keyhole" | "lack_of_fusion" | "balling" | "mixed" | "no_melting";

export interface PredictedRegime {
  label: RegimeLabel;
  /** Mechanisms with at least one fired criterion, in a fixed order. */
  mechanisms: Mechanism[];
  firedCriteria: CriterionName[];
  summary: string;
}

const ORDER: readonly Mechanism[] = ["keyhole", "lack_of_fusion", "balling"];
const WORDS: Record<Mechanism, string> = { keyhole: "keyhole", lack_of_fusion: "lack of fusion", balling: "balling" };

/**
 * Combines fired criteria into a regime: none fired → "dense" (conduction mode), one mechanism →
 * that mechanism, several → "mixed"; nothing molten → "no_melting".
 *
 * @example
 * predictRegime([{ name: "balling_aspect", mechanism: "balling", fired: true, ... }], true);
 * // { label: "balling", mechanisms: ["balling"], firedCriteria: ["balling_aspect"], ... }
 */
export function predictRegime(criteria: readonly CriterionResult[], melted: boolean): PredictedRegime {
  const fired = criteria.filter((c) => c.fired);
  const firedCriteria = fired.map((c) => c.name);
  const mechanisms = ORDER.filter((m) => fired.some((c) => c.mechanism === m));
  if (!melted) {
    return { label: "no_melting", mechanisms, firedCriteria, summary: "no melting: the peak temperature stays below the melting temperature" };
  }
  if (mechanisms.length === 0) {
    return { label: "dense", mechanisms, firedCriteria, summary: "no defect criterion fired (conduction mode)" };
  }
  const first = mechanisms[0] as Mechanism;
  const label: RegimeLabel = mechanisms.length === 1 ? first : "mixed";
  return {
    label,
    mechanisms,
    firedCriteria,
    summary: `${mechanisms.map((m) => WORDS[m]).join(" and ")} indicated by ${firedCriteria.join(", ")}`,
  };
}
