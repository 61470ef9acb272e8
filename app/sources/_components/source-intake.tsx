"use client";

import Link from "next/link";
import { useState } from "react";
import type { FormState } from "../../_components/form-result";
import { Button } from "../../_components/button";
import { TextAreaField, TextField } from "../../_components/text-field";
import { SourceForm, type SourceFormValues } from "./source-form";

interface Existing {
  id: number;
  title: string;
  year: number | null;
  doi: string | null;
  by: "doi" | "title_year";
}

interface Candidate {
  kind: string;
  title: string;
  authors: string[];
  year: number | null;
  venue: string | null;
  doi: string | null;
  url: string | null;
  label: string;
  existing: Existing | null;
}

const BLANK: SourceFormValues = {
  kind: "", title: "", authors: [], year: null, venue: null, doi: null, url: null, notes: null, densityMethod: "unknown",
  outcomeEvidence: "statement_only", machineStated: false, spotSizeDefinition: null, powderReported: false, atmosphereReported: false,
};

async function postCitations<T>(body: unknown): Promise<{ ok: true; data: T } | { ok: false; message: string }> {
  const res = await fetch("/api/citations", { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(body) });
  const json = (await res.json().catch(() => ({}))) as T & { error?: { message: string } };
  return res.ok ? { ok: true, data: json } : { ok: false, message: json.error?.message ?? `The server answered ${res.status}.` };
}

function ExistingNote({ e }: { e: Existing }) {
  return (
    <p>
      Already in the collection ({e.by === "doi" ? "same DOI" : "same title and year"}): <Link href={`/sources/${e.id}`}>source {e.id}, “{e.title}”{e.year ? ` (${e.year})` : ""}</Link>. Use it instead of adding a copy.
    </p>
  );
}

/**
 * Adding a source from a pasted citation (BibTeX or RIS) or a typed DOI: the entry fills the form,
 * and a source already in the collection (same DOI, or same title and year) is offered instead.
 */
export function SourceIntake({ action }: { action: (fd: FormData) => Promise<FormState> }) {
  const [citation, setCitation] = useState("");
  const [doi, setDoi] = useState("");
  const [candidates, setCandidates] = useState<Candidate[]>([]);
  const [doiMatch, setDoiMatch] = useState<{ doi: string; existing: Existing | null } | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [initial, setInitial] = useState<SourceFormValues>(BLANK);
  const [formKey, setFormKey] = useState(0);

  function fill(values: Partial<SourceFormValues>) {
    setInitial({ ...BLANK, ...values });
    setFormKey((k) => k + 1);
  }

  async function readCitation() {
    setMessage(null);
    setDoiMatch(null);
    const r = await postCitations<{ entries: Candidate[]; skipped: { message: string }[] }>({ text: citation });
    if (!r.ok) {
      setCandidates([]);
      setMessage(r.message);
      return;
    }
    setCandidates(r.data.entries);
    if (r.data.skipped.length) setMessage(r.data.skipped.map((s) => s.message).join(" "));
    const first = r.data.entries[0];
    if (r.data.entries.length === 1 && first && !first.existing) fill(first);
  }

  async function lookUp() {
    setMessage(null);
    setCandidates([]);
    const r = await postCitations<{ doi: string; existing: Existing | null }>({ doi });
    if (!r.ok) {
      setDoiMatch(null);
      setMessage(r.message);
      return;
    }
    setDoiMatch(r.data);
    if (!r.data.existing) fill({ doi: r.data.doi });
  }

  return (
    <>
      <section className="panel source-intake" aria-labelledby="intake-title" style={{ maxWidth: 980 }}>
        <div className="panel__title">
          <h2 id="intake-title">Start from a citation or a DOI</h2>
          <span className="muted">optional</span>
        </div>
        <div className="form-grid">
          <TextAreaField className="col-8" label="BibTeX or RIS" name="citation" optional rows={5} spellCheck={false} value={citation} onChange={(e) => setCitation(e.target.value)} hint="Exported from your citation manager; several entries at once are fine." />
          <div className="col-4" style={{ display: "grid", gap: "0.75rem", alignContent: "start" }}>
            <Button onClick={() => void readCitation()} disabled={!citation.trim()}>
              Read the citation
            </Button>
            <TextField label="DOI" name="lookupDoi" optional value={doi} onChange={(e) => setDoi(e.target.value)} spellCheck={false} hint="Checked against the collection; no metadata is fetched (the workbench works offline)." />
            <Button onClick={() => void lookUp()} disabled={!doi.trim()}>
              Check the DOI
            </Button>
          </div>
        </div>
        {message ? <p className="alert alert--warning" role="status">{message}</p> : null}
        {doiMatch?.existing ? (
          <div className="alert alert--warning" role="status">
            <ExistingNote e={doiMatch.existing} />
          </div>
        ) : doiMatch ? (
          <p className="muted" role="status">
            DOI {doiMatch.doi} is not in the collection yet; it is in the form below.
          </p>
        ) : null}
        {candidates.length ? (
          <ul className="source-intake__entries" style={{ listStyle: "none", padding: 0, display: "grid", gap: "0.5rem" }}>
            {candidates.map((c, i) => (
              <li key={i} className={c.existing ? "alert alert--warning" : "alert alert--info"}>
                <p className="alert__title">
                  {c.title}
                  {c.year ? ` (${c.year})` : ""}
                </p>
                <p className="muted">
                  {[c.authors.join("; "), c.venue, c.doi].filter(Boolean).join(" · ")}
                </p>
                {c.existing ? <ExistingNote e={c.existing} /> : null}
                <Button size="small" onClick={() => fill(c)}>
                  {c.existing ? "Fill the form anyway" : "Fill the form"}
                </Button>
              </li>
            ))}
          </ul>
        ) : null}
      </section>
      <div className="panel" style={{ maxWidth: 980 }}>
        <SourceForm key={formKey} action={action} initial={initial} submitLabel="Add source" />
      </div>
    </>
  );
}
