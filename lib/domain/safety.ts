/**
 * The safety caution shown wherever people act on suggested parameters (DOMAIN.md, "Safety"): the
 * coverage page's suggestions, the head of the suggestions CSV and the `suggest` command.
 * Each line is free of commas and quotes so it stays one cell, and one comment line, in a CSV.
 */
export const SUGGESTION_CAUTION: readonly string[] = [
  "Safety: LPBF machines use Class 4 lasers (IEC 60825-1).",
  "Fine metal powders are combustible and some are reactive (Ti/Al/Mg; NFPA 484); they are also an inhalation hazard.",
  "Inert gas can displace oxygen.",
  "These suggested experiments are not safety-checked: stay inside the machine maker's limits and your site's procedures; follow local codes and licensed practice.",
];
