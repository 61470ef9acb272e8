"use client";

import { useCallback, useEffect, useRef, useState, type PointerEvent as ReactPointerEvent } from "react";
import type { PDFDocumentProxy, PDFPageProxy, PageViewport } from "pdfjs-dist";
import { findDois } from "@/lib/domain/doi-search";
import { groupPdfTable, type PdfBox, type PdfTextItem } from "@/lib/domain/pdf-table";
import { Button } from "./button";
import "./pdf-pane.css";

export interface PdfDocumentRef {
  id: number;
  fileName: string;
}

export interface PdfTableSelection {
  rows: string[][];
  page: number;
  box: PdfBox;
  fileName: string;
}

export interface PdfPaneProps {
  documents: readonly PdfDocumentRef[];
  /** The source the paper belongs to, to offer a DOI found in the paper. */
  sourceId?: number | null;
  sourceDoi?: string | null;
  /** Called with the page in view (1-based) whenever it changes. */
  onPageChange?: (page: number) => void;
  /** Called with a table read from a boxed region; when absent, the rows go to the import page. */
  onTable?: (table: PdfTableSelection) => void;
}

type Pdfjs = typeof import("pdfjs-dist");

let pdfjsPromise: Promise<Pdfjs> | null = null;

/** pdf.js, loaded on first use, with its worker served by this application (never a CDN). */
export function loadPdfjs(): Promise<Pdfjs> {
  pdfjsPromise ??= import("pdfjs-dist").then((m) => {
    m.GlobalWorkerOptions.workerSrc = "/api/pdf-worker";
    return m;
  });
  return pdfjsPromise;
}

function textItemsOf(content: { items: unknown[] }): PdfTextItem[] {
  const out: PdfTextItem[] = [];
  for (const it of content.items) {
    const t = it as { str?: string; transform?: number[]; width?: number; height?: number };
    if (typeof t.str !== "string" || !t.transform) continue;
    out.push({ str: t.str, x: t.transform[4] ?? 0, y: t.transform[5] ?? 0, width: t.width ?? 0, height: t.height ?? 0 });
  }
  return out;
}

/** Text of the first pages of a PDF, for finding its DOI. */
export async function firstPagesText(doc: PDFDocumentProxy, pages = 2): Promise<string> {
  const parts: string[] = [];
  for (let p = 1; p <= Math.min(pages, doc.numPages); p++) {
    const content = await (await doc.getPage(p)).getTextContent();
    parts.push(textItemsOf(content).map((i) => i.str).join(" "));
  }
  return parts.join("\n");
}

const ZOOMS = [0.5, 0.75, 1, 1.25, 1.5, 2, 3];

/**
 * A paper's PDF beside the form: one page at a time with zoom, text search across pages, a
 * selectable text layer, a DOI found on the first pages offered for the source, and a box tool
 * that reads a table from the page's text.
 */
