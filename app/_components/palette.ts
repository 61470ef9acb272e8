/**
 * Colours of the interface, in one place so pages and charts agree.
 *
 * The outcome set was chosen for this project and checked by simulating protanopia, deuteranopia
 * and tritanopia (Machado, Oliveira & Fernandes 2009 matrices, severity 1, coefficients from
 * memory): the closest pair stays above ΔE76 ≈ 16 in every simulation. Colour is never the only
 * cue: charts label their bars and badges carry text and a shape.
 */

/** The one accent colour (links, primary buttons, focus ring); 6.4:1 against white. */
export const ACCENT = "#0e6a63";

/**
 * Outcome fills for charts and swatches. The light ones (balling, other, unknown) fall below 3:1
 * against white, so every bar and swatch is drawn with a dark outline and labelled in text.
 */
export const OUTCOME_COLOURS = {
  dense: "#1d4fa3",
  keyhole: "#e07a1f",
  lack_of_fusion: "#c04a9b",
  balling: "#e3c33a",
  cracking: "#7a1f1f",
  other: "#58b8d8",
  unknown: "#a3a8ae",
} as const satisfies Record<string, string>;

export type OutcomeColourKey = keyof typeof OUTCOME_COLOURS;

/** Fill of an outcome; an outcome this palette does not know gets the "unknown" grey. */
export function outcomeColour(outcome: string): string {
  return (OUTCOME_COLOURS as Record<string, string>)[outcome] ?? OUTCOME_COLOURS.unknown;
}

/** Record status colours: badge text on its tint ≥ 4.5:1; bar fills ≥ 3:1 against white. */
export const STATUS_COLOURS = {
  draft: { text: "#374151", tint: "#eef0f3", bar: "#7c8692" },
  needs_review: { text: "#8a4b00", tint: "#fdf1dc", bar: "#b87500" },
  accepted: { text: "#1d5c2e", tint: "#e8f5ec", bar: "#2f8a4a" },
  rejected: { text: "#9b1c1c", tint: "#fdecec", bar: "#c23b3b" },
  merged: { text: "#5b2a86", tint: "#f3ecf9", bar: "#7d4cb0" },
} as const satisfies Record<string, { text: string; tint: string; bar: string }>;

export function statusColours(status: string): { text: string; tint: string; bar: string } {
  return (STATUS_COLOURS as Record<string, { text: string; tint: string; bar: string }>)[status] ?? STATUS_COLOURS.draft;
}

/** Severity colours for flags and messages. */
export const SEVERITY_COLOURS = {
  error: { text: "#9b1c1c", tint: "#fdecec", border: "#e3a3a3" },
  warning: { text: "#8a4b00", tint: "#fdf1dc", border: "#e8c07a" },
  info: { text: "#0b4f4a", tint: "#e3f1ef", border: "#9fcfc9" },
} as const;
