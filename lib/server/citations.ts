import { parseCitations, type CitationSource } from "../domain/citations";
import { normalizeDoi, titleKey } from "../domain/doi";
import { findSourceByDoi, findSourcesByTitleKey, getSource } from "../db/sources";
import type { Actor } from "./actor";
import { updateSource } from "./sources";
import { fail, guard, ok, type Result } from "./result";
import { isRowId } from "../schemas/ids";

export interface ExistingSourceMatch {
  id: number;
  title: string;
  year: number | null;
  doi: string | null;
  /** What matched: the DOI, or the normalized title with the year. */
  by: "doi" | "title_year";
}

export interface CitationCandidate extends CitationSource {
  /** A source already in the collection that this entry is, offered instead of a copy. */
  existing: ExistingSourceMatch | null;
}

async function findExisting(doi: string | null, title: string, year: number | null): Promise<ExistingSourceMatch | null> {
  if (doi) {
    const s = await findSourceByDoi(doi);
    if (s) return { id: s.id, title: s.title, year: s.year, doi: s.doi, by: "doi" };
  }
  if (title) {
    const same = await findSourcesByTitleKey(titleKey(title), year);
    const s = same[0];
    if (s) return { id: s.id, title: s.title, year: s.year, doi: s.doi, by: "title_year" };
  }
  return null;
}

/**
 * Reads pasted BibTeX or RIS into source candidates, each with the existing source it matches (same
 * DOI, or same normalized title and year), so the form can offer that source instead of a copy.
 */
export async function readCitations(text: string): Promise<Result<{ format: "bibtex" | "ris"; entries: CitationCandidate[]; skipped: { label: string; message: string }[] }>> {
  return guard(async () => {
    if (typeof text !== "string" || !text.trim()) return fail("invalid_input", "Paste a BibTeX or RIS entry.", { fieldErrors: { citation: ["Paste a BibTeX or RIS entry."] } });
    if (text.length > 2_000_000) return fail("too_large", "That is more text than a citation library export of a few thousand entries; paste fewer entries.");
    const parsed = parseCitations(text);
    if (!parsed.ok) return fail("invalid_input", parsed.message, { fieldErrors: { citation: [parsed.message] } });
    const entries: CitationCandidate[] = [];
    for (const e of parsed.entries) entries.push({ ...e, existing: await findExisting(e.doi, e.title, e.year) });
    return ok({ format: parsed.format, entries, skipped: parsed.skipped });
  });
}

/**
 * A typed DOI, normalized, with the source that already has it. No metadata is fetched: the
 * workbench works offline, so title and authors come from the user or a pasted citation.
 */
export async function lookupDoi(text: string): Promise<Result<{ doi: string; existing: ExistingSourceMatch | null }>> {
  return guard(async () => {
    const doi = normalizeDoi(typeof text === "string" ? text : "");
    if (!doi) return fail("invalid_input", "That is not a DOI: it should look like 10.5555/abc123 (a resolver address in front is fine).", { fieldErrors: { doi: ["Not a DOI."] } });
    return ok({ doi, existing: await findExisting(doi, "", null) });
  });
}

/**
 * Gives a source the DOI found in its paper, when it has none yet. A DOI that belongs to another
 * source is a conflict naming that source.
 */
export async function assignSourceDoi(sourceId: number, doiText: string, actor: Actor): Promise<Result<{ id: number; version: number; doi: string }>> {
  return guard(async () => {
    const doi = normalizeDoi(typeof doiText === "string" ? doiText : "");
    if (!doi) return fail("invalid_input", "That is not a DOI.", { fieldErrors: { doi: ["Not a DOI."] } });
    const source = isRowId(sourceId) ? await getSource(sourceId) : null;
    if (!source) return fail("not_found", `Source ${sourceId} does not exist.`);
    if (source.doi === doi) return ok({ id: source.id, version: source.version, doi });
    if (source.doi) return fail("conflict", `Source ${sourceId} already has the DOI ${source.doi}; change it on the source page if it is wrong.`);
    const { id, version, titleKey: _t, ...values } = source;
    const r = await updateSource({ ...values, id, version, doi }, actor);
    if (!r.ok) return r;
    return ok({ ...r.data, doi });
  });
}
