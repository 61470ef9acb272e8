/**
 * The invented world of the demo scenario: the lab, its users, the alloys of the toy physics
 * model, the ways sources word outcomes, and the ten sources with the parameter grids, units and
 * reporting habits of each. Everything here is invented; DOIs use the 10.5555 test prefix.
 *
 * Hatch spacings of sources with the same alloy differ by more than 1 µm, so the only near
 * duplicates across sources are the planted ones.
 */
import type { Scenario, ScenarioSource } from "./scenario";

export const LAB = {
  name: "Gullwing Bay Additive Lab",
  city: "Port Ansel",
  description:
    "An invented university lab that compiles laser powder bed fusion build records from papers, theses, reports and its own shop trials to train printability models.",
};

export const USERS: Scenario["users"] = [
  { name: "Ysolde", role: "admin" },
  { name: "Tobiah", role: "reviewer" },
  { name: "Corvin", role: "contributor" },
  { name: "Maelis", role: "contributor" },
];
export const CONTRIBUTORS = ["Corvin", "Maelis"] as const;

export const DEMO_ALLOYS = ["316L", "Ti-6Al-4V", "AlSi10Mg", "IN718"] as const;
export type AlloyName = (typeof DEMO_ALLOYS)[number];
/** Outcomes the toy physics produces; "other" and "unknown" come only from how sources word them. */
export type PhysicalOutcome = "dense" | "keyhole" | "lack_of_fusion" | "balling" | "cracking";

export interface AlloyModel {
  /** E_v window of dense parts in the toy model, J/mm³ (common practice, from memory). */
  denseWindowJPerMm3: readonly [number, number];
  /** Balling when both are reached (common practice: long fast melt pools break up). */
  ballingMinSpeedMmPerS: number;
  ballingMinPowerW: number;
  /** Typical gas-atomized LPBF powder, µm (common practice). */
  powderUm: { d10: number; d50: number; d90: number };
  atmosphere: "argon" | "nitrogen";
}

export const ALLOYS: Record<AlloyName, AlloyModel> = {
  "316L": { denseWindowJPerMm3: [55, 125], ballingMinSpeedMmPerS: 1500, ballingMinPowerW: 300, powderUm: { d10: 15, d50: 30, d90: 48 }, atmosphere: "argon" },
  "Ti-6Al-4V": { denseWindowJPerMm3: [42, 100], ballingMinSpeedMmPerS: 1400, ballingMinPowerW: 260, powderUm: { d10: 20, d50: 35, d90: 50 }, atmosphere: "argon" },
  AlSi10Mg: { denseWindowJPerMm3: [38, 80], ballingMinSpeedMmPerS: 1500, ballingMinPowerW: 360, powderUm: { d10: 22, d50: 38, d90: 62 }, atmosphere: "argon" },
  IN718: { denseWindowJPerMm3: [55, 115], ballingMinSpeedMmPerS: 1300, ballingMinPowerW: 320, powderUm: { d10: 16, d50: 31, d90: 47 }, atmosphere: "argon" },
};

/** The toy model's dense windows, J/mm³, for tests and documentation. */
export const DEMO_DENSE_WINDOWS_J_PER_MM3: Readonly<Record<AlloyName, readonly [number, number]>> = Object.fromEntries(
  DEMO_ALLOYS.map((a) => [a, ALLOYS[a].denseWindowJPerMm3]),
) as Record<AlloyName, readonly [number, number]>;

/** The hole left in the 316L power–speed plane: no record of any source falls inside. */
export const HOLE_316L = { minPowerW: 240, maxPowerW: 310, minSpeedMmPerS: 900, maxSpeedMmPerS: 1300 };
/** AlSi10Mg grids stop here; only a few planted records lie above. */
export const ALSI_SPEED_CAP_MM_PER_S = 1600;

export type Vocabulary = (outcome: PhysicalOutcome, relativeDensityPct: number) => string;

const words = (w: Record<PhysicalOutcome, string>): Vocabulary => (o) => w[o];

