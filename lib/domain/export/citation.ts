/**
 * A source as one line of a datasheet: authors (year). Title. Venue. doi.
 */
import type { ExportSource } from "./types";

/**
 * @example formatCitation({ authors: ["A. Placeholder"], year: 2022, title: "Windows", venue: "J. Inv.", doi: "10.5555/x", ... });
 * // "A. Placeholder (2022). Windows. J. Inv. https://doi.org/10.5555/x"
 */
export function formatCitation(s: ExportSource): string {
  const authors = s.authors.length === 0 ? "Anonymous" : s.authors.length > 3 ? `${s.authors[0]} et al.` : s.authors.join(", ");
  const parts = [`${authors} (${s.year ?? "n.d."}).`, `${s.title.replace(/\s+/g, " ").trim()}.`];
  if (s.venue) parts.push(`${s.venue}.`);
  parts.push(s.doi ? `https://doi.org/${s.doi}` : s.url ? s.url : `[${s.kind.replace(/_/g, " ")}, no DOI]`);
  return parts.join(" ");
}
