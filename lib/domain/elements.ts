/**
 * Element property table for the elements that occur in LPBF alloys.
 *
 * Sources, by column (each value typed from the named reference from memory unless said otherwise;
 * the test file checks masses and densities against the python `periodictable` package, which is
 * NIST-based):
 * - atomicMassGPerMol: CIAAW/IUPAC standard atomic weights, abridged (conventional) values, 2021
 *   edition (from memory).
 * - densityGPerCm3: CRC Handbook of Chemistry and Physics, "Physical constants of inorganic
 *   compounds"/"The elements", near 20–25 °C (from memory). N and O are gases at room temperature;
 *   their entry is the liquid density at the normal boiling point (CRC, from memory) so that a
 *   specific-volume mixture over a trace interstitial is not dominated by a gas volume.
 * - meltingPointK, boilingPointK: CRC Handbook, "Melting, boiling, triple and critical points of the
 *   elements" (from memory). Carbon sublimes at 1 atm; both columns give the sublimation point.
 * - specificHeatJPerGK: CRC Handbook, "Heat capacity of the elements at 25 °C" (from memory).
 * - thermalConductivityWPerMK: CRC Handbook, "Thermal conductivity of the elements", 300 K
 *   (from memory); carbon is polycrystalline graphite, a mid value of the published spread.
 * - heatOfFusionKJPerMol: CRC Handbook, "Enthalpy of fusion" (from memory).
 * - electronegativityPauling: Pauling scale as tabulated in the CRC Handbook (from memory).
 * - valenceElectrons: valence electron count as used for the VEC of alloys (s + d electrons for
 *   transition metals; s + p for main-group elements), counted from the electron configuration.
 * - atomicRadiusPm: metallic radius for 12-fold coordination for metals (Teatum, Gschneidner &
 *   Waber, LA-4003, 1968, as reprinted in handbooks, from memory); for the non-metals B, C, N, O,
 *   Si, P, S the single-bond covalent radius (Cordero et al., Dalton Trans. 2008:2832, from memory).
 *   Used only for the atomic-size mismatch; configurable by passing another table.
 */

/** One row of the element table. Units are in the field names. */
export interface ElementData {
  symbol: string;
  name: string;
  atomicNumber: number;
  atomicMassGPerMol: number;
  densityGPerCm3: number;
  meltingPointK: number;
  boilingPointK: number;
  specificHeatJPerGK: number;
  thermalConductivityWPerMK: number;
  heatOfFusionKJPerMol: number;
  electronegativityPauling: number;
  valenceElectrons: number;
  atomicRadiusPm: number;
  /** Standard state at 298 K and 1 atm. */
  phaseAt298K: "solid" | "liquid" | "gas";
}

type Row = [
  symbol: string,
  name: string,
  z: number,
  massGPerMol: number,
  densityGPerCm3: number,
  meltingK: number,
  boilingK: number,
  cpJPerGK: number,
  kWPerMK: number,
  fusionKJPerMol: number,
  electronegativity: number,
  valenceElectrons: number,
  radiusPm: number,
];

