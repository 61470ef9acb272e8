/**
 * Laser spot diameters are published under several definitions. Meltledger stores the 1/e²
 * diameter and keeps the definition the source used.
 *
 * For a Gaussian beam I(r) ∝ exp(-2r²/w²) (w the 1/e² radius):
 * - D4σ (ISO 11146 second-moment diameter) equals the 1/e² diameter 2w exactly;
 * - FWHM = w·√(2 ln 2), so 1/e² diameter = FWHM · √2 / √(ln 2) = FWHM × 1.6986 (the ×1.699 of
 *   common practice; derived here from the Gaussian profile, not typed in).
 */
export const SPOT_DEFINITION_IDS = ["one_over_e2", "d4sigma", "fwhm"] as const;
export type SpotDefinition = (typeof SPOT_DEFINITION_IDS)[number];

export const FWHM_TO_ONE_OVER_E2 = Math.SQRT2 / Math.sqrt(Math.LN2);

/**
 * Converts a spot diameter given under `definition` to the 1/e² diameter (same length unit).
 * @example toOneOverE2Diameter(50, "fwhm") // ≈ 84.93
 */
export function toOneOverE2Diameter(diameter: number, definition: SpotDefinition): number {
  if (!Number.isFinite(diameter) || diameter <= 0) throw new RangeError(`toOneOverE2Diameter: diameter must be a positive number, got ${diameter}`);
  switch (definition) {
    case "one_over_e2":
    case "d4sigma":
      return diameter;
    case "fwhm":
      return diameter * FWHM_TO_ONE_OVER_E2;
    default:
      throw new RangeError(`toOneOverE2Diameter: unknown spot definition ${String(definition)}`);
  }
}

/**
 * The inverse: a 1/e² diameter expressed under `definition`.
 * @example fromOneOverE2Diameter(84.93, "fwhm") // ≈ 50
 */
export function fromOneOverE2Diameter(diameter: number, definition: SpotDefinition): number {
  return diameter / toOneOverE2Diameter(1, definition);
}

/** Gaussian σ of the intensity profile from the 1/e² diameter: d = 4σ. */
export function gaussianSigmaFromOneOverE2(diameter: number): number {
  return diameter / 4;
}
