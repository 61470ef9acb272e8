/**
 * Library of named alloy grades used in LPBF, with nominal compositions.
 *
 * Nominal composition rule: an element with a specified range takes the midpoint of the range; an
 * element with a maximum only takes half of that maximum; residuals limited to 0.05 wt% or less
 * (P, S, B, H, Pb, ...) are left out, except C, N and O, which are kept at half their maximum because
 * they define low-interstitial grades. The balance element takes the remainder.
 * All specification ranges below were typed from memory of the named standard's chemistry table and
 * must be checked against the standard before they are relied on.
 */

/** One element of a grade's nominal composition (wt%); the balance element has no amount. */
export interface GradeComponent {
  element: string;
  /** wt%; null for the balance element. */
  amountWtPct: number | null;
}

export interface AlloyGrade {
  /** Canonical key, e.g. "316L", "Ti-6Al-4V", "IN718". */
  key: string;
  displayName: string;
  family: "stainless steel" | "tool steel" | "maraging steel" | "titanium" | "nickel" | "aluminium" | "copper" | "cobalt";
  /** The standard the nominal composition comes from. */
  standard: string;
  /** How the composition was obtained and how sure it is. */
  standardNote: string;
  components: GradeComponent[];
  /** Spellings seen in papers and datasets (matched case-, space- and punctuation-insensitively). */
  aliases: string[];
}

const FROM_MEMORY = "midpoints of the specification ranges, from memory";

