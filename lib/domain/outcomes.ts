/**
 * The outcome vocabulary of a build record and the mapping of the words papers and datasets use
 * for it. The original text is always kept beside the mapped outcome, so a mapping can be
 * reviewed and corrected.
 */

export const OUTCOMES = ["dense", "keyhole", "lack_of_fusion", "balling", "cracking", "other", "unknown"] as const;

export type Outcome = (typeof OUTCOMES)[number];

const LABELS: Record<Outcome, string> = {
  dense: "Dense",
  keyhole: "Keyhole",
  lack_of_fusion: "Lack of fusion",
  balling: "Balling",
  cracking: "Cracking",
  other: "Other",
  unknown: "Unknown",
};

/** Whether a string is one of the outcome ids. @example isOutcome("keyhole"); // true */
export function isOutcome(value: string): value is Outcome {
  return (OUTCOMES as readonly string[]).includes(value);
}

/** Display label of an outcome. @example outcomeLabel("lack_of_fusion"); // "Lack of fusion" */
export function outcomeLabel(outcome: Outcome): string {
  return LABELS[outcome];
}

/**
 * Rules in priority order; the first that matches the normalized text wins. The order decides
 * texts that name several things: a named defect mechanism outranks "dense" ("dense but cracked"
 * is cracking), keyhole outranks lack of fusion, and both outrank balling and cracking, because
 * porosity mechanisms are what the label is mostly used for.
 *
 * "porous", "porosity" and "pores" without a mechanism are ambiguous (keyhole and lack-of-fusion
 * pores both make a part porous), so they map to "other" rather than to a guess.
 */
const RULES: readonly { outcome: Outcome; pattern: RegExp }[] = [
  { outcome: "unknown", pattern: /^(unknown|n ?a|not (reported|assessed|evaluated|available|given)|none given|\?+)$/ },
  // defect-free wordings say "crack" or "pore" but mean dense
  { outcome: "dense", pattern: /\b(crack|pore|porosity|defect|void)s? free\b/ },
  { outcome: "dense", pattern: /\b(no|without|free of) (visible |significant )?(cracks?|pores?|porosity|defects?|voids?)\b/ },
  // negated success wordings: not a dense part, mechanism unknown
  { outcome: "other", pattern: /\b(not|non|un)( fully| very)? ?(dense|good|desirable|successful|sound|acceptable)\b/ },
  { outcome: "keyhole", pattern: /\b(key ?hol(e|es|ed|ing)|kh)\b/ },
  {
    outcome: "lack_of_fusion",
    pattern:
      /\b(lack of fusion|lof|unfused|un ?melted|incomplete (fusion|melting)|insufficient (fusion|melting)|partial(ly)? (fused|melted|melting))\b/,
  },
  { outcome: "balling", pattern: /\b(ball(s|ing|ed)?|bead(s|ing|ed)|humping|melt pool break ?up)\b/ },
  { outcome: "cracking", pattern: /\b(crack(s|ed|ing)?|hot tearing)\b/ },
  {
    outcome: "dense",
    pattern: /\b((fully |near fully |nearly fully )?dense|desirable|good|success(ful)?|sound|ok|optimal|optimum|high density|pass(ed)?|acceptable)\b/,
  },
  {
    outcome: "other",
    pattern: /\b(other|por(ous|osity|es?)|voids?|defective|failed|fail|bad|poor|spatter|delamination|warp(ed|ing)?|distortion|irregular)\b/,
  },
];

function normalizeText(text: string): string {
  return text
    .normalize("NFKD")
    .replace(/\p{M}/gu, "")
    .toLowerCase()
    .replace(/[-_/]+/g, " ")
    .replace(/[^\p{L}\p{N}?\s]+/gu, " ")
    .replace(/\s+/g, " ")
    .trim();
}

/**
 * Maps an outcome as written in a source to the vocabulary, case-insensitively. Text that no
 * rule recognizes gives `{ outcome: "unknown", matched: false }`; explicit "unknown" or
 * "not reported" gives `{ outcome: "unknown", matched: true }`.
 *
 * @example
 * mapOutcome("LOF");          // { outcome: "lack_of_fusion", matched: true }
 * mapOutcome("Desirable");    // { outcome: "dense", matched: true }
 * mapOutcome("porous");       // { outcome: "other", matched: true }
 * mapOutcome("see text");     // { outcome: "unknown", matched: false }
 */
export function mapOutcome(text: string): { outcome: Outcome; matched: boolean } {
  const normalized = normalizeText(text);
  if (normalized === "") return { outcome: "unknown", matched: false };
  const exact = normalized.replace(/ /g, "_");
  if (isOutcome(exact)) return { outcome: exact, matched: true };
  for (const rule of RULES) {
    if (rule.pattern.test(normalized)) return { outcome: rule.outcome, matched: true };
  }
  return { outcome: "unknown", matched: false };
}
