/**
 * Resolving what a user or a dataset wrote in an alloy column to a composition: a named grade
 * (through its aliases) or a parsed designation / element list.
 */
import { type Composition, formatDesignation, parseComposition, toWeightPercent } from "./composition";
import { type AlloyGrade, findGrade, GRADES } from "./grades";

export interface ResolvedComponent {
  element: string;
  /** wt%. */
  amount: number;
  isBalance: boolean;
}

export type ResolvedAlloy = {
  ok: true;
  /** Canonical key: the grade key ("316L", "IN718") or the tidied designation ("Fe-18Cr-8Ni"). */
  alloyKey: string;
  displayName: string;
  basis: "wt";
  kind: "nominal";
  /** The standard the nominal composition comes from; null for a parsed designation. */
  standard: string | null;
  components: ResolvedComponent[];
};

export type ResolveAlloyResult = ResolvedAlloy | { ok: false; message: string };

/** A grade of the library with its balance element filled. */
export interface GradeSummary {
  key: string;
  displayName: string;
  family: AlloyGrade["family"];
  standard: string;
  standardNote: string;
  aliases: string[];
  components: ResolvedComponent[];
}

function roundWt(value: number): number {
  return Math.round(value * 1e9) / 1e9;
}

function gradeComponents(grade: AlloyGrade): ResolvedComponent[] {
  const given = grade.components.reduce((s, c) => s + (c.amountWtPct ?? 0), 0);
  const remainder = roundWt(100 - given);
  return grade.components.map((c) => ({
    element: c.element,
    amount: c.amountWtPct ?? remainder,
    isBalance: c.amountWtPct === null,
  }));
}

function summarize(grade: AlloyGrade): GradeSummary {
  return {
    key: grade.key,
    displayName: grade.displayName,
    family: grade.family,
    standard: grade.standard,
    standardNote: grade.standardNote,
    aliases: [...grade.aliases],
    components: gradeComponents(grade),
  };
}

/**
 * The grade library, each grade with its nominal composition (wt%, balance filled) and standard.
 *
 * @example
 * listGrades().map((g) => g.key); // ["316L", "304L", "17-4PH", "18Ni300", "H13", "Ti-6Al-4V", ...]
 */
export function listGrades(): GradeSummary[] {
  return GRADES.map(summarize);
}

/**
 * Resolves an alloy designation: a named grade or alias (case-, space- and hyphen-insensitive) gives
 * its nominal composition; otherwise the text is parsed as a designation (`Fe-18Cr-8Ni`, `Ni-5Nb`)
 * or element list (`Fe bal, Cr 17, Ni 12`). Expected problems come back as `{ ok: false, message }`.
 *
 * @example
 * resolveAlloy("Ti64"); // { ok: true, alloyKey: "Ti-6Al-4V", standard: "ASTM F2924", ... }
 * resolveAlloy("Fe bal, Cr 18, Ni 8").alloyKey; // "Fe-18Cr-8Ni"
 * resolveAlloy("Fe-18Xx"); // { ok: false, message: "unknown element symbol 'Xx' in 'Fe-18Xx'" }
 */
export function resolveAlloy(designation: string): ResolveAlloyResult {
  const text = designation.trim().replace(/\s+/g, " ");
  if (text === "") return { ok: false, message: "no alloy given" };
  const grade = findGrade(text);
  if (grade) {
    return {
      ok: true,
      alloyKey: grade.key,
      displayName: grade.displayName,
      basis: "wt",
      kind: "nominal",
      standard: grade.standard,
      components: gradeComponents(grade),
    };
  }
  const parsed = parseComposition(text);
  if (!parsed.ok) {
    const looksLikeName = !/\d/.test(text) || /[a-z]{3,}/.test(text);
    return {
      ok: false,
      message: looksLikeName
        ? `'${text}' is not a known grade and cannot be read as a composition (${parsed.message}); use a grade from the library or write it as e.g. 'Ti-6Al-4V' or 'Fe bal, Cr 17, Ni 12'`
        : parsed.message,
    };
  }
  const weight: Composition = toWeightPercent(parsed.composition);
  const key = formatDesignation(weight);
  return {
    ok: true,
    alloyKey: key,
    displayName: key,
    basis: "wt",
    kind: "nominal",
    standard: null,
    components: weight.components.map((c) => ({ element: c.element, amount: roundWt(c.amount), isBalance: c.isBalance })),
  };
}