export const VOCABULARY = {
  plain: words({ dense: "dense", keyhole: "keyhole", lack_of_fusion: "lack of fusion", balling: "balling", cracking: "cracking" }),
  dataset: words({ dense: "desirable", keyhole: "KH", lack_of_fusion: "LOF", balling: "balling", cracking: "cracking" }),
  prose: words({ dense: "fully dense", keyhole: "keyholing", lack_of_fusion: "unfused powder", balling: "beading", cracking: "cracked" }),
  report: words({ dense: "success", keyhole: "keyhole porosity", lack_of_fusion: "lack-of-fusion", balling: "balled", cracking: "hot cracking" }),
  thesis: words({ dense: "dense", keyhole: "keyhole", lack_of_fusion: "lack of fusion", balling: "balling", cracking: "solidification cracking" }),
  // the shop floor calls any porosity "porous": it maps to "other"
  shop: words({ dense: "good", keyhole: "porous", lack_of_fusion: "porous", balling: "beading", cracking: "cracks" }),
  conference: words({ dense: "dense", keyhole: "keyhole pores", lack_of_fusion: "LOF", balling: "balling", cracking: "cracks" }),
  // a density-only source: dense when the density says so, else "porous"
  densityOnly: (_o: PhysicalOutcome, rd: number) => (rd >= 99 ? "dense" : "porous"),
} satisfies Record<string, Vocabulary>;

export interface AlloyGrid {
  alloy: AlloyName;
  share: number;
  powerW: readonly number[];
  speedMmPerS: readonly number[];
  hatchUm: readonly number[];
  layerUm: readonly number[];
}

export interface SourceUnits {
  power: string;
  speed: string;
  hatch: string;
  layer: string;
  spot: string;
  preheat: string;
  powder: string;
  density: string;
}

export interface SourceSpec {
  source: ScenarioSource;
  share: number;
  createdBy: string;
  firstDay: number;
  machine: string | null;
  grids: readonly AlloyGrid[];
  units: SourceUnits;
  decimalComma: boolean;
  /** Spot diameter under the source's definition, µm; null when not given at all. */
  spotUm: number | null;
  spotProvenance: "reported" | "assumed";
  preheatC: Partial<Record<AlloyName, number>>;
  preheatProvenance: "reported" | "assumed";
  scanStrategy: string | null;
  powder: "d10_d50_d90" | "d50" | null;
  /** Decimals of the relative density as printed; null when the source gives none. */
  densityDecimals: number | null;
  densityProvenance: "reported" | "derived";
  vocabulary: Vocabulary;
  /** Share of records whose outcome the source does not give. */
  outcomeWithheld: { share: number; text: string | null };
  locations: readonly { page: number | null; label: string }[];
}

const range = (from: number, to: number, step: number): number[] => {
  const out: number[] = [];
  for (let x = from; x <= to + 1e-9; x += step) out.push(Math.round(x * 1e6) / 1e6);
  return out;
};

const STANDARD_UNITS: SourceUnits = { power: "W", speed: "mm/s", hatch: "µm", layer: "µm", spot: "µm", preheat: "°C", powder: "µm", density: "%" };
const INCH_UM = 25_400; // 1 in = 25.4 mm exactly (NIST SP 811, Appendix B.8)

const source = (s: Omit<ScenarioSource, "url" | "notes"> & Partial<Pick<ScenarioSource, "url" | "notes">>): ScenarioSource => ({
  url: null,
  notes: null,
  ...s,
});

