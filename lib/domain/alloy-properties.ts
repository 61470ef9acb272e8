/**
 * Thermophysical property sets for the melt-pool physics: a curated set per known alloy (a value
 * and a source each), overridable per alloy by the caller, with a rule-of-mixtures fallback for
 * other compositions. Every resolved value says where it came from; mixture values that are known
 * to be poor (conductivity, melting range, boiling point) and defaults carry `estimated: true`.
 *
 * The curated values were typed from memory of the named sources and are representative values for
 * conduction-mode estimates (c_p and k as means between room temperature and the solidus where the
 * source tabulates a temperature dependence); check them before relying on them, and pass
 * overrides where a better value is known.
 */
import type { Composition } from "./composition";
import { mixtureProperties } from "./properties";

export const PROPERTY_NAMES = [
  "densityKgPerM3",
  "specificHeatJPerKgK",
  "thermalConductivityWPerMK",
  "solidusK",
  "liquidusK",
  "boilingK",
  "latentHeatJPerKg",
  "absorptivity",
] as const;
export type PropertyName = (typeof PROPERTY_NAMES)[number];

export interface SourcedValue {
  value: number;
  source: string;
}

export type AlloyPropertySet = Record<PropertyName, SourcedValue>;

export type PropertyOrigin = "curated" | "override" | "mixture" | "default";

export interface ResolvedProperty {
  value: number;
  source: string;
  origin: PropertyOrigin;
  estimated: boolean;
}

export type ResolvedProperties = Record<PropertyName, ResolvedProperty>;

/** The properties the melt-pool physics needs (solidus and latent heat are informative only). */
export const PHYSICS_PROPERTIES: readonly PropertyName[] = [
  "absorptivity",
  "densityKgPerM3",
  "specificHeatJPerKgK",
  "thermalConductivityWPerMK",
  "liquidusK",
  "boilingK",
];

const MILLS = "K. C. Mills, Recommended Values of Thermophysical Properties for Selected Commercial Alloys (2002), from memory";
const MIDRANGE = "representative value between room temperature and the solidus, from memory";
const STEEL_BOIL = "boiling point of iron, CRC Handbook, used for Fe-base alloys (common practice in melt-pool modelling), from memory";
const NI_BOIL = "boiling point of nickel, CRC Handbook, used for Ni-base alloys (common practice), from memory";
const ABS_STEEL = "conduction-mode absorptivity of steels and Ni/Co alloys at 1 µm, ~0.3–0.4 (common practice)";

function set(values: Record<PropertyName, [number, string]>): AlloyPropertySet {
  return Object.fromEntries(Object.entries(values).map(([k, [value, source]]) => [k, { value, source }])) as AlloyPropertySet;
}

