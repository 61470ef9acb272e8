"use client";

import { useEffect, useRef, useState } from "react";
import { findDois } from "@/lib/domain/doi-search";
import { Button } from "../../_components/button";
import { formatNumber } from "../../_components/format";
import { firstPagesText, loadPdfjs } from "../../_components/pdf-pane";

interface Doc {
  id: number;
  fileName: string;
  sizeBytes: number;
  sha256: string;
}

/** The source's papers: upload a PDF (checked by its bytes, stored once), list them, offer a DOI found in one. */
export function SourceDocuments({ sourceId, sourceDoi }: { sourceId: number; sourceDoi: string | null }) {
  const [docs, setDocs] = useState<Doc[] | null>(null);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ tone: "error" | "info"; text: string } | null>(null);
  const [foundDoi, setFoundDoi] = useState<string | null>(null);
  const [doiSaved, setDoiSaved] = useState<string | null>(null);
  const fileRef = useRef<HTMLInputElement>(null);

  async function reload() {
    const res = await fetch(`/api/sources/${sourceId}/documents`);
    if (res.ok) setDocs(((await res.json()) as { documents: Doc[] }).documents);
  }

  useEffect(() => {
    void reload();
  }, [sourceId]);

  async function scanForDoi(documentId: number) {
    try {
      const pdfjs = await loadPdfjs();
      const doc = await pdfjs.getDocument({ url: `/api/documents/${documentId}` }).promise;
      const dois = findDois(await firstPagesText(doc));
      await doc.destroy();
      if (dois[0] && dois[0] !== sourceDoi) setFoundDoi(dois[0]);
    } catch {
      // a PDF pdf.js cannot read still uploads; only the DOI offer is skipped
    }
  }

  async function upload() {
    const file = fileRef.current?.files?.[0];
    if (!file) {
      setMessage({ tone: "error", text: "Choose the paper's PDF." });
      return;
    }
    setBusy(true);
    setMessage(null);
    const fd = new FormData();
    fd.set("file", file);
    const res = await fetch(`/api/sources/${sourceId}/documents`, { method: "POST", body: fd });
    const body = (await res.json().catch(() => ({}))) as { document?: Doc & { alreadyStored: boolean; alreadyAttached: boolean }; error?: { message: string } };
    setBusy(false);
    if (!res.ok || !body.document) {
      setMessage({ tone: "error", text: body.error?.message ?? `The upload failed (${res.status}).` });
      return;
    }
    const d = body.document;
    setMessage({ tone: "info", text: d.alreadyAttached ? "This PDF is already attached to the source." : d.alreadyStored ? "Attached (the same file was already stored, so it is kept once)." : "Uploaded and attached." });
    if (fileRef.current) fileRef.current.value = "";
    await reload();
    void scanForDoi(d.id);
  }

  async function saveDoi() {
    if (!foundDoi) return;
    const res = await fetch(`/api/sources/${sourceId}/doi`, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify({ doi: foundDoi }) });
    const body = (await res.json().catch(() => ({}))) as { error?: { message: string } };
    setDoiSaved(res.ok ? `DOI ${foundDoi} saved. Reload the page to see it in the details.` : (body.error?.message ?? "Not saved."));
  }

  return (
    <section className="panel" aria-labelledby="papers">
      <div className="panel__title">
        <h2 id="papers">Paper (PDF)</h2>
      </div>
      {docs?.length ? (
        <ul className="link-list">
          {docs.map((d) => (
            <li key={d.id}>
              <a href={`/api/documents/${d.id}`} target="_blank" rel="noreferrer">
                {d.fileName}
              </a>{" "}
              <span className="muted">{formatNumber(d.sizeBytes / 1024, 0)} KiB</span>
            </li>
          ))}
        </ul>
      ) : docs ? (
        <p className="muted">No PDF yet. With one, it opens beside the record form.</p>
      ) : null}
      <div className="source-documents__upload" style={{ display: "flex", gap: "0.5rem", flexWrap: "wrap", alignItems: "center" }}>
        <label htmlFor="source-pdf" className="visually-hidden">
          PDF of the paper
        </label>
        <input id="source-pdf" ref={fileRef} type="file" name="file" accept="application/pdf,.pdf" />
        <Button onClick={() => void upload()} disabled={busy}>
          {busy ? "Uploading…" : "Upload PDF"}
        </Button>
      </div>
      {message ? <p className={`alert alert--${message.tone}`} role={message.tone === "error" ? "alert" : "status"}>{message.text}</p> : null}
      {foundDoi && !sourceDoi ? (
        <div className="alert alert--info" role="status">
          <p>
            DOI found in the paper: <span className="mono">{foundDoi}</span> <Button size="small" onClick={() => void saveDoi()}>Use it for this source</Button>
          </p>
          {doiSaved ? <p>{doiSaved}</p> : null}
        </div>
      ) : foundDoi && sourceDoi ? (
        <p className="alert alert--warning" role="status">
          The paper names DOI <span className="mono">{foundDoi}</span>, not the source&rsquo;s {sourceDoi}: check which is right.
        </p>
      ) : null}
    </section>
  );
}
