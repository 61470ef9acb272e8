"use client";

import { useEffect, useState, type FormEvent } from "react";
import { PdfPane, type PdfDocumentRef } from "../../_components/pdf-pane";
import { RecordForm, type RecordFormProps } from "./record-form";

/**
 * The record form, with the chosen source's PDF beside it when the source has one: the page in
 * view fills the record's page, and a table boxed on a page goes to the import step. The pane
 * follows the form's source choice; the form itself stays mounted, so nothing typed is lost.
 */
export function RecordFormWithPdf({ sourceId: initialSourceId, ...form }: Omit<RecordFormProps, "pageInView"> & { sourceId: number | null }) {
  const [sourceId, setSourceId] = useState<number | null>(initialSourceId);
  const [documents, setDocuments] = useState<PdfDocumentRef[]>([]);
  const [sourceDoi, setSourceDoi] = useState<string | null>(null);
  const [page, setPage] = useState<number | null>(null);

  useEffect(() => {
    setDocuments([]);
    setSourceDoi(null);
    if (!sourceId) return;
    let cancelled = false;
    fetch(`/api/sources/${sourceId}/documents`)
      .then((r) => (r.ok ? (r.json() as Promise<{ documents: PdfDocumentRef[]; sourceDoi: string | null }>) : { documents: [], sourceDoi: null }))
      .then((b) => {
        if (cancelled) return;
        setDocuments(b.documents);
        setSourceDoi(b.sourceDoi);
      })
      .catch(() => undefined);
    return () => {
      cancelled = true;
    };
  }, [sourceId]);

  // the form's own source select: its change events bubble up here
  function onFormChange(e: FormEvent<HTMLDivElement>) {
    const target = e.target as HTMLSelectElement;
    if (target.name === "sourceId") setSourceId(Number(target.value) || null);
  }

  const withPane = documents.length > 0;
  return (
    <div className={withPane ? "record-with-pdf" : undefined} onChange={onFormChange}>
      <div className="record-with-pdf__form">
        <RecordForm {...form} pageInView={withPane ? page : null} />
      </div>
      {withPane ? (
        <div className="record-with-pdf__pane">
          <PdfPane key={sourceId ?? 0} documents={documents} sourceId={sourceId} sourceDoi={sourceDoi} onPageChange={setPage} />
        </div>
      ) : null}
    </div>
  );
}