export function PdfPane({ documents, sourceId, sourceDoi, onPageChange, onTable }: PdfPaneProps) {
  const [docIndex, setDocIndex] = useState(0);
  const [doc, setDoc] = useState<PDFDocumentProxy | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [pageNumber, setPageNumber] = useState(1);
  const [pageInput, setPageInput] = useState("1");
  const [scale, setScale] = useState(1);
  const [query, setQuery] = useState("");
  const [hits, setHits] = useState<number[] | null>(null);
  const [activeQuery, setActiveQuery] = useState("");
  const [noTextLayer, setNoTextLayer] = useState(false);
  const [foundDoi, setFoundDoi] = useState<string | null>(null);
  const [doiState, setDoiState] = useState<"idle" | "saving" | "saved" | string>("idle");
  const [boxMode, setBoxMode] = useState(false);
  const [drag, setDrag] = useState<{ x0: number; y0: number; x1: number; y1: number } | null>(null);
  const [table, setTable] = useState<PdfTableSelection | null>(null);
  const [tableMessage, setTableMessage] = useState<string | null>(null);
  const canvasRef = useRef<HTMLCanvasElement>(null);
  const textRef = useRef<HTMLDivElement>(null);
  const viewportRef = useRef<PageViewport | null>(null);
  const viewportBoxRef = useRef<HTMLDivElement>(null);
  const itemsRef = useRef<PdfTextItem[]>([]);
  const textCache = useRef(new Map<number, string>());
  const current = documents[docIndex] ?? documents[0];

  // open the document
  useEffect(() => {
    if (!current) return;
    let cancelled = false;
    let opened: PDFDocumentProxy | null = null;
    setDoc(null);
    setLoadError(null);
    setPageNumber(1);
    setPageInput("1");
    setHits(null);
    setFoundDoi(null);
    textCache.current = new Map();
    (async () => {
      try {
        const pdfjs = await loadPdfjs();
        opened = await pdfjs.getDocument({ url: `/api/documents/${current.id}` }).promise;
        if (cancelled) return;
        const first = await opened.getPage(1);
        const width = viewportBoxRef.current?.clientWidth ?? 0;
        if (width > 0) setScale(Math.max(0.5, Math.min(3, Math.floor(((width - 24) / first.getViewport({ scale: 1 }).width) * 20) / 20)));
        setDoc(opened);
        const dois = findDois(await firstPagesText(opened));
        if (!cancelled && dois[0]) setFoundDoi(dois[0]);
      } catch (error) {
        if (!cancelled) setLoadError(`The PDF could not be opened: ${(error as Error).message}`);
      }
    })();
    return () => {
      cancelled = true;
      void opened?.destroy();
    };
  }, [current]);

  useEffect(() => {
    onPageChange?.(pageNumber);
  }, [pageNumber, onPageChange]);

  // render the page in view: canvas, then the text layer over it
  useEffect(() => {
    if (!doc) return;
    let cancelled = false;
    let renderTask: { cancel: () => void; promise: Promise<void> } | null = null;
    let textLayer: { cancel: () => void } | null = null;
    (async () => {
      const pdfjs = await loadPdfjs();
      const page: PDFPageProxy = await doc.getPage(pageNumber);
      if (cancelled) return;
      const viewport = page.getViewport({ scale });
      viewportRef.current = viewport;
      const canvas = canvasRef.current;
      const container = textRef.current;
      if (!canvas || !container) return;
      const ratio = window.devicePixelRatio || 1;
      canvas.width = Math.floor(viewport.width * ratio);
      canvas.height = Math.floor(viewport.height * ratio);
      canvas.style.width = `${viewport.width}px`;
      canvas.style.height = `${viewport.height}px`;
      const context = canvas.getContext("2d");
      if (!context) return;
      renderTask = page.render({ canvasContext: context, canvas, viewport, transform: ratio !== 1 ? [ratio, 0, 0, ratio, 0, 0] : undefined });
      const content = await page.getTextContent();
      if (cancelled) return;
      itemsRef.current = textItemsOf(content);
      setNoTextLayer(!itemsRef.current.some((i) => i.str.trim() !== ""));
      container.replaceChildren();
      container.style.setProperty("--scale-factor", String(scale));
      container.style.setProperty("--total-scale-factor", String(scale));
      const layer = new pdfjs.TextLayer({ textContentSource: content, container, viewport });
      textLayer = layer;
      await layer.render();
      if (cancelled) return;
      const q = activeQuery.trim().toLowerCase();
      if (q) for (const span of container.querySelectorAll("span")) if (span.textContent?.toLowerCase().includes(q)) span.classList.add("pdf-pane__hit");
      await renderTask.promise.catch(() => undefined);
    })().catch((error: unknown) => {
      if (!cancelled && (error as Error).name !== "RenderingCancelledException") setLoadError(`The page could not be shown: ${(error as Error).message}`);
    });
    return () => {
      cancelled = true;
      renderTask?.cancel();
      textLayer?.cancel();
    };
  }, [doc, pageNumber, scale, activeQuery]);

  const goTo = useCallback(
    (n: number) => {
      if (!doc) return;
      const p = Math.min(Math.max(1, Math.round(n)), doc.numPages);
      setPageNumber(p);
      setPageInput(String(p));
    },
    [doc],
  );

  async function pageText(n: number): Promise<string> {
    const cached = textCache.current.get(n);
    if (cached !== undefined) return cached;
    const content = await (await doc!.getPage(n)).getTextContent();
    const text = textItemsOf(content)
      .map((i) => i.str)
      .join(" ")
      .replace(/\s+/g, " ");
    textCache.current.set(n, text);
    return text;
  }

  async function search() {
    const q = query.trim().toLowerCase();
    setActiveQuery(q);
    if (!doc || !q) {
      setHits(null);
      return;
    }
    const found: number[] = [];
    for (let p = 1; p <= doc.numPages; p++) if ((await pageText(p)).toLowerCase().includes(q)) found.push(p);
    setHits(found);
    if (found.length && !found.includes(pageNumber)) goTo(found[0]!);
  }

  async function saveFoundDoi() {
    if (!sourceId || !foundDoi) return;
    setDoiState("saving");
    const res = await fetch(`/api/sources/${sourceId}/doi`, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify({ doi: foundDoi }) });
    const body = (await res.json().catch(() => ({}))) as { error?: { message: string } };
    setDoiState(res.ok ? "saved" : (body.error?.message ?? "The DOI could not be saved."));
  }

  function pointFromEvent(e: ReactPointerEvent<HTMLDivElement>) {
    const rect = e.currentTarget.getBoundingClientRect();
    return { x: e.clientX - rect.left, y: e.clientY - rect.top };
  }

  function finishBox(d: { x0: number; y0: number; x1: number; y1: number }) {
    const viewport = viewportRef.current;
    if (!viewport || !current) return;
    const [ax, ay] = viewport.convertToPdfPoint(d.x0, d.y0) as [number, number];
    const [bx, by] = viewport.convertToPdfPoint(d.x1, d.y1) as [number, number];
    const box: PdfBox = { x: Math.min(ax, bx), y: Math.min(ay, by), width: Math.abs(bx - ax), height: Math.abs(by - ay) };
    const r = groupPdfTable(itemsRef.current, box);
    if (!r.ok) {
      setTable(null);
      setTableMessage(r.message);
      return;
    }
    setTableMessage(null);
    setTable({ rows: r.rows, page: pageNumber, box, fileName: current.fileName });
  }

  function sendTable(t: PdfTableSelection) {
    if (onTable) {
      onTable(t);
      return;
    }
    sessionStorage.setItem("meltledger:pdf-table", JSON.stringify({ ...t, sourceId: sourceId ?? null }));
    window.location.href = `/imports?from=pdf${sourceId ? `&sourceId=${sourceId}` : ""}`;
  }

  if (!current) return null;
  const numPages = doc?.numPages ?? 0;
  const dragStyle = drag ? { left: Math.min(drag.x0, drag.x1), top: Math.min(drag.y0, drag.y1), width: Math.abs(drag.x1 - drag.x0), height: Math.abs(drag.y1 - drag.y0) } : undefined;

  return (
    <section className="pdf-pane panel" aria-label="Paper">
      <div className="pdf-pane__toolbar">
        {documents.length > 1 ? (
          <select className="select pdf-pane__doc" aria-label="Document" value={docIndex} onChange={(e) => setDocIndex(Number(e.target.value))}>
            {documents.map((d, i) => (
              <option key={d.id} value={i}>
                {d.fileName}
              </option>
            ))}
          </select>
        ) : (
          <span className="pdf-pane__name" title={current.fileName}>
            {current.fileName}
          </span>
        )}
        <span className="toolbar__spacer" />
        <Button size="small" onClick={() => goTo(pageNumber - 1)} disabled={pageNumber <= 1} aria-label="Previous page">
          ‹
        </Button>
        <form
          className="pdf-pane__page"
          onSubmit={(e) => {
            e.preventDefault();
            goTo(Number(pageInput) || 1);
          }}
        >
          <label htmlFor="pdf-page" className="visually-hidden">
            Page
          </label>
          <input id="pdf-page" className="input" inputMode="numeric" value={pageInput} onChange={(e) => setPageInput(e.target.value)} onBlur={() => goTo(Number(pageInput) || pageNumber)} />
          <span className="muted">of {numPages || "…"}</span>
        </form>
        <Button size="small" onClick={() => goTo(pageNumber + 1)} disabled={!doc || pageNumber >= numPages} aria-label="Next page">
          ›
        </Button>
        <Button size="small" onClick={() => setScale((s) => ZOOMS.filter((z) => z < s - 0.001).pop() ?? s)} disabled={scale <= ZOOMS[0]!} aria-label="Zoom out">
          −
        </Button>
        <span className="num pdf-pane__zoom" aria-live="polite">
          {Math.round(scale * 100)} %
        </span>
        <Button size="small" onClick={() => setScale((s) => ZOOMS.find((z) => z > s + 0.001) ?? s)} disabled={scale >= ZOOMS[ZOOMS.length - 1]!} aria-label="Zoom in">
          +
        </Button>
      </div>
      <div className="pdf-pane__toolbar">
        <form
          className="pdf-pane__search"
          role="search"
          onSubmit={(e) => {
            e.preventDefault();
            void search();
          }}
        >
          <label htmlFor="pdf-search" className="visually-hidden">
            Search the paper
          </label>
          <input id="pdf-search" className="input" type="search" placeholder="Search the paper" value={query} onChange={(e) => setQuery(e.target.value)} />
          <Button size="small" type="submit" disabled={!doc}>
            Find
          </Button>
        </form>
        {hits ? (
          <span className="muted pdf-pane__hits" role="status">
            {hits.length ? (
              <>
                on page{hits.length > 1 ? "s" : ""}{" "}
                {hits.slice(0, 12).map((p) => (
                  <button key={p} type="button" className="pdf-pane__hitlink" onClick={() => goTo(p)} aria-current={p === pageNumber ? "page" : undefined}>
                    {p}
                  </button>
                ))}
              </>
            ) : (
              "not found"
            )}
          </span>
        ) : null}
        <span className="toolbar__spacer" />
        <Button size="small" variant={boxMode ? "primary" : "secondary"} aria-pressed={boxMode} onClick={() => { setBoxMode((b) => !b); setDrag(null); }} disabled={!doc}>
          {boxMode ? "Drawing: drag around a table" : "Read a table"}
        </Button>
        {sourceId && doc ? (
          <a className="button button--small" href={`/figures?sourceId=${sourceId}&document=${current.id}&page=${pageNumber}`}>
            Read a figure
          </a>
        ) : null}
      </div>

      {foundDoi && sourceId && foundDoi !== sourceDoi ? (
        <div className="alert alert--info pdf-pane__doi" role="status">
          {sourceDoi ? (
            <p>
              The paper names DOI <span className="mono">{foundDoi}</span>; the source has <span className="mono">{sourceDoi}</span>. Check which is right on the source page.
            </p>
          ) : doiState === "saved" ? (
            <p>
              DOI <span className="mono">{foundDoi}</span> saved for this source.
            </p>
          ) : (
            <p>
              DOI found in the paper: <span className="mono">{foundDoi}</span>{" "}
              <Button size="small" onClick={() => void saveFoundDoi()} disabled={doiState === "saving"}>
                Use it for this source
              </Button>
              {doiState !== "idle" && doiState !== "saving" ? <span className="field__error">{doiState}</span> : null}
            </p>
          )}
        </div>
      ) : null}
      {loadError ? <div className="alert alert--error" role="alert"><p>{loadError}</p></div> : null}
      {noTextLayer ? (
        <p className="alert alert--warning" role="status">
          Page {pageNumber} has no text layer (it is probably a scanned image): its text cannot be selected, searched or read as a table. Type the values in.
        </p>
      ) : null}

      <div className="pdf-pane__viewport" ref={viewportBoxRef}>
        <div className="pdf-pane__page-layers" data-page={pageNumber}>
          <canvas ref={canvasRef} className="pdf-pane__canvas" aria-label={`Page ${pageNumber} of ${current.fileName}`} />
          <div ref={textRef} className="textLayer pdf-pane__text" />
          {boxMode ? (
            <div
              className="pdf-pane__boxer"
              onPointerDown={(e) => {
                e.currentTarget.setPointerCapture(e.pointerId);
                const p = pointFromEvent(e);
                setDrag({ x0: p.x, y0: p.y, x1: p.x, y1: p.y });
              }}
              onPointerMove={(e) => {
                if (!drag) return;
                const p = pointFromEvent(e);
                setDrag({ ...drag, x1: p.x, y1: p.y });
              }}
              onPointerUp={() => {
                if (drag && Math.abs(drag.x1 - drag.x0) > 4 && Math.abs(drag.y1 - drag.y0) > 4) finishBox(drag);
                setDrag(null);
                setBoxMode(false);
              }}
            >
              {dragStyle ? <div className="pdf-pane__box" style={dragStyle} /> : null}
            </div>
          ) : null}
        </div>
      </div>

      {tableMessage ? <p className="alert alert--warning" role="status">{tableMessage}</p> : null}
      {table ? (
        <div className="pdf-pane__table" aria-label="Table read from the box">
          <p className="muted">
            {table.rows.length} rows × {table.rows[0]?.length ?? 0} columns from page {table.page}:
          </p>
          <div className="table-wrap">
            <table className="table">
              <tbody>
                {table.rows.slice(0, 30).map((r, i) => (
                  <tr key={i}>
                    {r.map((c, j) => (i === 0 ? <th key={j}>{c}</th> : <td key={j}>{c}</td>))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <div className="form-actions">
            <Button variant="primary" onClick={() => sendTable(table)}>
              Map and import these rows
            </Button>
            <Button variant="ghost" onClick={() => setTable(null)}>
              Discard
            </Button>
          </div>
        </div>
      ) : null}
    </section>
  );
}
