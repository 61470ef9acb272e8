/**
 * Finding DOIs in running text, such as the first pages of a paper's PDF.
 */
import { normalizeDoi } from "./doi";

// "10." + registrant + "/" + suffix up to whitespace or a character that cannot end a DOI in prose
const CANDIDATE = /\b10\.\d{4,9}\/[^\s"<>{}|\\^`]+/g;

/**
 * Every distinct DOI in the text, normalized, in order of first appearance. Trailing sentence
 * punctuation and closing brackets that the DOI did not open are dropped (see normalizeDoi).
 *
 * @example
 * findDois("Cite as: https://doi.org/10.5555/ABC.1. See also doi:10.5555/x (2020)."); // ["10.5555/abc.1", "10.5555/x"]
 */
export function findDois(text: string): string[] {
  const out: string[] = [];
  for (const m of text.matchAll(CANDIDATE)) {
    const doi = normalizeDoi(m[0]);
    if (doi && !out.includes(doi)) out.push(doi);
  }
  return out;
}