export const SOURCES: readonly SourceSpec[] = [
  {
    source: source({
      key: "S01",
      kind: "journal_article",
      title: "Process window mapping for 316L stainless steel in laser powder bed fusion: porosity mechanisms across energy density",
      authors: ["A. Quenchley", "R. Sinterberg", "M. Powderhall"],
      year: 2018,
      venue: "Journal of Invented Additive Processes",
      doi: "10.5555/jiap.2018.0412",
      densityMethod: "archimedes",
      outcomeEvidence: "micrographs",
      machineStated: true,
      spotSizeDefinition: "one_over_e2",
      powderReported: true,
      atmosphereReported: true,
    }),
    share: 0.13,
    createdBy: "Corvin",
    firstDay: 0,
    machine: "Tern LB-300 (lab unit 2)",
    grids: [{ alloy: "316L", share: 1, powerW: range(150, 375, 25), speedMmPerS: range(500, 1850, 150), hatchUm: [70, 90, 110], layerUm: [30, 50] }],
    units: STANDARD_UNITS,
    decimalComma: false,
    spotUm: 80,
    spotProvenance: "reported",
    preheatC: { "316L": 80 },
    preheatProvenance: "reported",
    scanStrategy: "stripes, 67° rotation",
    powder: "d10_d50_d90",
    densityDecimals: 2,
    densityProvenance: "reported",
    vocabulary: VOCABULARY.plain,
    outcomeWithheld: { share: 0, text: null },
    locations: [{ page: 4, label: "Table 2" }, { page: 5, label: "Table 3" }, { page: 6, label: "Fig. 5" }],
  },
  {
    source: source({
      key: "S02",
      kind: "journal_article",
      title: "Keyhole and lack-of-fusion boundaries in Ti-6Al-4V built at scan speeds up to 1.7 m/s",
      authors: ["J. Fusebrook", "K. Hatchwell"],
      year: 2020,
      venue: "Annals of Layered Metal Fabrication",
      doi: "10.5555/almf.2020.117",
      densityMethod: "ct",
      outcomeEvidence: "micrographs",
      machineStated: true,
      spotSizeDefinition: "one_over_e2",
      powderReported: true,
      atmosphereReported: true,
    }),
    share: 0.11,
    createdBy: "Maelis",
    firstDay: 8,
    machine: "Halyard HX-250",
    grids: [{ alloy: "Ti-6Al-4V", share: 1, powerW: range(100, 325, 25), speedMmPerS: range(600, 1700, 100), hatchUm: [60, 80, 100, 120], layerUm: [30] }],
    units: { ...STANDARD_UNITS, speed: "m/s" },
    decimalComma: false,
    spotUm: 100,
    spotProvenance: "reported",
    preheatC: { "Ti-6Al-4V": 200 },
    preheatProvenance: "reported",
    scanStrategy: "meander, 90° rotation per layer",
    powder: "d50",
    densityDecimals: 2,
    densityProvenance: "reported",
    vocabulary: VOCABULARY.dataset,
    outcomeWithheld: { share: 0, text: null },
    locations: [{ page: 3, label: "Table 1" }, { page: 7, label: "Fig. 4" }, { page: 8, label: "Fig. 6" }, { page: 12, label: "Table A1" }],
  },
  {
    source: source({
      key: "S03",
      kind: "conference_paper",
      title: "Density of AlSi10Mg coupons over a hatch-spacing sweep",
      authors: ["E. Meltzinger", "P. Beadmore", "T. Layerton"],
      year: 2016,
      venue: "Proceedings of the Northshore Symposium on Beam Processing",
      doi: "10.5555/nsbp.2016.031",
      densityMethod: "image_analysis",
      outcomeEvidence: "density_only",
      machineStated: false,
      spotSizeDefinition: "one_over_e2",
      powderReported: false,
      atmosphereReported: true,
    }),
    share: 0.1,
    createdBy: "Corvin",
    firstDay: 15,
    machine: null,
    grids: [{ alloy: "AlSi10Mg", share: 1, powerW: range(250, 400, 25), speedMmPerS: range(700, ALSI_SPEED_CAP_MM_PER_S, 100), hatchUm: [130, 150, 170, 190], layerUm: [30, 40] }],
    units: { ...STANDARD_UNITS, hatch: "mm", spot: "mm" },
    decimalComma: false,
    spotUm: 100,
    spotProvenance: "reported",
    preheatC: { AlSi10Mg: 150 },
    preheatProvenance: "reported",
    scanStrategy: null,
    powder: null,
    densityDecimals: 1,
    densityProvenance: "reported",
    vocabulary: VOCABULARY.densityOnly,
    outcomeWithheld: { share: 0, text: null },
    locations: [{ page: 2, label: "Table 1" }, { page: 3, label: "Fig. 2" }, { page: 3, label: "Fig. 3" }, { page: 4, label: "Table 2" }],
  },
  {
    source: source({
      key: "S04",
      kind: "thesis",
      title: "Parameter development for IN718 and 316L on a shared research platform",
      authors: ["S. Keyholm"],
      year: 2021,
      venue: "Doctoral thesis, Institute of Imaginary Metallurgy",
      doi: "10.5555/thesis.2021.keyholm",
      densityMethod: "archimedes",
      outcomeEvidence: "micrographs",
      machineStated: true,
      spotSizeDefinition: "one_over_e2",
      powderReported: true,
      atmosphereReported: true,
    }),
    share: 0.12,
    createdBy: "Maelis",
    firstDay: 22,
    machine: "Tern LB-300 (lab unit 1)",
    grids: [
      { alloy: "IN718", share: 0.6, powerW: range(150, 375, 25), speedMmPerS: range(500, 1500, 100), hatchUm: [85, 105, 125], layerUm: [40, 50] },
      { alloy: "316L", share: 0.4, powerW: range(150, 350, 25), speedMmPerS: range(400, 1600, 150), hatchUm: [75, 95, 115], layerUm: [40, 60] },
    ],
    units: { ...STANDARD_UNITS, power: "kW" },
    decimalComma: true,
    spotUm: 70,
    spotProvenance: "reported",
    preheatC: { IN718: 80, "316L": 80 },
    preheatProvenance: "reported",
    scanStrategy: "chessboard, 5 mm islands",
    powder: "d10_d50_d90",
    densityDecimals: 2,
    densityProvenance: "reported",
    vocabulary: VOCABULARY.thesis,
    outcomeWithheld: { share: 0, text: null },
    locations: [{ page: 61, label: "Table 4.2" }, { page: 63, label: "Table 4.3" }, { page: 88, label: "Fig. 5.7" }, { page: 142, label: "Table B1" }],
  },
  {
    source: source({
      key: "S05",
      kind: "preprint",
      title: "Fast screening of Ti-6Al-4V printability from single-layer coupons",
      authors: ["N. Laserowski", "O. Spattersby"],
      year: 2024,
      venue: "Materials Preprint Commons",
      doi: "10.5555/mpc.2024.0173",
      url: "https://preprints.example.org/mpc/2024-0173",
      densityMethod: "other",
      outcomeEvidence: "statement_only",
      machineStated: false,
      spotSizeDefinition: "unstated",
      powderReported: false,
      atmosphereReported: false,
    }),
    share: 0.09,
    createdBy: "Corvin",
    firstDay: 30,
    machine: null,
    grids: [{ alloy: "Ti-6Al-4V", share: 1, powerW: range(120, 340, 20), speedMmPerS: range(500, 1600, 100), hatchUm: [65, 85, 105, 125], layerUm: [30, 60] }],
    units: { ...STANDARD_UNITS, layer: "mm" },
    decimalComma: false,
    spotUm: 80,
    spotProvenance: "assumed",
    preheatC: {},
    preheatProvenance: "reported",
    scanStrategy: null,
    powder: null,
    densityDecimals: null,
    densityProvenance: "reported",
    vocabulary: VOCABULARY.prose,
    outcomeWithheld: { share: 0, text: null },
    locations: [{ page: 5, label: "Table 1" }, { page: 6, label: "Fig. 3" }],
  },
  {
    source: source({
      key: "S06",
      kind: "report",
      title: "Qualification trials of IN718 on a dual-laser system, phase 1",
      authors: ["G. Crucibleton", "H. Ashgrove-Tinn"],
      year: 2019,
      venue: "Technical report TR-19-07, Port Ansel Materials Consortium",
      doi: "10.5555/tr.2019.07",
      densityMethod: "unknown",
      outcomeEvidence: "density_only",
      machineStated: true,
      spotSizeDefinition: "fwhm",
      powderReported: true,
      atmosphereReported: true,
    }),
    share: 0.1,
    createdBy: "Maelis",
    firstDay: 37,
    machine: "Corvid 400 Dual",
    grids: [{ alloy: "IN718", share: 1, powerW: range(180, 380, 20), speedMmPerS: range(600, 1500, 100), hatchUm: [90, 110, 130], layerUm: [30, 60] }],
    units: STANDARD_UNITS,
    decimalComma: false,
    spotUm: 55, // FWHM, about 93 µm as a 1/e² diameter
    spotProvenance: "reported",
    preheatC: { IN718: 100 },
    preheatProvenance: "reported",
    scanStrategy: "stripes, 67° rotation",
    powder: "d10_d50_d90",
    densityDecimals: 1,
    densityProvenance: "reported",
    vocabulary: VOCABULARY.report,
    outcomeWithheld: { share: 0.1, text: "not assessed" },
    locations: [{ page: 9, label: "Table 3" }, { page: 10, label: "Table 4" }, { page: 14, label: "Fig. 8" }],
  },
  {
    source: source({
      key: "S07",
      kind: "journal_article",
      title: "Revisiting the 316L process window with a second powder lot",
      authors: ["R. Sinterberg", "A. Quenchley", "V. Hopperfield"],
      year: 2022,
      venue: "Fictional Letters in Powder Metallurgy",
      doi: "10.5555/flpm.2022.088",
      densityMethod: "archimedes",
      outcomeEvidence: "density_only",
      machineStated: true,
      spotSizeDefinition: "one_over_e2",
      powderReported: false,
      atmosphereReported: true,
    }),
    share: 0.06,
    createdBy: "Corvin",
    firstDay: 44,
    machine: "Tern LB-300 (lab unit 2)",
    grids: [{ alloy: "316L", share: 1, powerW: range(160, 360, 20), speedMmPerS: range(550, 1750, 150), hatchUm: [80, 100, 120], layerUm: [30, 40] }],
    units: { ...STANDARD_UNITS, hatch: "um", layer: "um", spot: "um", density: "fraction" },
    decimalComma: false,
    spotUm: 80,
    spotProvenance: "reported",
    preheatC: {},
    preheatProvenance: "reported",
    scanStrategy: "stripes, 67° rotation",
    powder: null,
    densityDecimals: 2,
    // the paper gives porosity; relative density is 1 − porosity
    densityProvenance: "derived",
    vocabulary: VOCABULARY.plain,
    outcomeWithheld: { share: 0, text: null },
    locations: [{ page: 3, label: "Table 1" }, { page: 4, label: "Table 2" }, { page: 11, label: "Table S3" }],
  },
  {
    source: source({
      key: "S08",
      kind: "conference_paper",
      title: "Balling onset in AlSi10Mg at elevated platform temperature",
      authors: ["I. Puddlewick", "F. Recoaterson"],
      year: 2023,
      venue: "Proceedings of the Harbour Conference on Powder Bed Processes",
      doi: "10.5555/hcpbp.2023.212",
      densityMethod: "image_analysis",
      outcomeEvidence: "micrographs",
      machineStated: true,
      spotSizeDefinition: "d4sigma",
      powderReported: false,
      atmosphereReported: false,
    }),
    share: 0.09,
    createdBy: "Maelis",
    firstDay: 50,
    machine: "Petrel P4 (400 W retrofit)",
    grids: [{ alloy: "AlSi10Mg", share: 1, powerW: range(260, 400, 20), speedMmPerS: range(800, ALSI_SPEED_CAP_MM_PER_S, 100), hatchUm: [140, 160, 180, 200], layerUm: [30, 50] }],
    units: { ...STANDARD_UNITS, hatch: "\u03BCm", layer: "\u03BCm", spot: "\u03BCm" }, // Greek mu, as typed
    decimalComma: false,
    spotUm: 90,
    spotProvenance: "reported",
    preheatC: { AlSi10Mg: 200 },
    preheatProvenance: "assumed",
    scanStrategy: "meander, 67° rotation",
    powder: null,
    densityDecimals: 1,
    densityProvenance: "reported",
    vocabulary: VOCABULARY.conference,
    outcomeWithheld: { share: 0, text: null },
    locations: [{ page: 2, label: "Table 1" }, { page: 4, label: "Fig. 3" }, { page: 5, label: "Fig. 4" }, { page: 5, label: "Table 2" }],
  },
  {
    source: source({
      key: "S09",
      kind: "shop_trial",
      title: "Shop trial log: 316L brackets under nitrogen cover gas",
      authors: ["B. Toolwright"],
      year: 2025,
      venue: null,
      doi: null,
      notes: "Run sheets from the lab's own shop floor; parts judged by eye and by sectioning a few.",
      densityMethod: "unknown",
      outcomeEvidence: "statement_only",
      machineStated: true,
      spotSizeDefinition: "unstated",
      powderReported: false,
      atmosphereReported: true,
    }),
    share: 0.07,
    createdBy: "Ysolde",
    firstDay: 57,
    machine: "Halyard HX-250 (shop floor)",
    grids: [
      {
        alloy: "316L",
        share: 1,
        powerW: range(180, 380, 20),
        speedMmPerS: range(24, 72, 4).map((ips) => ips * 25.4), // set in in/s on the machine
        hatchUm: [0.0034, 0.0042, 0.0049].map((inch) => inch * INCH_UM),
        layerUm: [2 * 25.4], // 2 mil
      },
    ],
    units: { ...STANDARD_UNITS, speed: "in/s", hatch: "in", layer: "mil" },
    decimalComma: false,
    spotUm: null,
    spotProvenance: "reported",
    preheatC: {},
    preheatProvenance: "reported",
    scanStrategy: "unidirectional, no rotation",
    powder: null,
    densityDecimals: null,
    densityProvenance: "reported",
    vocabulary: VOCABULARY.shop,
    outcomeWithheld: { share: 0.05, text: null },
    locations: [{ page: null, label: "Run sheet 1" }, { page: null, label: "Run sheet 2" }, { page: null, label: "Run sheet 3" }],
  },
  {
    source: source({
      key: "S10",
      kind: "journal_article",
      title: "Energy-density maps for IN718 and Ti-6Al-4V with platform preheating",
      authors: ["D. Gasflowe", "U. Chambervex"],
      year: 2017,
      venue: "Journal of Invented Additive Processes",
      doi: "10.5555/jiap.2017.0233",
      densityMethod: "ct",
      outcomeEvidence: "micrographs",
      machineStated: true,
      spotSizeDefinition: "one_over_e2",
      powderReported: true,
      atmosphereReported: true,
    }),
    share: 0.13,
    createdBy: "Corvin",
    firstDay: 64,
    machine: "Corvid 400 Dual",
    grids: [
      { alloy: "IN718", share: 0.5, powerW: range(200, 400, 25), speedMmPerS: range(600, 1400, 100), hatchUm: [95, 115, 135], layerUm: [40, 60] },
      { alloy: "Ti-6Al-4V", share: 0.5, powerW: range(150, 350, 25), speedMmPerS: range(700, 1500, 100), hatchUm: [70, 90, 110, 130], layerUm: [30, 60] },
    ],
    units: { ...STANDARD_UNITS, speed: "mm s-1", preheat: "K" },
    decimalComma: false,
    spotUm: 75,
    spotProvenance: "reported",
    preheatC: { IN718: 80, "Ti-6Al-4V": 200 },
    preheatProvenance: "reported",
    scanStrategy: "stripes, 67° rotation",
    powder: "d10_d50_d90",
    densityDecimals: 2,
    densityProvenance: "reported",
    vocabulary: VOCABULARY.plain,
    outcomeWithheld: { share: 0, text: null },
    locations: [{ page: 5, label: "Table 2" }, { page: 6, label: "Table 3" }, { page: 8, label: "Fig. 5" }, { page: 9, label: "Fig. 6" }],
  },
];

const SOURCE_BY_KEY = new Map(SOURCES.map((s) => [s.source.key, s]));

export function spec(key: string): SourceSpec {
  const s = SOURCE_BY_KEY.get(key);
  if (!s) throw new RangeError(`generateScenario: no source ${key}`);
  return s;
}