/** Curated property sets keyed by alloy key (see grades.ts). */
export const CURATED_PROPERTY_SETS: Readonly<Record<string, AlloyPropertySet>> = {
  "316L": set({
    densityKgPerM3: [7950, `${MILLS} (316 stainless steel, 298 K)`],
    specificHeatJPerKgK: [500, `${MIDRANGE}; Mills 2002 gives ~450 at 298 K rising towards ~700 near melting`],
    thermalConductivityWPerMK: [20, `${MIDRANGE}; Mills 2002 gives ~14 at 298 K and ~30 near the solidus`],
    solidusK: [1658, `${MILLS} (316)`],
    liquidusK: [1723, `${MILLS} (316)`],
    boilingK: [3090, STEEL_BOIL],
    latentHeatJPerKg: [2.7e5, `${MILLS} (316)`],
    absorptivity: [0.35, ABS_STEEL],
  }),
  "304L": set({
    densityKgPerM3: [7900, "CRC/ASM handbook value for 304, from memory"],
    specificHeatJPerKgK: [500, MIDRANGE],
    thermalConductivityWPerMK: [20, MIDRANGE],
    solidusK: [1673, `${MILLS} (304)`],
    liquidusK: [1727, `${MILLS} (304)`],
    boilingK: [3090, STEEL_BOIL],
    latentHeatJPerKg: [2.7e5, `${MILLS} (304)`],
    absorptivity: [0.35, ABS_STEEL],
  }),
  "17-4PH": set({
    densityKgPerM3: [7780, "ASM handbook value for 17-4PH (condition A), from memory"],
    specificHeatJPerKgK: [500, MIDRANGE],
    thermalConductivityWPerMK: [20, `${MIDRANGE}; ~18 at room temperature (ASM, from memory)`],
    solidusK: [1677, "ASM handbook melting range for 17-4PH, from memory"],
    liquidusK: [1713, "ASM handbook melting range for 17-4PH, from memory"],
    boilingK: [3090, STEEL_BOIL],
    latentHeatJPerKg: [2.7e5, "taken equal to 316 (Mills 2002), from memory"],
    absorptivity: [0.35, ABS_STEEL],
  }),
  "18Ni300": set({
    densityKgPerM3: [8000, "producer data sheets for maraging 300, from memory"],
    specificHeatJPerKgK: [450, MIDRANGE],
    thermalConductivityWPerMK: [20, MIDRANGE],
    solidusK: [1686, "producer data sheets for maraging 300, from memory"],
    liquidusK: [1727, "producer data sheets for maraging 300, from memory"],
    boilingK: [3090, STEEL_BOIL],
    latentHeatJPerKg: [2.7e5, "taken equal to 316 (Mills 2002), from memory"],
    absorptivity: [0.35, ABS_STEEL],
  }),
  H13: set({
    densityKgPerM3: [7800, "ASM handbook value for H13, from memory"],
    specificHeatJPerKgK: [460, "ASM handbook value for H13 at room temperature, from memory"],
    thermalConductivityWPerMK: [25, "ASM handbook value for H13 (~24–29 up to 900 K), from memory"],
    solidusK: [1588, "melting range of H13, producer data, from memory"],
    liquidusK: [1727, "melting range of H13, producer data, from memory"],
    boilingK: [3090, STEEL_BOIL],
    latentHeatJPerKg: [2.7e5, "taken equal to 316 (Mills 2002), from memory"],
    absorptivity: [0.35, ABS_STEEL],
  }),
  "Ti-6Al-4V": set({
    densityKgPerM3: [4420, `${MILLS} (Ti-6Al-4V)`],
    specificHeatJPerKgK: [546, `${MILLS} (Ti-6Al-4V)`],
    thermalConductivityWPerMK: [17, `${MIDRANGE}; Mills 2002 gives ~7 at 298 K rising to ~25–30 near the solidus`],
    solidusK: [1878, `${MILLS} (Ti-6Al-4V)`],
    liquidusK: [1923, `${MILLS} (Ti-6Al-4V)`],
    boilingK: [3560, "boiling point of titanium, CRC Handbook, from memory"],
    latentHeatJPerKg: [2.86e5, `${MILLS} (Ti-6Al-4V)`],
    absorptivity: [0.4, "conduction-mode absorptivity of Ti alloys at 1 µm, ~0.35–0.45 (common practice)"],
  }),
  IN718: set({
    densityKgPerM3: [8190, `${MILLS} (IN718)`],
    specificHeatJPerKgK: [435, `${MILLS} (IN718)`],
    thermalConductivityWPerMK: [11.4, `${MILLS} (IN718)`],
    solidusK: [1533, `${MILLS} (IN718)`],
    liquidusK: [1609, `${MILLS} (IN718)`],
    boilingK: [3186, NI_BOIL],
    latentHeatJPerKg: [2.1e5, `${MILLS} (IN718)`],
    absorptivity: [0.35, ABS_STEEL],
  }),
  IN625: set({
    densityKgPerM3: [8440, "Materials 11(12):2356 (2018), Table 3"],
    specificHeatJPerKgK: [410, "Materials 11(12):2356 (2018), Table 3"],
    thermalConductivityWPerMK: [9.8, "Materials 11(12):2356 (2018), Table 3"],
    solidusK: [1563, "producer data sheets for alloy 625 (1290 °C), from memory"],
    liquidusK: [1623, "Materials 11(12):2356 (2018), Table 3 (T_m)"],
    boilingK: [3186, NI_BOIL],
    latentHeatJPerKg: [2.27e5, "Materials 11(12):2356 (2018), Table 3"],
    absorptivity: [0.35, ABS_STEEL],
  }),
  HastelloyX: set({
    densityKgPerM3: [8220, "producer data sheets for Hastelloy X, from memory"],
    specificHeatJPerKgK: [486, "producer data sheets for Hastelloy X, from memory"],
    thermalConductivityWPerMK: [9.2, "producer data sheets for Hastelloy X (room temperature), from memory"],
    solidusK: [1533, "producer data sheets for Hastelloy X (1260 °C), from memory"],
    liquidusK: [1628, "producer data sheets for Hastelloy X (1355 °C), from memory"],
    boilingK: [3186, NI_BOIL],
    latentHeatJPerKg: [2.5e5, "typical of Ni-base superalloys, from memory"],
    absorptivity: [0.35, ABS_STEEL],
  }),
  AlSi10Mg: set({
    densityKgPerM3: [2670, "EN 1706 / producer data for AlSi10Mg, from memory"],
    specificHeatJPerKgK: [915, "producer data for AlSi10Mg, from memory"],
    thermalConductivityWPerMK: [130, "producer data for as-built AlSi10Mg (~110–150), from memory"],
    solidusK: [830, "Al–Si eutectic region, producer data (557 °C), from memory"],
    liquidusK: [869, "producer data for AlSi10Mg (596 °C), from memory"],
    boilingK: [2743, "boiling point of aluminium, CRC Handbook, from memory"],
    latentHeatJPerKg: [4.2e5, "Al–Si alloys near the eutectic, from memory"],
    absorptivity: [0.2, "Al alloys at 1 µm in conduction mode are low (~0.1–0.3; common practice)"],
  }),
  AlSi7Mg: set({
    densityKgPerM3: [2680, "EN 1706 / producer data for A357, from memory"],
    specificHeatJPerKgK: [900, "producer data for A357, from memory"],
    thermalConductivityWPerMK: [150, "producer data for A357, from memory"],
    solidusK: [828, "producer data for A357 (555 °C), from memory"],
    liquidusK: [888, "producer data for A357 (615 °C), from memory"],
    boilingK: [2743, "boiling point of aluminium, CRC Handbook, from memory"],
    latentHeatJPerKg: [4.0e5, "Al–Si alloys, from memory"],
    absorptivity: [0.2, "Al alloys at 1 µm in conduction mode are low (~0.1–0.3; common practice)"],
  }),
  CuCrZr: set({
    densityKgPerM3: [8890, "producer data for CW106C, from memory"],
    specificHeatJPerKgK: [390, "producer data for CW106C, from memory"],
    thermalConductivityWPerMK: [320, "producer data for CW106C (aged), from memory"],
    solidusK: [1343, "producer data for CW106C (1070 °C), from memory"],
    liquidusK: [1358, "melting point of copper, CRC Handbook, from memory"],
    boilingK: [2835, "boiling point of copper, CRC Handbook, from memory"],
    latentHeatJPerKg: [2.05e5, "heat of fusion of copper, CRC Handbook, from memory"],
    absorptivity: [0.1, "Cu alloys at 1 µm reflect strongly (~0.05–0.3 for powder beds; common practice)"],
  }),
  CoCrMo: set({
    densityKgPerM3: [8300, "producer data for ASTM F75 alloy, from memory"],
    specificHeatJPerKgK: [450, "producer data for ASTM F75 alloy, from memory"],
    thermalConductivityWPerMK: [13, "producer data for ASTM F75 alloy (room temperature), from memory"],
    solidusK: [1623, "melting range of F75 (1350–1450 °C), from memory"],
    liquidusK: [1723, "melting range of F75 (1350–1450 °C), from memory"],
    boilingK: [3200, "boiling point of cobalt, CRC Handbook, from memory"],
    latentHeatJPerKg: [2.9e5, "typical of Co-base alloys, from memory"],
    absorptivity: [0.35, ABS_STEEL],
  }),
};