/** The grade library. */
export const GRADES: readonly AlloyGrade[] = [
  {
    key: "316L",
    displayName: "316L stainless steel",
    family: "stainless steel",
    standard: "ASTM F3184 (UNS S31603)",
    standardNote: `${FROM_MEMORY}: Cr 16.0–18.0, Ni 10.0–14.0, Mo 2.00–3.00, Mn ≤ 2.00, Si ≤ 0.75, N ≤ 0.10, C ≤ 0.030`,
    components: [
      { element: "Fe", amountWtPct: null },
      { element: "Cr", amountWtPct: 17 },
      { element: "Ni", amountWtPct: 12 },
      { element: "Mo", amountWtPct: 2.5 },
      { element: "Mn", amountWtPct: 1 },
      { element: "Si", amountWtPct: 0.375 },
      { element: "N", amountWtPct: 0.05 },
      { element: "C", amountWtPct: 0.015 },
    ],
    aliases: ["SS316L", "316 L", "AISI 316L", "SS 316L", "SUS316L", "316L SS", "UNS S31603", "S31603", "1.4404", "X2CrNiMo17-12-2", "stainless steel 316L", "316L stainless steel", "316L stainless"],
  },
  {
    key: "304L",
    displayName: "304L stainless steel",
    family: "stainless steel",
    standard: "ASTM A240 (UNS S30403)",
    standardNote: `${FROM_MEMORY}: Cr 17.5–19.5, Ni 8.0–12.0, Mn ≤ 2.00, Si ≤ 0.75, N ≤ 0.10, C ≤ 0.030; no PBF-specific standard`,
    components: [
      { element: "Fe", amountWtPct: null },
      { element: "Cr", amountWtPct: 18.5 },
      { element: "Ni", amountWtPct: 10 },
      { element: "Mn", amountWtPct: 1 },
      { element: "Si", amountWtPct: 0.375 },
      { element: "N", amountWtPct: 0.05 },
      { element: "C", amountWtPct: 0.015 },
    ],
    aliases: ["SS304L", "304 L", "AISI 304L", "SS 304L", "SUS304L", "UNS S30403", "S30403", "1.4307", "stainless steel 304L", "304L stainless steel"],
  },
  {
    key: "17-4PH",
    displayName: "17-4PH stainless steel",
    family: "stainless steel",
    standard: "ASTM A564 (UNS S17400)",
    standardNote: `${FROM_MEMORY}: Cr 15.0–17.5, Ni 3.0–5.0, Cu 3.0–5.0, Nb+Ta 0.15–0.45, Mn ≤ 1.00, Si ≤ 1.00, C ≤ 0.07`,
    components: [
      { element: "Fe", amountWtPct: null },
      { element: "Cr", amountWtPct: 16.25 },
      { element: "Ni", amountWtPct: 4 },
      { element: "Cu", amountWtPct: 4 },
      { element: "Nb", amountWtPct: 0.3 },
      { element: "Mn", amountWtPct: 0.5 },
      { element: "Si", amountWtPct: 0.5 },
      { element: "C", amountWtPct: 0.035 },
    ],
    aliases: ["17-4 PH", "17-4", "174PH", "SS17-4PH", "17-4PH SS", "UNS S17400", "S17400", "1.4542", "AISI 630", "X5CrNiCuNb16-4", "GP1", "17-4 stainless", "17-4PH stainless steel"],
  },
  {
    key: "18Ni300",
    displayName: "18Ni300 maraging steel",
    family: "maraging steel",
    standard: "AMS 6514 (UNS K93120)",
    standardNote: `${FROM_MEMORY}: Ni 18.0–19.0, Co 8.5–9.5, Mo 4.6–5.2, Ti 0.5–0.8, Al 0.05–0.15, Si ≤ 0.10, Mn ≤ 0.10, C ≤ 0.03`,
    components: [
      { element: "Fe", amountWtPct: null },
      { element: "Ni", amountWtPct: 18.5 },
      { element: "Co", amountWtPct: 9 },
      { element: "Mo", amountWtPct: 4.9 },
      { element: "Ti", amountWtPct: 0.65 },
      { element: "Al", amountWtPct: 0.1 },
      { element: "Si", amountWtPct: 0.05 },
      { element: "Mn", amountWtPct: 0.05 },
      { element: "C", amountWtPct: 0.015 },
    ],
    aliases: ["18Ni(300)", "18Ni-300", "18 Ni 300", "maraging 300", "maraging steel 300", "maraging steel", "MS1", "M300", "C300", "1.2709", "X3NiCoMoTi18-9-5", "UNS K93120", "K93120", "18Ni300 maraging steel"],
  },
  {
    key: "H13",
    displayName: "H13 hot-work tool steel",
    family: "tool steel",
    standard: "ASTM A681 (UNS T20813)",
    standardNote: `${FROM_MEMORY}: C 0.32–0.45, Mn 0.20–0.50, Si 0.80–1.20, Cr 4.75–5.50, Mo 1.10–1.75, V 0.80–1.20`,
    components: [
      { element: "Fe", amountWtPct: null },
      { element: "Cr", amountWtPct: 5.125 },
      { element: "Mo", amountWtPct: 1.425 },
      { element: "Si", amountWtPct: 1 },
      { element: "V", amountWtPct: 1 },
      { element: "C", amountWtPct: 0.385 },
      { element: "Mn", amountWtPct: 0.35 },
    ],
    aliases: ["AISI H13", "H-13", "1.2344", "X40CrMoV5-1", "SKD61", "UNS T20813", "T20813", "H13 tool steel"],
  },
  {
    key: "Ti-6Al-4V",
    displayName: "Ti-6Al-4V",
    family: "titanium",
    standard: "ASTM F2924",
    standardNote: `${FROM_MEMORY}: Al 5.50–6.75, V 3.50–4.50, Fe ≤ 0.30, O ≤ 0.20, C ≤ 0.08, N ≤ 0.05`,
    components: [
      { element: "Ti", amountWtPct: null },
      { element: "Al", amountWtPct: 6.125 },
      { element: "V", amountWtPct: 4 },
      { element: "Fe", amountWtPct: 0.15 },
      { element: "O", amountWtPct: 0.1 },
      { element: "C", amountWtPct: 0.04 },
      { element: "N", amountWtPct: 0.025 },
    ],
    aliases: ["Ti6Al4V", "Ti64", "Ti-64", "TiAl6V4", "Ti 6-4", "Ti-6-4", "Ti Grade 5", "Grade 5 titanium", "UNS R56400", "R56400", "3.7165"],
  },
  {
    key: "IN718",
    displayName: "Inconel 718 (alloy 718)",
    family: "nickel",
    standard: "ASTM F3055 (UNS N07718)",
    standardNote: `${FROM_MEMORY}: Ni 50.0–55.0, Cr 17.0–21.0, Nb+Ta 4.75–5.50, Mo 2.80–3.30, Ti 0.65–1.15, Al 0.20–0.80, Co ≤ 1.00, Mn ≤ 0.35, Si ≤ 0.35, Cu ≤ 0.30, C ≤ 0.08, Fe balance`,
    components: [
      { element: "Fe", amountWtPct: null },
      { element: "Ni", amountWtPct: 52.5 },
      { element: "Cr", amountWtPct: 19 },
      { element: "Nb", amountWtPct: 5.125 },
      { element: "Mo", amountWtPct: 3.05 },
      { element: "Ti", amountWtPct: 0.9 },
      { element: "Al", amountWtPct: 0.5 },
      { element: "Co", amountWtPct: 0.5 },
      { element: "Mn", amountWtPct: 0.175 },
      { element: "Si", amountWtPct: 0.175 },
      { element: "Cu", amountWtPct: 0.15 },
      { element: "C", amountWtPct: 0.04 },
    ],
    aliases: ["alloy 718", "Inconel 718", "Inconel718", "IN 718", "IN-718", "Ni718", "Ni 718", "nickel alloy 718", "UNS N07718", "N07718", "2.4668", "NiCr19Fe19Nb5Mo3"],
  },
  {
    key: "IN625",
    displayName: "Inconel 625 (alloy 625)",
    family: "nickel",
    standard: "ASTM F3056 (UNS N06625)",
    standardNote: `${FROM_MEMORY}: Cr 20.0–23.0, Mo 8.0–10.0, Nb+Ta 3.15–4.15, Fe ≤ 5.0, Co ≤ 1.0, Mn ≤ 0.50, Si ≤ 0.50, Al ≤ 0.40, Ti ≤ 0.40, C ≤ 0.10, Ni balance (≥ 58)`,
    components: [
      { element: "Ni", amountWtPct: null },
      { element: "Cr", amountWtPct: 21.5 },
      { element: "Mo", amountWtPct: 9 },
      { element: "Nb", amountWtPct: 3.65 },
      { element: "Fe", amountWtPct: 2.5 },
      { element: "Co", amountWtPct: 0.5 },
      { element: "Mn", amountWtPct: 0.25 },
      { element: "Si", amountWtPct: 0.25 },
      { element: "Al", amountWtPct: 0.2 },
      { element: "Ti", amountWtPct: 0.2 },
      { element: "C", amountWtPct: 0.05 },
    ],
    aliases: ["alloy 625", "Inconel 625", "Inconel625", "IN 625", "IN-625", "Ni625", "Ni 625", "nickel alloy 625", "UNS N06625", "N06625", "2.4856", "NiCr22Mo9Nb"],
  },
  {
    key: "HastelloyX",
    displayName: "Hastelloy X",
    family: "nickel",
    standard: "AMS 5536 (UNS N06002)",
    standardNote: `${FROM_MEMORY}: Cr 20.5–23.0, Fe 17.0–20.0, Mo 8.0–10.0, Co 0.5–2.5, W 0.2–1.0, C 0.05–0.15, Mn ≤ 1.0, Si ≤ 1.0, Ni balance`,
    components: [
      { element: "Ni", amountWtPct: null },
      { element: "Cr", amountWtPct: 21.75 },
      { element: "Fe", amountWtPct: 18.5 },
      { element: "Mo", amountWtPct: 9 },
      { element: "Co", amountWtPct: 1.5 },
      { element: "W", amountWtPct: 0.6 },
      { element: "Mn", amountWtPct: 0.5 },
      { element: "Si", amountWtPct: 0.5 },
      { element: "C", amountWtPct: 0.1 },
    ],
    aliases: ["Hastelloy X", "HastX", "Hast-X", "HX", "alloy X", "Haynes X", "UNS N06002", "N06002", "2.4665"],
  },
  {
    key: "AlSi10Mg",
    displayName: "AlSi10Mg",
    family: "aluminium",
    standard: "ASTM F3318",
    standardNote: `${FROM_MEMORY}: Si 9.0–11.0, Mg 0.20–0.45, Fe ≤ 0.55, Mn ≤ 0.45, Ti ≤ 0.15, Zn ≤ 0.10, Al balance`,
    components: [
      { element: "Al", amountWtPct: null },
      { element: "Si", amountWtPct: 10 },
      { element: "Mg", amountWtPct: 0.325 },
      { element: "Fe", amountWtPct: 0.275 },
      { element: "Mn", amountWtPct: 0.225 },
      { element: "Ti", amountWtPct: 0.075 },
      { element: "Zn", amountWtPct: 0.05 },
    ],
    aliases: ["Al-10Si-Mg", "Al Si10 Mg", "AlSi10Mg alloy", "EN AC-43000", "EN AC-AlSi10Mg", "AlSi10Mg(a)"],
  },
  {
    key: "AlSi7Mg",
    displayName: "AlSi7Mg0.6 (A357)",
    family: "aluminium",
    standard: "EN 1706 (EN AC-42200)",
    standardNote: `${FROM_MEMORY}: Si 6.5–7.5, Mg 0.45–0.70, Fe ≤ 0.19, Ti ≤ 0.25, Al balance`,
    components: [
      { element: "Al", amountWtPct: null },
      { element: "Si", amountWtPct: 7 },
      { element: "Mg", amountWtPct: 0.575 },
      { element: "Fe", amountWtPct: 0.095 },
      { element: "Ti", amountWtPct: 0.125 },
    ],
    aliases: ["AlSi7Mg0.6", "A357", "EN AC-42200", "AlSi7Mg0,6"],
  },
  {
    key: "CuCrZr",
    displayName: "CuCrZr (CuCr1Zr)",
    family: "copper",
    standard: "EN 12163 (CW106C)",
    standardNote: `${FROM_MEMORY}: Cr 0.5–1.2, Zr 0.03–0.3, Cu balance`,
    components: [
      { element: "Cu", amountWtPct: null },
      { element: "Cr", amountWtPct: 0.85 },
      { element: "Zr", amountWtPct: 0.165 },
    ],
    aliases: ["CuCr1Zr", "Cu-Cr-Zr", "CW106C", "C18150", "UNS C18150", "2.1293", "CuCr1Zr0.1"],
  },
  {
    key: "CoCrMo",
    displayName: "CoCrMo (Co-28Cr-6Mo)",
    family: "cobalt",
    standard: "ASTM F75 / ASTM F3213",
    standardNote: `${FROM_MEMORY}: Cr 27.0–30.0, Mo 5.0–7.0, Si ≤ 1.0, Mn ≤ 1.0, Fe ≤ 0.75, Ni ≤ 0.5, C ≤ 0.35, N ≤ 0.25, W ≤ 0.2, Co balance`,
    components: [
      { element: "Co", amountWtPct: null },
      { element: "Cr", amountWtPct: 28.5 },
      { element: "Mo", amountWtPct: 6 },
      { element: "Si", amountWtPct: 0.5 },
      { element: "Mn", amountWtPct: 0.5 },
      { element: "Fe", amountWtPct: 0.375 },
      { element: "Ni", amountWtPct: 0.25 },
      { element: "C", amountWtPct: 0.175 },
      { element: "N", amountWtPct: 0.125 },
      { element: "W", amountWtPct: 0.1 },
    ],
    aliases: ["CoCr", "Co-Cr-Mo", "CoCrMo alloy", "Co28Cr6Mo", "Co-28Cr-6Mo", "ASTM F75", "F75", "MP1", "CobaltChrome", "cobalt chrome", "UNS R30075", "R30075"],
  },
];

