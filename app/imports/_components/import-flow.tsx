"use client";

import Link from "next/link";
import { useEffect, useMemo, useRef, useState } from "react";
import { columnKey, IMPORT_FIELDS, importFieldLabel, quantityOfField, type ImportField, type ImportMapping, type MappingIssue, type ResolvedColumn } from "@/lib/domain/column-mapping";
import type { RowProblem } from "@/lib/domain/import-row";
import { isOutcome, outcomeLabel } from "@/lib/domain/outcomes";
import { PASTE_SPLITTERS, type PasteSplitter } from "@/lib/domain/table-text";
import { CANONICAL_UNIT, unitOptions } from "@/lib/domain/units";
import type { ImportTableRequest } from "@/lib/schemas/import";
import { Button } from "../../_components/button";
import { Checkbox } from "../../_components/checkbox";
import { formatNumber } from "../../_components/format";
import { ProgressBar } from "../../_components/progress-bar";
import { Select } from "../../_components/select";
import { TextAreaField, TextField } from "../../_components/text-field";
import "./import-flow.css";

interface Preview {
  head: { headers: string[]; sheets: string[]; sheet: string | null; delimiter: string | null };
  mapping: { columns: ResolvedColumn[]; issues: MappingIssue[]; unmapped: string[]; mapping: ImportMapping };
  rowCount: number;
  blankRows: number;
  problems: RowProblem[];
  problemCount: number;
  errorRows: number;
  sample: { row: number; cells: string[]; values: Record<string, number | null>; outcome: string; sourceLabel: string | null; problems: RowProblem[] }[];
  sources: { key: string; doi: string | null; url: string | null; sourceId: number | null; rows: number }[];
}

interface JobView {
  id: string;
  state: "running" | "finished";
  progress: { phase: string; rowsRead: number; rowsWritten: number; rowsTotal: number | null };
  result:
    | { ok: true; data: { status: "committed" | "cancelled" | "dry_run"; importRunId: number | null; imported: number; excluded: number; recordCount: number; createdSources: { id: number; doi: string | null; url: string | null }[]; checks: { opened: number } | null } }
    | { ok: false; error: { code: string; message: string; details?: { rowErrors?: { row: number; field: string; message: string }[] } } }
    | null;
}

interface Preset {
  id: number;
  name: string;
  sourceId: number | null;
  mapping: ImportMapping;
}

type ApiError = { error: { code: string; message: string; details?: { rowErrors?: { row: number; field: string; message: string }[] } } };

async function post<T>(url: string, body: unknown): Promise<{ ok: true; data: T } | { ok: false; error: ApiError["error"] }> {
  const res = await fetch(url, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(body) });
  const json = (await res.json().catch(() => ({ error: { code: "internal", message: `The server answered ${res.status}.` } }))) as T | ApiError;
  return res.ok ? { ok: true, data: json as T } : { ok: false, error: (json as ApiError).error };
}

const SPLITTER_LABEL: Record<PasteSplitter, string> = { auto: "Detect", tab: "Tabs", spaces: "Runs of spaces", whitespace: "Any space", semicolon: "Semicolons", comma: "Commas", pipe: "Pipes (|)" };
const FIELD_OPTIONS = [{ value: "", label: "— not imported —" }, ...IMPORT_FIELDS.map((f) => ({ value: f, label: importFieldLabel(f) }))];

/**
 * The import page's flow: a table in (CSV/XLSX upload, pasted text, or a table boxed in a PDF),
 * columns mapped to fields and units, every row checked in a preview, then a commit that writes
 * every row or none, with progress and a cancel that rolls back.
 */