/** Absorptivity when nothing better is known (common practice for metals in conduction mode). */
export const DEFAULT_ABSORPTIVITY = 0.35;

export type PropertyOverrides = Partial<Record<PropertyName, number | SourcedValue>>;

export interface ResolvePropertiesInput {
  /** Alloy key from resolveAlloy; selects a curated set when one exists. */
  alloyKey?: string | null;
  /** Composition for the mixture fallback. */
  composition?: Composition | null;
  /** Values that replace the curated or mixture ones. */
  overrides?: PropertyOverrides;
  /** Properties that must be resolved; default PHYSICS_PROPERTIES. */
  required?: readonly PropertyName[];
}

export type ResolvePropertiesResult =
  | {
      ok: true;
      /** Every required property, and the others that a source gave. */
      properties: Partial<ResolvedProperties>;
      basis: "curated" | "mixture" | "overrides";
      notes: string[];
    }
  | { ok: false; message: string; missing: PropertyName[] };

function checkOverride(name: PropertyName, value: number): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new RangeError(`resolveAlloyProperties: override ${name} must be a positive finite number, got ${String(value)}`);
  }
  if (name === "absorptivity" && value > 1) {
    throw new RangeError(`resolveAlloyProperties: override absorptivity must be at most 1, got ${value}`);
  }
}