// Columns: symbol, name, Z, M, rho, T_melt, T_boil, c_p, k, dH_fus, chi, VEC, r (sources above).
const ROWS: readonly Row[] = [
  ["Li", "lithium", 3, 6.94, 0.534, 453.65, 1603, 3.582, 84.8, 3.0, 0.98, 1, 152],
  ["Be", "beryllium", 4, 9.0122, 1.85, 1560, 2742, 1.825, 200, 7.895, 1.57, 2, 112],
  ["B", "boron", 5, 10.81, 2.34, 2349, 4200, 1.026, 27.4, 50.2, 2.04, 3, 84],
  ["C", "carbon", 6, 12.011, 2.267, 4098, 4098, 0.709, 140, 117, 2.55, 4, 76],
  ["N", "nitrogen", 7, 14.007, 0.807, 63.15, 77.36, 1.04, 0.02583, 0.72, 3.04, 5, 71],
  ["O", "oxygen", 8, 15.999, 1.141, 54.36, 90.2, 0.918, 0.02658, 0.444, 3.44, 6, 66],
  ["Mg", "magnesium", 12, 24.305, 1.738, 923, 1363, 1.023, 156, 8.48, 1.31, 2, 160],
  ["Al", "aluminium", 13, 26.982, 2.70, 933.47, 2792, 0.897, 237, 10.71, 1.61, 3, 143],
  ["Si", "silicon", 14, 28.085, 2.3296, 1687, 3538, 0.705, 149, 50.21, 1.9, 4, 111],
  ["P", "phosphorus", 15, 30.974, 1.823, 317.3, 553.7, 0.769, 0.236, 0.66, 2.19, 5, 107],
  ["S", "sulfur", 16, 32.06, 2.07, 388.36, 717.8, 0.71, 0.205, 1.72, 2.58, 6, 105],
  ["Sc", "scandium", 21, 44.956, 2.985, 1814, 3109, 0.568, 15.8, 14.1, 1.36, 3, 164],
  ["Ti", "titanium", 22, 47.867, 4.506, 1941, 3560, 0.523, 21.9, 14.15, 1.54, 4, 147],
  ["V", "vanadium", 23, 50.942, 6.0, 2183, 3680, 0.489, 30.7, 21.5, 1.63, 5, 134],
  ["Cr", "chromium", 24, 51.996, 7.15, 2180, 2944, 0.449, 93.9, 21.0, 1.66, 6, 128],
  ["Mn", "manganese", 25, 54.938, 7.21, 1519, 2334, 0.479, 7.81, 12.91, 1.55, 7, 127],
  ["Fe", "iron", 26, 55.845, 7.874, 1811, 3134, 0.449, 80.2, 13.81, 1.83, 8, 126],
  ["Co", "cobalt", 27, 58.933, 8.86, 1768, 3200, 0.421, 100, 16.06, 1.88, 9, 125],
  ["Ni", "nickel", 28, 58.693, 8.908, 1728, 3186, 0.444, 90.9, 17.48, 1.91, 10, 124],
  ["Cu", "copper", 29, 63.546, 8.96, 1357.77, 2835, 0.385, 401, 13.26, 1.9, 11, 128],
  ["Zn", "zinc", 30, 65.38, 7.134, 692.68, 1180, 0.388, 116, 7.32, 1.65, 12, 137],
  ["Y", "yttrium", 39, 88.906, 4.472, 1799, 3609, 0.298, 17.2, 11.42, 1.22, 3, 180],
  ["Zr", "zirconium", 40, 91.224, 6.52, 2128, 4682, 0.278, 22.6, 21.0, 1.33, 4, 160],
  ["Nb", "niobium", 41, 92.906, 8.57, 2750, 5017, 0.265, 53.7, 30.0, 1.6, 5, 146],
  ["Mo", "molybdenum", 42, 95.95, 10.22, 2896, 4912, 0.251, 138, 37.48, 2.16, 6, 139],
  ["Pd", "palladium", 46, 106.42, 12.02, 1828.05, 3236, 0.246, 71.8, 16.74, 2.2, 10, 137],
  ["Ag", "silver", 47, 107.87, 10.49, 1234.93, 2435, 0.235, 429, 11.28, 1.93, 11, 144],
  ["Sn", "tin", 50, 118.71, 7.287, 505.08, 2875, 0.228, 66.8, 7.173, 1.96, 4, 158],
  ["La", "lanthanum", 57, 138.91, 6.146, 1193, 3737, 0.195, 13.4, 6.2, 1.1, 3, 187],
  ["Ce", "cerium", 58, 140.12, 6.77, 1068, 3716, 0.192, 11.3, 5.46, 1.12, 3, 182],
  ["Hf", "hafnium", 72, 178.49, 13.31, 2506, 4876, 0.144, 23.0, 27.2, 1.3, 4, 159],
  ["Ta", "tantalum", 73, 180.95, 16.69, 3290, 5731, 0.14, 57.5, 36.57, 1.5, 5, 146],
  ["W", "tungsten", 74, 183.84, 19.25, 3695, 5828, 0.132, 173, 52.31, 2.36, 6, 139],
  ["Re", "rhenium", 75, 186.21, 21.02, 3459, 5869, 0.137, 48.0, 60.43, 1.9, 7, 137],
  ["Pt", "platinum", 78, 195.08, 21.45, 2041.4, 4098, 0.133, 71.6, 22.17, 2.28, 10, 139],
  ["Au", "gold", 79, 196.97, 19.3, 1337.33, 3129, 0.129, 318, 12.55, 2.54, 11, 144],
];

const GASES = new Set(["N", "O"]);

/** All elements in the table, ordered by atomic number. */
export const ELEMENTS: readonly ElementData[] = ROWS.map(
  ([symbol, name, atomicNumber, atomicMassGPerMol, densityGPerCm3, meltingPointK, boilingPointK,
    specificHeatJPerGK, thermalConductivityWPerMK, heatOfFusionKJPerMol, electronegativityPauling,
    valenceElectrons, atomicRadiusPm]) => ({
    symbol,
    name,
    atomicNumber,
    atomicMassGPerMol,
    densityGPerCm3,
    meltingPointK,
    boilingPointK,
    specificHeatJPerGK,
    thermalConductivityWPerMK,
    heatOfFusionKJPerMol,
    electronegativityPauling,
    valenceElectrons,
    atomicRadiusPm,
    phaseAt298K: GASES.has(symbol) ? "gas" : "solid",
  }),
);

const BY_SYMBOL: ReadonlyMap<string, ElementData> = new Map(ELEMENTS.map((e) => [e.symbol, e]));

/**
 * Looks up an element by its exact (case-sensitive) symbol.
 *
 * @example
 * getElement("Fe")?.atomicMassGPerMol; // 55.845
 * getElement("Xx"); // undefined
 */
export function getElement(symbol: string): ElementData | undefined {
  return BY_SYMBOL.get(symbol);
}

/**
 * Whether `symbol` is an element in the table (case-sensitive: "Co" is cobalt, "CO" is not).
 *
 * @example
 * isElementSymbol("Nb"); // true
 */
export function isElementSymbol(symbol: string): boolean {
  return BY_SYMBOL.has(symbol);
}
