"use client";

import { useEffect, useState } from "react";
import { PdfPane, type PdfDocumentRef } from "../../_components/pdf-pane";
import { RecordForm, type RecordFormProps } from "./record-form";

/**
 * The record form, with the source's PDF beside it when the source has one: the page in view fills
 * the record's page, and a table boxed on a page goes to the import step.
 */
export function RecordFormWithPdf({ sourceId, ...form }: Omit<RecordFormProps, "pageInView"> & { sourceId: number | null }) {
  const [documents, setDocuments] = useState<PdfDocumentRef[]>([]);
  const [sourceDoi, setSourceDoi] = useState<string | null>(null);
  const [page, setPage] = useState<number | null>(null);

  useEffect(() => {
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

  if (!documents.length) return <RecordForm {...form} />;
  return (
    <div className="record-with-pdf">
      <div className="record-with-pdf__form">
        <RecordForm {...form} pageInView={page} />
      </div>
      <div className="record-with-pdf__pane">
        <PdfPane documents={documents} sourceId={sourceId} sourceDoi={sourceDoi} onPageChange={setPage} />
      </div>
    </div>
  );
}