/**
 * The form used to match grade names: Unicode-normalized, lower-case, letters and digits only, so
 * "SS 316-L", "ss316l" and "SS316L" meet.
 *
 * @example
 * normalizeGradeName("18Ni(300)"); // "18ni300"
 * normalizeGradeName("Ti-6Al-4V"); // "ti6al4v"
 */
export function normalizeGradeName(text: string): string {
  return text.normalize("NFKC").toLowerCase().replace(/[^a-z0-9]+/g, "");
}

const BY_NAME: ReadonlyMap<string, AlloyGrade> = (() => {
  const map = new Map<string, AlloyGrade>();
  for (const grade of GRADES) {
    for (const name of [grade.key, grade.displayName, ...grade.aliases]) {
      const normalized = normalizeGradeName(name);
      const existing = map.get(normalized);
      if (existing && existing !== grade) {
        throw new TypeError(`grades: alias '${name}' names both ${existing.key} and ${grade.key}`);
      }
      map.set(normalized, grade);
    }
  }
  return map;
})();

/**
 * Finds a grade by key or alias, ignoring case, spaces, hyphens and brackets.
 *
 * @example
 * findGrade("Inconel 718")?.key; // "IN718"
 * findGrade("maraging 300")?.key; // "18Ni300"
 * findGrade("Ti-5553"); // undefined
 */
export function findGrade(name: string): AlloyGrade | undefined {
  return BY_NAME.get(normalizeGradeName(name));
}