export function ImportFlow({ sources, initialSourceId }: { sources: readonly { id: number; label: string }[]; initialSourceId: number | null }) {
  const [sourceId, setSourceId] = useState<string>(initialSourceId ? String(initialSourceId) : "");
  const [mode, setMode] = useState<"file" | "paste" | "pdf">("file");
  const [pasteText, setPasteText] = useState("");
  const [splitter, setSplitter] = useState<PasteSplitter>("auto");
  const [table, setTable] = useState<ImportTableRequest | null>(null);
  const [uploadError, setUploadError] = useState<string | null>(null);
  const [uploading, setUploading] = useState(false);
  const [mapping, setMapping] = useState<ImportMapping | null>(null);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [previewError, setPreviewError] = useState<ApiError["error"] | null>(null);
  const [checking, setChecking] = useState(false);
  const [excludeErrors, setExcludeErrors] = useState(false);
  const [job, setJob] = useState<JobView | null>(null);
  const [presets, setPresets] = useState<Preset[]>([]);
  const [presetName, setPresetName] = useState("");
  const [presetSaved, setPresetSaved] = useState<string | null>(null);
  const fileRef = useRef<HTMLInputElement>(null);
  const pollRef = useRef<ReturnType<typeof setInterval> | null>(null);

  // a table boxed in the PDF pane arrives through session storage
  useEffect(() => {
    const params = new URLSearchParams(window.location.search);
    if (params.get("from") !== "pdf") return;
    const raw = sessionStorage.getItem("meltledger:pdf-table");
    if (!raw) return;
    try {
      const t = JSON.parse(raw) as { rows: string[][]; page: number; box: { x: number; y: number; width: number; height: number }; fileName: string; sourceId: number | null };
      setMode("pdf");
      if (t.sourceId) setSourceId(String(t.sourceId));
      setTable({ kind: "pdf_table", rows: t.rows, page: t.page, box: t.box, fileName: t.fileName, label: null });
    } catch {
      // a stale or foreign entry: ignore it
    }
  }, []);

  useEffect(() => {
    fetch(`/api/imports/presets${sourceId ? `?sourceId=${sourceId}` : ""}`)
      .then((r) => (r.ok ? (r.json() as Promise<{ presets: Preset[] }>) : { presets: [] }))
      .then((b) => setPresets(b.presets))
      .catch(() => undefined);
  }, [sourceId, presetSaved]);

  useEffect(() => () => {
    if (pollRef.current) clearInterval(pollRef.current);
  }, []);

  const request = useMemo(
    () => (table ? { table, mapping, sourceId: sourceId ? Number(sourceId) : null, excludeErrors } : null),
    [table, mapping, sourceId, excludeErrors],
  );

  async function check(next: { table?: ImportTableRequest; mapping?: ImportMapping | null } = {}) {
    const t = next.table ?? table;
    if (!t) return;
    setChecking(true);
    setJob(null);
    const r = await post<Preview>("/api/imports/preview", { table: t, mapping: next.mapping === undefined ? mapping : next.mapping, sourceId: sourceId ? Number(sourceId) : null });
    setChecking(false);
    if (!r.ok) {
      setPreview(null);
      setPreviewError(r.error);
      return;
    }
    setPreviewError(null);
    setPreview(r.data);
    setMapping(r.data.mapping.mapping);
  }

  // a new table is checked straight away with a mapping guessed from its headers
  useEffect(() => {
    if (table) void check({ table, mapping: null });
  }, [table]);

  async function upload() {
    const file = fileRef.current?.files?.[0];
    if (!file) {
      setUploadError("Choose a .csv or .xlsx file.");
      return;
    }
    setUploading(true);
    setUploadError(null);
    const fd = new FormData();
    fd.set("file", file);
    const res = await fetch("/api/imports/files", { method: "POST", body: fd });
    const body = (await res.json().catch(() => ({}))) as { sha256?: string; fileName?: string; format?: "csv" | "xlsx" } & Partial<ApiError>;
    setUploading(false);
    if (!res.ok || !body.sha256) {
      setUploadError(body.error?.message ?? `The upload failed (${res.status}).`);
      return;
    }
    setMapping(null);
    setTable({ kind: "file", sha256: body.sha256, fileName: body.fileName ?? file.name, format: body.format ?? "csv", sheet: null, delimiter: null });
  }

  function usePaste() {
    setMapping(null);
    setTable({ kind: "paste", text: pasteText, splitter });
  }

  function setRule(index: number, patch: { field?: string; unit?: string }) {
    if (!preview || !mapping) return;
    const key = columnKey(preview.head.headers, index);
    const currentRule = mapping.columns[key] ?? null;
    const field = patch.field !== undefined ? (patch.field || null) : (currentRule?.field ?? null);
    const unit = patch.unit !== undefined ? patch.unit || null : patch.field !== undefined ? null : (currentRule?.unit ?? null);
    const next: ImportMapping = { ...mapping, columns: { ...mapping.columns, [key]: field ? { field: field as ImportField, unit } : null } };
    setMapping(next);
    void check({ mapping: next });
  }

  function setDefaultAlloy(alloy: string) {
    if (!mapping) return;
    setMapping({ ...mapping, defaults: { ...(mapping.defaults ?? {}), alloy: alloy || null } });
  }

  async function savePreset(name: string, forSource: boolean) {
    if (!mapping) return;
    const r = await post<{ preset: Preset }>("/api/imports/presets", { name, sourceId: forSource && sourceId ? Number(sourceId) : null, mapping });
    setPresetSaved(r.ok ? `Saved “${r.data.preset.name}”.` : r.error.message);
  }

  async function commit() {
    if (!request) return;
    const r = await post<JobView>("/api/imports/jobs", request);
    if (!r.ok) {
      setPreviewError(r.error);
      return;
    }
    setJob(r.data);
    pollRef.current = setInterval(async () => {
      const res = await fetch(`/api/imports/jobs/${r.data.id}`);
      if (!res.ok) return;
      const v = (await res.json()) as JobView;
      setJob(v);
      if (v.state === "finished" && pollRef.current) {
        clearInterval(pollRef.current);
        pollRef.current = null;
        if (v.result?.ok && v.result.data.status === "committed" && sourceId && mapping) void savePreset("Last import", true);
      }
    }, 400);
  }

  async function cancel() {
    if (!job) return;
    await fetch(`/api/imports/jobs/${job.id}`, { method: "DELETE" });
  }

  const mappingErrors = preview?.mapping.issues.filter((i) => i.severity === "error") ?? [];
  const mappingWarnings = preview?.mapping.issues.filter((i) => i.severity === "warning") ?? [];
  const rowErrors = preview?.problems.filter((p) => p.severity === "error") ?? [];
  const importable = preview ? preview.rowCount - preview.errorRows : 0;
  const canCommit = Boolean(preview) && !mappingErrors.length && importable > 0 && (preview!.errorRows === 0 || excludeErrors) && !(job && job.state === "running");
  const quantityColumns = preview?.mapping.columns.filter((c) => c.field && quantityOfField(c.field)) ?? [];
  const sourceOptions = sources.map((s) => ({ value: String(s.id), label: s.label }));

  return (
    <div className="import-flow">
      <section className="panel" aria-labelledby="import-step-1">
        <div className="panel__title">
          <h2 id="import-step-1">1 · The table</h2>
        </div>
        <div className="form-grid">
          <Select
            className="col-6"
            label="Source of the rows"
            name="sourceId"
            options={sourceOptions}
            placeholder="Rows name their source in a DOI column"
            value={sourceId}
            onChange={(e) => setSourceId(e.target.value)}
            hint="Rows with a DOI go to the source with that DOI (created when missing); the others to the source chosen here."
          />
          <div className="col-6" role="radiogroup" aria-label="Where the table comes from">
            <p className="field__label">From</p>
            <div style={{ display: "flex", gap: "1rem", flexWrap: "wrap" }}>
              {(["file", "paste", ...(mode === "pdf" ? ["pdf"] : [])] as const).map((m) => (
                <label key={m} className="checkbox">
                  <input type="radio" name="import-mode" value={m} checked={mode === m} onChange={() => setMode(m as typeof mode)} />
                  {m === "file" ? "A CSV or XLSX file" : m === "paste" ? "Pasted text" : "A table boxed in a PDF"}
                </label>
              ))}
            </div>
          </div>
          {mode === "file" ? (
            <div className="col-12 import-flow__upload">
              <label htmlFor="import-file" className="field__label">
                File
              </label>
              <input id="import-file" ref={fileRef} type="file" name="file" accept=".csv,.tsv,.txt,.xlsx,text/csv,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet" />
              <Button variant="primary" onClick={() => void upload()} disabled={uploading}>
                {uploading ? "Uploading…" : "Upload and read"}
              </Button>
              <p className="field__hint">CSV with any delimiter (decimal commas, quoted fields and a BOM are fine) or an XLSX workbook. The first row names the columns.</p>
              {uploadError ? <p className="field__error" role="alert">{uploadError}</p> : null}
            </div>
          ) : mode === "paste" ? (
            <>
              <TextAreaField className="col-8" label="Table text" name="pasteText" rows={8} spellCheck={false} value={pasteText} onChange={(e) => setPasteText(e.target.value)} hint="Copied from a spreadsheet (tabs) or a PDF (runs of spaces). The first line names the columns; units in the names are read, e.g. “P (W)”." />
              <div className="col-4">
                <Select label="Cells split at" name="splitter" options={PASTE_SPLITTERS.map((s) => ({ value: s, label: SPLITTER_LABEL[s] }))} value={splitter} onChange={(e) => setSplitter(e.target.value as PasteSplitter)} />
                <Button variant="primary" onClick={usePaste} disabled={!pasteText.trim()}>
                  Read the table
                </Button>
              </div>
            </>
          ) : table?.kind === "pdf_table" ? (
            <p className="col-12">
              A header row and {table.rows.length - 1} data rows from page {table.page} of {table.fileName}; each record keeps that page and the box as its location.
            </p>
          ) : null}
        </div>
      </section>

      {previewError ? (
        <div className="alert alert--error" role="alert">
          <p className="alert__title">The table cannot be imported as it is</p>
          <p>{previewError.message}</p>
          {previewError.details?.rowErrors?.length ? (
            <ul>
              {previewError.details.rowErrors.slice(0, 20).map((e, i) => (
                <li key={i}>
                  {e.row > 0 ? `Row ${e.row}, ` : ""}
                  {e.field}: {e.message}
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}

      {preview ? (
        <>
          <section className="panel" aria-labelledby="import-step-2">
            <div className="panel__title">
              <h2 id="import-step-2">2 · Columns</h2>
              <span className="muted">
                {preview.head.sheet ? `sheet “${preview.head.sheet}” · ` : ""}
                {preview.head.delimiter ? `split at ${preview.head.delimiter === "\t" ? "tabs" : `“${preview.head.delimiter}”`} · ` : ""}
                {formatNumber(preview.rowCount, 0)} rows
              </span>
            </div>
            <div className="form-grid">
              {preview.head.sheets.length > 1 && table?.kind === "file" ? (
                <Select className="col-4" label="Sheet" name="sheet" options={preview.head.sheets.map((s) => ({ value: s, label: s }))} value={preview.head.sheet ?? ""} onChange={(e) => setTable({ ...table, sheet: e.target.value })} />
              ) : null}
              <Select
                className="col-4"
                label="Apply a saved mapping"
                name="preset"
                options={presets.map((p) => ({ value: String(p.id), label: p.sourceId ? `${p.name} (this source)` : p.name }))}
                placeholder={presets.length ? "Choose a preset…" : "No presets yet"}
                value=""
                onChange={(e) => {
                  const p = presets.find((x) => String(x.id) === e.target.value);
                  if (p) {
                    setMapping(p.mapping);
                    void check({ mapping: p.mapping });
                  }
                }}
              />
              <TextField className="col-4" label="Alloy for every row" name="defaultAlloy" optional value={mapping?.defaults?.alloy ?? ""} onChange={(e) => setDefaultAlloy(e.target.value)} onBlur={() => void check()} hint="When no column names the alloy (e.g. it is in the caption)." />
            </div>
            <div className="table-wrap">
              <table className="table import-flow__mapping">
                <thead>
                  <tr>
                    <th scope="col">Column</th>
                    <th scope="col">Field</th>
                    <th scope="col">Unit</th>
                    <th scope="col">First values</th>
                  </tr>
                </thead>
                <tbody>
                  {preview.mapping.columns.map((c) => {
                    const q = c.field ? quantityOfField(c.field) : null;
                    const issues = preview.mapping.issues.filter((i) => i.column?.split(", ").includes(c.header));
                    return (
                      <tr key={c.index}>
                        <th scope="row">{c.header || <span className="muted">(column {c.index + 1})</span>}</th>
                        <td>
                          <select className="select" aria-label={`Field for column ${c.header || c.index + 1}`} value={c.field ?? ""} onChange={(e) => setRule(c.index, { field: e.target.value })}>
                            {FIELD_OPTIONS.map((o) => (
                              <option key={o.value} value={o.value}>
                                {o.label}
                              </option>
                            ))}
                          </select>
                          {issues.map((i, k) => (
                            <p key={k} className={i.severity === "error" ? "field__error" : "field__hint"}>
                              {i.message}
                            </p>
                          ))}
                        </td>
                        <td>
                          {q ? (
                            <select className="select" aria-label={`Unit for column ${c.header || c.index + 1}`} value={c.unit ?? ""} onChange={(e) => setRule(c.index, { unit: e.target.value })}>
                              {unitOptions(q).map((u) => (
                                <option key={u.id} value={u.id}>
                                  {u.label}
                                  {c.unitFrom === "header" && c.unit === u.id ? " (from header)" : ""}
                                  {c.unitFrom === "assumed" && c.unit === u.id ? " (assumed)" : ""}
                                </option>
                              ))}
                            </select>
                          ) : (
                            <span className="muted">—</span>
                          )}
                        </td>
                        <td className="muted mono">{preview.sample.slice(0, 3).map((s) => s.cells[c.index] ?? "").join(" · ")}</td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
            {mappingErrors.filter((i) => !i.column).map((i, k) => (
              <p key={k} className="alert alert--error" role="alert">
                {i.message}
              </p>
            ))}
            {mappingWarnings.length ? <p className="muted">{mappingWarnings.length} column(s) state no unit; choose it if the table uses another than the one assumed.</p> : null}
            <div className="form-actions">
              <TextField label="Save this mapping as" name="presetName" optional value={presetName} onChange={(e) => setPresetName(e.target.value)} />
              <Button onClick={() => void savePreset(presetName, false)} disabled={!presetName.trim()}>
                Save as preset
              </Button>
              <Button onClick={() => void check()} disabled={checking}>
                {checking ? "Checking…" : "Check the rows again"}
              </Button>
              {presetSaved ? <span className="muted" role="status">{presetSaved}</span> : null}
            </div>
          </section>

          <section className="panel" aria-labelledby="import-step-3">
            <div className="panel__title">
              <h2 id="import-step-3">3 · Preview</h2>
              <span className="muted" role="status">
                {formatNumber(preview.rowCount, 0)} rows · {formatNumber(preview.errorRows, 0)} with errors · {formatNumber(preview.problemCount - rowErrors.length, 0)} warnings
              </span>
            </div>
            {preview.sources.length ? (
              <p className="muted">
                Sources from the DOI column: {preview.sources.filter((s) => s.sourceId !== null).length} in the collection, {preview.sources.filter((s) => s.sourceId === null).length} to be created.
              </p>
            ) : null}
            <div className="table-wrap import-flow__sample">
              <table className="table">
                <thead>
                  <tr>
                    <th scope="col" className="num">Row</th>
                    {quantityColumns.map((c) => (
                      <th key={c.index} scope="col" className="num">
                        {importFieldLabel(c.field!)} ({CANONICAL_UNIT[quantityOfField(c.field!)!]})
                      </th>
                    ))}
                    <th scope="col">Outcome</th>
                    <th scope="col">Source</th>
                    <th scope="col">Problems</th>
                  </tr>
                </thead>
                <tbody>
                  {preview.sample.map((s) => (
                    <tr key={s.row} className={s.problems.some((p) => p.severity === "error") ? "import-flow__row--error" : undefined}>
                      <td className="num">{s.row}</td>
                      {quantityColumns.map((c) => (
                        <td key={c.index} className="num">
                          {s.values[c.field!] === null || s.values[c.field!] === undefined ? <span className="muted">{s.cells[c.index] || "—"}</span> : formatNumber(s.values[c.field!]!, 4)}
                        </td>
                      ))}
                      <td>{isOutcome(s.outcome) ? outcomeLabel(s.outcome) : s.outcome}</td>
                      <td className="muted">{s.sourceLabel ?? "—"}</td>
                      <td>{s.problems.map((p) => `${p.severity === "error" ? "✖" : "⚠"} ${p.field}: ${p.message}`).join(" ")}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
            {preview.problems.length ? (
              <details className="import-flow__problems" open={rowErrors.length > 0}>
                <summary>
                  Every problem by row and field ({formatNumber(preview.problemCount, 0)}
                  {preview.problemCount > preview.problems.length ? `, the first ${formatNumber(preview.problems.length, 0)} shown` : ""})
                </summary>
                <div className="table-wrap">
                  <table className="table">
                    <thead>
                      <tr>
                        <th scope="col" className="num">Row</th>
                        <th scope="col">Field</th>
                        <th scope="col">Kind</th>
                        <th scope="col">Message</th>
                      </tr>
                    </thead>
                    <tbody>
                      {preview.problems.map((p, i) => (
                        <tr key={i}>
                          <td className="num">{p.row}</td>
                          <td className="mono">{p.field}</td>
                          <td>{p.severity === "error" ? "error" : "warning"}</td>
                          <td>{p.message}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              </details>
            ) : null}
          </section>

          {mappingErrors.length ? null : (
          <section className="panel" aria-labelledby="import-step-4">
            <div className="panel__title">
              <h2 id="import-step-4">4 · Import</h2>
            </div>
            {preview.errorRows > 0 ? (
              <Checkbox
                label={`Leave out the ${formatNumber(preview.errorRows, 0)} row(s) with errors and import the other ${formatNumber(importable, 0)}`}
                name="excludeErrors"
                checked={excludeErrors}
                onChange={(e) => setExcludeErrors(e.target.checked)}
              />
            ) : null}
            <p className="muted">Every row is written, or none: a failure or a cancel leaves nothing behind.</p>
            <div className="form-actions">
              <Button variant="primary" onClick={() => void commit()} disabled={!canCommit}>
                Import {formatNumber(preview.errorRows > 0 && excludeErrors ? importable : preview.rowCount, 0)} rows
              </Button>
              {job && job.state === "running" ? (
                <Button variant="danger" onClick={() => void cancel()}>
                  Cancel
                </Button>
              ) : null}
            </div>
            {job && job.state === "running" ? (
              job.progress.phase === "checking" ? (
                <ProgressBar label="Written; checking the new records for implausible values and duplicates" value={null} detail={`${formatNumber(job.progress.rowsWritten, 0)} records`} />
              ) : (
                <ProgressBar label="Importing" value={job.progress.rowsRead} max={preview.rowCount} detail={`${formatNumber(job.progress.rowsRead, 0)} read · ${formatNumber(job.progress.rowsWritten, 0)} written`} />
              )
            ) : null}
            {job?.result ? (
              job.result.ok ? (
                job.result.data.status === "committed" ? (
                  <div className="alert alert--info" role="status">
                    <p className="alert__title">Imported {formatNumber(job.result.data.imported, 0)} records</p>
                    <p>
                      Import run {job.result.data.importRunId}
                      {job.result.data.excluded ? `; ${formatNumber(job.result.data.excluded, 0)} rows with errors left out` : ""}
                      {job.result.data.createdSources.length ? `; ${job.result.data.createdSources.length} source(s) created from DOIs — complete their titles` : ""}
                      {job.result.data.checks ? `; the checks raised ${formatNumber(job.result.data.checks.opened, 0)} flag(s) for review` : ""}. <Link href="/records">See the records</Link>
                    </p>
                  </div>
                ) : (
                  <div className="alert alert--warning" role="status">
                    <p className="alert__title">Import cancelled</p>
                    <p>Nothing was written.</p>
                  </div>
                )
              ) : (
                <div className="alert alert--error" role="alert">
                  <p className="alert__title">Nothing was imported</p>
                  <p>{job.result.error.message}</p>
                </div>
              )
            ) : null}
          </section>
          )}
        </>
      ) : null}
    </div>
  );
}
