/**
 * Reading citations pasted from a reference manager (BibTeX or RIS) into source fields. Parsing is
 * citation-js's (BibTeX with LaTeX accents and @string macros; RIS old and new tag sets), always
 * with the format forced, so a pasted text is never treated as an identifier to look up online.
 */
import { plugins, type CslDate, type CslItem, type CslName } from "@citation-js/core";
import "@citation-js/plugin-bibtex";
import "@citation-js/plugin-ris";
import { normalizeDoi } from "./doi";

export type CitationFormat = "bibtex" | "ris";

/** A source as a citation gives it; the fields of the source form. */
export interface CitationSource {
  kind: "journal_article" | "conference_paper" | "thesis" | "preprint" | "report";
  title: string;
  authors: string[];
  year: number | null;
  venue: string | null;
  /** Normalized (lower case, no resolver prefix); null when the entry has none or it is no DOI. */
  doi: string | null;
  url: string | null;
  /** The entry's key or position, for messages. */
  label: string;
}

export type CitationResult =
  | { ok: true; format: CitationFormat; entries: CitationSource[]; skipped: { label: string; message: string }[] }
  | { ok: false; message: string };

/**
 * Which citation format a text is in, or null.
 *
 * @example
 * detectCitationFormat("@article{k, title={T}}"); // "bibtex"
 * detectCitationFormat("TY  - JOUR\nTI  - T\nER  - "); // "ris"
 */
export function detectCitationFormat(text: string): CitationFormat | null {
  if (/^\s*TY {2}- /m.test(text)) return "ris";
  if (/^\s*@\s*[a-zA-Z]+\s*[{(]/m.test(text)) return "bibtex";
  return null;
}

const KIND_OF_TYPE: Record<string, CitationSource["kind"]> = {
  "article-journal": "journal_article",
  article: "journal_article",
  "article-magazine": "journal_article",
  review: "journal_article",
  "paper-conference": "conference_paper",
  thesis: "thesis",
  report: "report",
  book: "report",
  chapter: "report",
  manuscript: "preprint",
  "posted-content": "preprint",
  webpage: "report",
  dataset: "report",
};

function stripMarkup(text: string): string {
  return text
    .replace(/<[^>]*>/g, "")
    .replace(/\s+/g, " ")
    .trim();
}

function displayName(n: CslName): string {
  if (n.literal) return stripMarkup(n.literal);
  return stripMarkup([n.given, n["dropping-particle"], n["non-dropping-particle"], n.family, n.suffix].filter(Boolean).join(" "));
}

function yearOf(...dates: (CslDate | undefined)[]): number | null {
  for (const d of dates) {
    const first = d?.["date-parts"]?.[0]?.[0];
    const y = typeof first === "string" ? Number.parseInt(first, 10) : first;
    if (typeof y === "number" && Number.isInteger(y) && y > 0) return y;
    const fromText = /\b(1[89]\d\d|2\d\d\d)\b/.exec(d?.raw ?? d?.literal ?? "");
    if (fromText) return Number(fromText[1]);
  }
  return null;
}

function toSource(item: CslItem, index: number): CitationSource | { label: string; message: string } {
  const label = typeof item["citation-key"] === "string" ? item["citation-key"] : `entry ${index + 1}`;
  const title = stripMarkup(item.title ?? "");
  if (!title) return { label, message: `${label} has no title.` };
  const isPreprint = /arxiv|preprint/i.test(`${item.publisher ?? ""} ${item["container-title"] ?? ""} ${item.genre ?? ""}`);
  const kind = isPreprint ? "preprint" : (KIND_OF_TYPE[item.type ?? ""] ?? "journal_article");
  const url = typeof item.URL === "string" && /^https?:\/\/\S+$/i.test(item.URL.trim()) ? item.URL.trim() : null;
  const venue = stripMarkup(item["container-title"] ?? item["event-title"] ?? item.publisher ?? "") || null;
  return {
    kind,
    title,
    authors: (item.author ?? []).map(displayName).filter(Boolean),
    year: yearOf(item.issued, item["event-date"]),
    venue,
    doi: item.DOI ? normalizeDoi(String(item.DOI)) : null,
    url,
    label,
  };
}

/**
 * Reads every entry of a pasted BibTeX or RIS text. Entries without a title are skipped with a
 * message; a text that is neither format, or that cannot be parsed, is a message, not a throw.
 *
 * @example
 * const r = parseCitations("@article{k, title={Dense parts}, author={Doe, Jane}, year=2021, doi={10.5555/X1}}");
 * r.ok && r.entries[0]; // { kind: "journal_article", title: "Dense parts", authors: ["Jane Doe"], year: 2021, venue: null, doi: "10.5555/x1", url: null, label: "k" }
 */
export function parseCitations(text: string): CitationResult {
  if (typeof text !== "string") throw new TypeError("parseCitations: text must be a string");
  const format = detectCitationFormat(text);
  if (!format) return { ok: false, message: "This is neither BibTeX (@article{…}) nor RIS (TY  - JOUR …). Export the reference from your citation manager in one of those formats and paste it again." };
  let items: CslItem[];
  try {
    items = plugins.input.chain(text, { forceType: format === "bibtex" ? "@bibtex/text" : "@ris/file", generateGraph: false });
  } catch (error) {
    const detail = String((error as Error).message ?? error).split("\n")[0];
    return { ok: false, message: `The ${format === "bibtex" ? "BibTeX" : "RIS"} text cannot be read: ${detail}` };
  }
  const entries: CitationSource[] = [];
  const skipped: { label: string; message: string }[] = [];
  (Array.isArray(items) ? items : []).forEach((item, i) => {
    const s = toSource(item, i);
    if ("kind" in s) entries.push(s);
    else skipped.push(s);
  });
  if (!entries.length) return { ok: false, message: skipped.length ? `No usable entry: ${skipped.map((s) => s.message).join(" ")}` : "No entry was found in the text." };
  return { ok: true, format, entries, skipped };
}
