/**
 * Suggested experiments as CSV for the shop floor: comment lines first (the safety caution, then
 * what the set was made from), a header, one row per suggestion.
 *
 * Comment lines start with "# " and carry no commas or double quotes, so each stays one cell in a
 * spreadsheet and `pandas.read_csv(..., comment="#")` skips them. Text cells are quoted when they
 * hold a comma, quote or line break (RFC 4180), and a text cell starting with = + - @, tab or CR
 * gets a leading apostrophe so a spreadsheet does not run it as a formula (OWASP, CSV injection).
 */
import type { Suggestion } from "./suggestions";

export const SUGGESTION_CSV_COLUMNS = [
  "index",
  "alloy",
  "laser_power_w",
  "scan_speed_mm_s",
  "hatch_spacing_um",
  "layer_thickness_um",
  "spot_diameter_um",
  "volumetric_energy_j_mm3",
  "predicted_regime",
  "criteria_past_threshold",
  "cell_power_w",
  "cell_speed_mm_s",
  "cell_records",
  "reason",
] as const;

/**
 * One CSV cell: numbers as they are; text guarded against formulas and quoted when it must be.
 *
 * @example
 * csvCell("=SUM(A1)"); // "'=SUM(A1)"
 * csvCell('a, "b"');  // '"a, ""b"""'
 */
export function csvCell(value: string | number): string {
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  const guarded = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
  // Leading or trailing white space is quoted too: readers that trim bare fields keep it then.
  return /[",\r\n]|^\s|\s$/.test(guarded) ? `"${guarded.replace(/"/g, '""')}"` : guarded;
}

function commentLine(text: string): string {
  return `# ${text.replace(/[\r\n]+/g, " ").replace(/,/g, ";").replace(/"/g, "'")}`;
}

const range = (r: readonly [number, number]) => `${Number(r[0].toPrecision(6))}–${Number(r[1].toPrecision(6))}`;

/**
 * The CSV text, lines ending in CRLF (RFC 4180).
 *
 * @example
 * suggestionsCsv({ caution: SUGGESTION_CAUTION, about: ["set 3"], alloy: "316L", spotDiameterUm: 80, suggestions }).split("\r\n")[0];
 * // "# Safety: LPBF machines use Class 4 lasers (IEC 60825-1)."
 */
export function suggestionsCsv(input: { caution: readonly string[]; about: readonly string[]; alloy: string; spotDiameterUm: number; suggestions: readonly Suggestion[] }): string {
  const lines = [...input.caution.map(commentLine), ...input.about.map(commentLine), SUGGESTION_CSV_COLUMNS.join(",")];
  for (const s of input.suggestions) {
    lines.push(
      [
        s.index,
        input.alloy,
        s.laserPowerW,
        s.scanSpeedMmPerS,
        s.hatchSpacingUm,
        s.layerThicknessUm,
        input.spotDiameterUm,
        s.volumetricEnergyJMm3,
        s.predictedRegime,
        s.criteriaPastThreshold.join(" "),
        range(s.cell.powerRangeW),
        range(s.cell.speedRangeMmPerS),
        s.cell.records,
        s.reason,
      ]
        .map(csvCell)
        .join(","),
    );
  }
  return `${lines.join("\r\n")}\r\n`;
}
