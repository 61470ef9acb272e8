/**
 * Rule-of-mixtures properties of a composition: physics-based features that let a model learn from
 * physics rather than alloy identity. x = atomic fraction, w = mass fraction:
 * - molar mass M = Σ x_i·M_i
 * - specific heat c_p = Σ w_i·c_p,i (Neumann–Kopp)
 * - density from the ideal specific volume 1/ρ = Σ w_i/ρ_i
 * - melting and boiling point Σ x_i·T_i (crude)
 * - latent heat of fusion Σ w_i·ΔH_f,i/M_i
 * - thermal conductivity Σ x_i·k_i — far above real alloys (316L ~15 W/m·K vs ~80 for Fe), so it
 *   is only ever an estimate
 * - mean Pauling electronegativity χ̄ = Σ x_i·χ_i and its spread Δχ = √(Σ x_i·(χ_i − χ̄)²)
 * - valence electron concentration VEC = Σ x_i·VEC_i
 * - atomic-size mismatch δ = 100·√(Σ x_i·(1 − r_i/r̄)²), r̄ = Σ x_i·r_i (radii in elements.ts)
 */
import { type Composition, compositionFractions } from "./composition";
import { type ElementData, getElement } from "./elements";

export interface MixtureProperties {
  molarMassGPerMol: number;
  densityKgPerM3: number;
  specificHeatJPerKgK: number;
  meltingTemperatureK: number;
  boilingTemperatureK: number;
  latentHeatJPerKg: number;
  /** Mixture of pure-element values; an estimate only (see the file comment). */
  thermalConductivityWPerMK: number;
  electronegativityMean: number;
  electronegativitySpread: number;
  valenceElectronConcentration: number;
  atomicSizeMismatchPct: number;
}

/**
 * Rule-of-mixtures properties of a composition (either basis).
 *
 * @example
 * mixtureProperties({ basis: "wt", components: [{ element: "Ni", amount: 100, isBalance: true }] }).densityKgPerM3; // 8908
 */
export function mixtureProperties(composition: Composition, elementOf: (symbol: string) => ElementData | undefined = getElement): MixtureProperties {
  const fractions = compositionFractions(composition);
  let molarMass = 0;
  let specificVolume = 0;
  let cp = 0;
  let tm = 0;
  let tb = 0;
  let latent = 0;
  let k = 0;
  let chi = 0;
  let vec = 0;
  let radius = 0;
  const rows = fractions.map((f) => {
    const e = elementOf(f.element);
    if (!e) throw new RangeError(`mixtureProperties: unknown element '${f.element}'`);
    return { e, x: f.atomicFraction, w: f.massFraction };
  });
  for (const { e, x, w } of rows) {
    molarMass += x * e.atomicMassGPerMol;
    specificVolume += w / (e.densityGPerCm3 * 1000);
    cp += w * e.specificHeatJPerGK * 1000;
    tm += x * e.meltingPointK;
    tb += x * e.boilingPointK;
    latent += (w * e.heatOfFusionKJPerMol * 1e6) / e.atomicMassGPerMol;
    k += x * e.thermalConductivityWPerMK;
    chi += x * e.electronegativityPauling;
    vec += x * e.valenceElectrons;
    radius += x * e.atomicRadiusPm;
  }
  let chiSpread = 0;
  let mismatch = 0;
  for (const { e, x } of rows) {
    chiSpread += x * (e.electronegativityPauling - chi) ** 2;
    mismatch += x * (1 - e.atomicRadiusPm / radius) ** 2;
  }
  return {
    molarMassGPerMol: molarMass,
    densityKgPerM3: 1 / specificVolume,
    specificHeatJPerKgK: cp,
    meltingTemperatureK: tm,
    boilingTemperatureK: tb,
    latentHeatJPerKg: latent,
    thermalConductivityWPerMK: k,
    electronegativityMean: chi,
    electronegativitySpread: Math.sqrt(chiSpread),
    valenceElectronConcentration: vec,
    atomicSizeMismatchPct: 100 * Math.sqrt(mismatch),
  };
}