/**
 * Resolves the property set for the physics: overrides first, then the curated set of the alloy,
 * then the rule of mixtures of the composition (flagged estimated where it is poor).
 * An override that is zero, negative or not a number is a RangeError naming it.
 *
 * @example
 * resolveAlloyProperties({ alloyKey: "316L" }).properties.thermalConductivityWPerMK;
 * // { value: 20, origin: "curated", estimated: false, source: "..." }
 * resolveAlloyProperties({ alloyKey: "316L", overrides: { absorptivity: 0.4 } }); // absorptivity origin "override"
 */
export function resolveAlloyProperties(input: ResolvePropertiesInput): ResolvePropertiesResult {
  const overrides = input.overrides ?? {};
  const curated = input.alloyKey ? CURATED_PROPERTY_SETS[input.alloyKey] : undefined;
  const notes: string[] = [];
  let mixture: Record<PropertyName, ResolvedProperty> | null = null;
  if (!curated && input.composition) {
    const m = mixtureProperties(input.composition);
    const mix = "rule of mixtures of the element table (properties.ts)";
    mixture = {
      densityKgPerM3: { value: m.densityKgPerM3, source: `${mix}: ideal specific volume`, origin: "mixture", estimated: false },
      specificHeatJPerKgK: { value: m.specificHeatJPerKgK, source: `${mix}: Neumann–Kopp`, origin: "mixture", estimated: false },
      thermalConductivityWPerMK: { value: m.thermalConductivityWPerMK, source: `${mix}: atomic-fraction mean of pure elements (far above real alloys)`, origin: "mixture", estimated: true },
      solidusK: { value: m.meltingTemperatureK, source: `${mix}: atomic-fraction mean melting point`, origin: "mixture", estimated: true },
      liquidusK: { value: m.meltingTemperatureK, source: `${mix}: atomic-fraction mean melting point`, origin: "mixture", estimated: true },
      boilingK: { value: m.boilingTemperatureK, source: `${mix}: atomic-fraction mean boiling point`, origin: "mixture", estimated: true },
      latentHeatJPerKg: { value: m.latentHeatJPerKg, source: `${mix}: mass-fraction mean heat of fusion`, origin: "mixture", estimated: false },
      absorptivity: { value: DEFAULT_ABSORPTIVITY, source: "default for metals in conduction mode (common practice)", origin: "default", estimated: true },
    };
    notes.push("no curated property set for this alloy: properties estimated from the composition");
  }
  const properties: Partial<ResolvedProperties> = {};
  const missing: PropertyName[] = [];
  const required = new Set(input.required ?? PHYSICS_PROPERTIES);
  for (const name of PROPERTY_NAMES) {
    const override = overrides[name];
    if (override !== undefined) {
      const value = typeof override === "number" ? override : override.value;
      checkOverride(name, value);
      properties[name] = {
        value,
        source: typeof override === "number" ? "given by the user" : override.source,
        origin: "override",
        estimated: false,
      };
    } else if (curated) {
      properties[name] = { ...curated[name], origin: "curated", estimated: false };
    } else if (mixture) {
      properties[name] = mixture[name];
    } else if (required.has(name)) {
      missing.push(name);
    }
  }
  if (missing.length > 0) {
    const why = input.alloyKey ? `no curated property set for '${input.alloyKey}' and no composition` : "no alloy and no composition";
    return { ok: false, message: `${why}: give ${missing.join(", ")}`, missing };
  }
  const { solidusK, liquidusK } = properties;
  if (solidusK && liquidusK && solidusK.value > liquidusK.value) {
    notes.push(`solidus ${solidusK.value} K is above liquidus ${liquidusK.value} K`);
  }
  const basis = curated ? "curated" : mixture ? "mixture" : "overrides";
  return { ok: true, properties, basis, notes };
}
