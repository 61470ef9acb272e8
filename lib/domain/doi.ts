/**
 * Keys for finding the same source twice: a normalized DOI and a normalized title.
 */

/**
 * DOI syntax: directory indicator "10.", a registrant code of 4–9 digits, "/", a suffix of
 * printable characters (the DOI Handbook allows any printable Unicode in the suffix, from memory):
 * no white space and no control characters such as NUL, which no DOI holds.
 */
const DOI_PATTERN = /^10\.\d{4,9}\/[^\s\p{Cc}]+$/u;

// resolver and label prefixes, in any case: doi:, doi.org/, dx.doi.org/, with or without scheme
const PREFIX = /^(?:(?:https?:\/\/)?(?:www\.)?(?:dx\.)?doi\.org\/|doi\s*:?\s*)/i;

const OPENERS = "([{<\"'«“‘";
const CLOSERS = ")]}>\"'»”’";
// punctuation that ends a sentence or list around a DOI; never the last character of a real one
const TRAILING = /[.,;:]+$/;

function stripWrapping(text: string): string {
  let s = text.trim();
  for (;;) {
    const before = s;
    s = s.replace(TRAILING, "").trim();
    const first = s.charAt(0);
    const last = s.charAt(s.length - 1);
    if (OPENERS.includes(first)) s = s.slice(1).trim();
    // a closing bracket stays when the DOI itself opened it, e.g. 10.1016/0022-2836(05)80360-2)
    if (CLOSERS.includes(last)) {
      const opener = OPENERS.charAt(CLOSERS.indexOf(last));
      const opens = s.split(opener).length - 1;
      const closes = s.split(last).length - 1;
      if (opener === last ? opens % 2 === 1 : closes > opens) s = s.slice(0, -1).trim();
    }
    if (s === before) return s;
  }
}

/**
 * The DOI in canonical form (lower-case, no resolver prefix), or null when the text is no DOI.
 * DOIs are case-insensitive (DOI Handbook, section 2.4), so lower-case is a safe key.
 *
 * @example
 * normalizeDoi(" https://doi.org/10.5555/ABC.123. "); // "10.5555/abc.123"
 * normalizeDoi("doi:10.5555/x");                       // "10.5555/x"
 * normalizeDoi("not a doi");                           // null
 */
export function normalizeDoi(text: string): string | null {
  let s = stripWrapping(text);
  for (let i = 0; i < 3 && PREFIX.test(s); i += 1) s = stripWrapping(s.replace(PREFIX, ""));
  if (/%[0-9a-f]{2}/i.test(s)) {
    try {
      s = decodeURIComponent(s);
    } catch {
      return null;
    }
  }
  s = s.toLowerCase();
  return DOI_PATTERN.test(s) ? s : null;
}

// letters that NFKD does not split into a base letter and a mark
const FOLDS: Record<string, string> = { ß: "ss", æ: "ae", œ: "oe", ø: "o", ł: "l", đ: "d", ð: "d", þ: "th", ı: "i" };

/**
 * A key for comparing titles: lower-case, diacritics removed (NFKD), "&" read as "and",
 * punctuation replaced by spaces, whitespace collapsed. "Ti-6Al-4V" and "Ti 6Al 4V" give the
 * same key; "Ti6Al4V" does not.
 *
 * @example
 * titleKey("Laser-Powder Bed Fusion of Ti–6Al–4V: A Study."); // "laser powder bed fusion of ti 6al 4v a study"
 */
export function titleKey(title: string): string {
  return title
    .normalize("NFKD")
    .replace(/\p{M}/gu, "")
    .toLowerCase()
    .replace(/[ßæœøłđðþı]/g, (c) => FOLDS[c] ?? c)
    .replace(/&/g, " and ")
    .replace(/[^\p{L}\p{N}]+/gu, " ")
    .trim();
}
