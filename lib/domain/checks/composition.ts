/**
 * Alloy and composition rules: an alloy the grade library does not know and that was given no
 * composition, element symbols that do not exist, and compositions that do not sum to 100.
 */
import { settingOf } from "../check-settings";
import { getElement } from "../elements";
import { fmt } from "./fields";
import type { RecordRule } from "./types";

const unknownAlloy: RecordRule = {
  infos: [{
    code: "alloy.unknown",
    severity: "warning",
    title: "Unknown alloy without a composition",
    description: "The alloy name matches no grade in the library and no composition was entered, so the physics checks cannot run and duplicates are matched by name only. Enter the composition from the source (e.g. \"Fe bal, Cr 17, Ni 12\") or correct the alloy name.",
    source: "DOMAIN.md, \"Composition\" (named grades map to nominal compositions)",
    thresholdKeys: [],
    scope: "record",
  }],
  check: (r) =>
    r.components.length === 0
      ? {
          code: "alloy.unknown",
          severity: "warning",
          message: `"${r.alloyKey}" is not a grade the library knows and the record has no composition. Correct the alloy name, or enter the composition from the source.`,
          details: { inputs: { alloy: r.alloyKey } },
        }
      : null,
};

const unknownElement: RecordRule = {
  infos: [{
    code: "composition.unknown_element",
    severity: "error",
    title: "Unknown element symbol",
    description: "A composition names a symbol that is no chemical element. Correct the symbol (capitalisation matters: Co is cobalt, CO is not an element).",
    source: "IUPAC periodic table (element symbols); DOMAIN.md: unknown element symbols are errors",
    thresholdKeys: [],
    scope: "record",
  }],
  check: (r) => {
    const bad = r.components.filter((c) => !getElement(c.element)).map((c) => c.element);
    if (!bad.length) return null;
    return {
      code: "composition.unknown_element",
      severity: "error",
      message: `The composition names ${bad.map((b) => `"${b}"`).join(", ")}, which ${bad.length === 1 ? "is" : "are"} not element symbols. Correct the composition from the source.`,
      details: { inputs: { elements: bad.join(", ") } },
    };
  },
};

const compositionSum: RecordRule = {
  infos: [{
    code: "composition.sum",
    severity: "error",
    title: "Composition does not sum to 100",
    description: "After the balance element is filled, a composition must sum to 100 within the tolerance. Check for a missing element, a typo or a mix of wt% and at%.",
    source: "DOMAIN.md, \"Composition\": 100 ± 0.5 wt% (common practice)",
    thresholdKeys: ["composition.sumTolerancePct"],
    scope: "record",
  }],
  check: (r, s) => {
    if (!r.components.length) return null;
    const sum = r.components.reduce((acc, c) => acc + c.amount, 0);
    const tolerance = settingOf(s, "composition.sumTolerancePct");
    if (Math.abs(sum - 100) <= tolerance + 1e-9) return null;
    const unit = r.compositionBasis === "at" ? "at%" : "wt%";
    return {
      code: "composition.sum",
      severity: "error",
      message: `The composition sums to ${fmt(sum)} ${unit}, not 100 ± ${fmt(tolerance)}. Check for a missing or mistyped element and correct it from the source.`,
      details: { inputs: { sum: Number(sum.toFixed(4)), basis: r.compositionBasis }, thresholds: { tolerancePct: tolerance } },
    };
  },
};

export const COMPOSITION_RULES: readonly RecordRule[] = [unknownAlloy, unknownElement, compositionSum];
