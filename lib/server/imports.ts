import { createReadStream, openSync, readSync, closeSync } from "node:fs";
import { parse as csvParse } from "csv-parse";
import readExcelFile from "read-excel-file/node";
import { z } from "zod";
import { appendAuditEvent } from "../db/audit";
import { finishImportRun, getMappingPreset, insertImportRun, insertPlaceholderSource, listImportRuns, listMappingPresets, saveMappingPreset, sourceExists, sourceIdByUrl, sourceIdsByDoi, type ImportRunRow, type MappingPresetRow } from "../db/imports";
import { sql, type SqlExecutor } from "../db/sql";
import { hasMappingErrors, IMPORT_FIELDS, resolveMapping, type ImportMapping, type MappingIssue, type ResolvedMapping } from "../domain/column-mapping";
import { csvParseOptions, describeCsvError, sniffDelimiter, type CsvDelimiter } from "../domain/csv";
import { normalizeDoi, titleKey } from "../domain/doi";
import { mapImportRow, type RowProblem, type RowRecordInput } from "../domain/import-row";
import { normalizeBox, type PdfBox } from "../domain/pdf-table";
import { looksLikeHeader, splitTableText, type PasteSplitter } from "../domain/table-text";
import { requireRole, type Actor } from "./actor";
import { checksAfterSave, qualityScorerFor } from "./checks";
import { prepareBulkRow, writePreparedRows, type PreparedBulkRow } from "./records-bulk";
import { fail, guard, nulRefusal, ok, type Result } from "./result";
import { isRowId, rowIdSchema } from "../schemas/ids";
import { NUL_MESSAGE } from "../schemas/plain-input";

// ---------------------------------------------------------------------------------------------
// Where the rows come from

export type TableInput =
  | { kind: "csv"; path: string; fileName: string; fileSha256?: string | null; delimiter?: CsvDelimiter }
  | { kind: "xlsx"; path: string; fileName: string; fileSha256?: string | null; sheet?: string | null }
  | { kind: "paste"; text: string; splitter?: PasteSplitter; fileName?: string }
  | { kind: "pdf_table"; rows: string[][]; fileName: string; fileSha256?: string | null; page: number; box: PdfBox; label?: string | null };

export interface TableHead {
  headers: string[];
  /** Sheets of a workbook (the chosen one first is not implied; see `sheet`). */
  sheets: string[];
  sheet: string | null;
  /** Detected CSV delimiter or paste splitter, for display. */
  delimiter: string | null;
}

class TableError extends Error {
  constructor(
    message: string,
    readonly field = "file",
    readonly row: number | null = null,
  ) {
    super(message);
  }
}

function cellText(v: unknown): string {
  if (v === null || v === undefined) return "";
  if (v instanceof Date) return Number.isNaN(v.getTime()) ? "" : v.toISOString().slice(0, 10);
  if (typeof v === "boolean") return v ? "TRUE" : "FALSE";
  return String(v).trim();
}

function readHead(filePath: string, bytes = 65_536): string {
  const fd = openSync(filePath, "r");
  try {
    const buf = Buffer.alloc(bytes);
    const n = readSync(fd, buf, 0, bytes, 0);
    return buf.subarray(0, n).toString("utf8");
  } finally {
    closeSync(fd);
  }
}

/**
 * Opens a table: its header, and the data rows as an async stream (CSV is streamed from disk;
 * a workbook sheet is read whole by the XLSX reader; pasted text is already in memory).
 */
async function openTable(input: TableInput): Promise<{ head: TableHead; rows: AsyncIterable<string[]>; close: () => void }> {
  if (input.kind === "csv") {
    const sample = readHead(input.path);
    if (sample.replace(/^\uFEFF/, "").trim() === "") throw new TableError(`"${input.fileName}" is empty: there is no header and no row.`);
    const delimiter = input.delimiter ?? sniffDelimiter(sample);
    const parser = createReadStream(input.path).pipe(csvParse(csvParseOptions(delimiter)));
    const iterator = parser[Symbol.asyncIterator]() as AsyncIterator<string[]>;
    let first: IteratorResult<string[]>;
    try {
      first = await iterator.next();
    } catch (error) {
      parser.destroy();
      const e = describeCsvError(error);
      throw new TableError(e.message, "file", e.line);
    }
    if (first.done) {
      parser.destroy();
      throw new TableError(`"${input.fileName}" is empty: there is no header and no row.`);
    }
    const headers = first.value.map(cellText);
    async function* rest(): AsyncGenerator<string[]> {
      try {
        for (;;) {
          const n = await iterator.next();
          if (n.done) return;
          yield n.value;
        }
      } catch (error) {
        const e = describeCsvError(error);
        throw new TableError(e.message, "file", e.line);
      }
    }
    return { head: { headers, sheets: [], sheet: null, delimiter }, rows: rest(), close: () => parser.destroy() };
  }
  if (input.kind === "xlsx") {
    let sheets: { sheet: string; data: unknown[][] }[];
    try {
      sheets = (await readExcelFile(input.path)) as { sheet: string; data: unknown[][] }[];
    } catch (error) {
      throw new TableError(`"${input.fileName}" cannot be read as an XLSX workbook (${(error as Error).message.split("\n")[0]}).`);
    }
    const names = sheets.map((s) => s.sheet);
    const chosen = input.sheet ? sheets.find((s) => s.sheet === input.sheet) : sheets[0];
    if (!chosen) throw new TableError(input.sheet ? `The workbook has no sheet named "${input.sheet}"; its sheets are ${names.map((n) => `"${n}"`).join(", ")}.` : "The workbook has no sheets.", "sheet");
    const data = chosen.data.map((r) => r.map(cellText));
    const firstIndex = data.findIndex((r) => r.some((c) => c !== ""));
    if (firstIndex < 0) throw new TableError(`Sheet "${chosen.sheet}" is empty.`, "sheet");
    const headers = data[firstIndex]!;
    async function* rows(): AsyncGenerator<string[]> {
      for (let i = firstIndex + 1; i < data.length; i++) yield data[i]!;
    }
    return { head: { headers, sheets: names, sheet: chosen.sheet, delimiter: null }, rows: rows(), close: () => undefined };
  }
  const table = input.kind === "paste" ? splitTableText(input.text, input.splitter ?? "auto") : { rows: input.rows.map((r) => r.map(cellText)), splitter: null };
  if (!table.rows.length) throw new TableError(input.kind === "paste" ? "Nothing was pasted: the text has no rows." : "The box holds no rows.");
  const [headers, ...data] = table.rows;
  async function* rows(): AsyncGenerator<string[]> {
    for (const r of data) yield r;
  }
  return { head: { headers: headers!, sheets: [], sheet: null, delimiter: table.splitter }, rows: rows(), close: () => undefined };
}

function checkHeader(head: TableHead, sample: readonly string[][]): void {
  const named = head.headers.filter((h) => h !== "").length;
  const where = head.sheet ? `Sheet "${head.sheet}"` : "The table";
  if (named === 0) throw new TableError(`${where} has no header: its first row is empty.`, "header", 0);
  if (!looksLikeHeader([head.headers, ...sample])) {
    throw new TableError(`${where} has no header: its first row holds values (${head.headers.slice(0, 3).join(", ")}…), not column names. Add a row of column names such as "Laser power (W)".`, "header", 0);
  }
}

// ---------------------------------------------------------------------------------------------
// Options

const mappingSchema = z.object({
  columns: z.record(z.string(), z.object({ field: z.string().nullable(), unit: z.string().nullish() }).nullable()),
  defaults: z
    .object({ alloy: z.string().nullish(), machine: z.string().nullish(), atmosphere: z.string().nullish(), outcome: z.string().nullish(), locationLabel: z.string().nullish() })
    .optional(),
});

/** Reads a mapping from JSON (a --mapping file, a preset, a form). */
export function parseMappingJson(value: unknown): Result<ImportMapping> {
  const parsed = mappingSchema.safeParse(value);
  if (!parsed.success) return fail("invalid_input", `The mapping is not in the expected form: ${parsed.error.issues.map((i) => `${i.path.join(".") || "mapping"}: ${i.message}`).join("; ")}.`);
  // field names are checked against the record's fields when the mapping is resolved
  return ok(parsed.data as ImportMapping);
}

export interface ImportOptions {
  /** null: guess from the headers. */
  mapping: ImportMapping | null;
  /** The source for rows without a DOI column (or with an empty DOI cell). */
  sourceId?: number | null;
  /** As sourceId, by DOI; a DOI not yet in the collection creates a source. */
  sourceDoi?: string | null;
  /** Leave out rows with errors instead of refusing the import. */
  excludeErrors?: boolean;
  dryRun?: boolean;
  signal?: AbortSignal;
  onProgress?: (p: ImportProgress) => void;
  /** How many mapped rows the preview returns. */
  sampleSize?: number;
  /** Leave the plausibility and duplicate checks to a later batch run instead of running them after the commit. */
  deferChecks?: boolean;
  now?: () => Date;
}

export interface ImportProgress {
  /**
   * "reading": rows are read and validated, nothing is written yet; "writing": the rows that passed
   * are written in one transaction; "checking": the committed records go through the plausibility
   * and duplicate checks; "done".
   */
  phase: "reading" | "writing" | "checking" | "done";
  rowsRead: number;
  rowsWritten: number;
  /** Rows written in the end, once known. */
  rowsTotal: number | null;
}

export interface PreviewRow {
  row: number;
  cells: string[];
  /** Canonical values of the quantity fields that parsed. */
  values: Record<string, number | null>;
  outcome: string;
  sourceLabel: string | null;
  problems: RowProblem[];
}

export interface ImportSourceUse {
  /** "doi:<doi>" or "url:<address>". */
  key: string;
  doi: string | null;
  url: string | null;
  /** The source in the collection, or null when the import will create it. */
  sourceId: number | null;
  rows: number;
}

export interface ImportAnalysis {
  head: TableHead;
  mapping: ResolvedMapping;
  /** Data rows read (blank rows not counted). */
  rowCount: number;
  blankRows: number;
  /** Every problem by row and field; errors and warnings. */
  problems: RowProblem[];
  errorRows: number;
  sample: PreviewRow[];
  sources: ImportSourceUse[];
}

export interface ImportCommit {
  status: "committed" | "dry_run" | "cancelled";
  importRunId: number | null;
  imported: number;
  /** Rows left out because they had errors (only with excludeErrors). */
  excluded: number;
  errors: { row: number; field: string; message: string }[];
  warnings: { row: number; field: string; message: string }[];
  records: { row: number; id: number }[];
  createdSources: { doi: string | null; url: string | null; id: number }[];
  unmapped: string[];
  mappingIssues: MappingIssue[];
  /** The checks run on the imported records after the commit (null when deferred, nothing was written, or they failed). */
  checks: { opened: number; openByCode: Record<string, number>; ms: number } | null;
}

/** Stands in for a source the preview has not created (a DOI not yet in the collection). */
const PENDING_SOURCE = 2_147_483_647;
const PROGRESS_EVERY = 2000;
const WRITE_CHUNK = 1000;

const yieldToLoop = () => new Promise<void>((resolve) => setImmediate(resolve));

function cancelled(signal: AbortSignal | undefined): boolean {
  return signal?.aborted === true;
}

/** The rows an import will write, gathered while the table is read (only when it commits). */
interface Collected {
  /** Every row that passed its checks, in table order. */
  rows: PreparedBulkRow[];
  /** The rows whose source the collection did not hold when the table was read, by source key ("doi:…", "url:…"). */
  bySourceKey: Map<string, PreparedBulkRow[]>;
}

interface Analysed {
  analysis: ImportAnalysis;
  /** Rows that passed every check. */
  validRows: number;
  /** The rows to write; null for a preview or a dry run, or once a row with errors stops the import. */
  collected: Collected | null;
}

const FIELD_KEY: Record<string, string> = {
  laserPower: "laserPowerW", scanSpeed: "scanSpeedMmPerS", hatchSpacing: "hatchSpacingUm", layerThickness: "layerThicknessUm", spotDiameter: "spotDiameterUm",
  preheat: "preheatC", powderD10: "powderD10Um", powderD50: "powderD50Um", powderD90: "powderD90Um", relativeDensity: "relativeDensityPct",
};

/**
 * Reads the table row by row: maps and checks each row and, when `collect` is set, keeps the
 * rows that passed for the write that follows. Every problem is collected; without
 * excludeErrors, the first row with an error drops what was kept (nothing will be written) while
 * checking goes on, so the user sees every problem at once. Writes nothing.
 */
async function analyse(input: TableInput, options: ImportOptions, db: SqlExecutor, collect: boolean): Promise<Result<Analysed> | "cancelled"> {
  let table: Awaited<ReturnType<typeof openTable>>;
  try {
    table = await openTable(input);
  } catch (error) {
    if (error instanceof TableError) return fail("invalid_input", error.message, { rowErrors: [{ row: error.row ?? 0, field: error.field, message: error.message }] });
    throw error;
  }
  const { head } = table;

  // default source
  let defaultSource: { id: number | null; doi: string | null } = { id: null, doi: null };
  if (options.sourceId != null) {
    if (!(await sourceExists(db, options.sourceId))) {
      table.close();
      return fail("invalid_input", `Source ${options.sourceId} does not exist; nothing was read.`, { fieldErrors: { sourceId: [`Source ${options.sourceId} does not exist.`] } });
    }
    defaultSource = { id: options.sourceId, doi: null };
  } else if (options.sourceDoi) {
    const doi = normalizeDoi(options.sourceDoi);
    if (!doi) {
      table.close();
      return fail("invalid_input", `"${options.sourceDoi}" is not a DOI (it should look like 10.5555/abc).`, { fieldErrors: { sourceDoi: ["Not a DOI."] } });
    }
    defaultSource = { id: (await sourceIdsByDoi(db, [doi])).get(doi) ?? null, doi };
  }

  const mapping = resolveMapping(head.headers, options.mapping, { requireSource: defaultSource.id === null && defaultSource.doi === null });
  const problems: RowProblem[] = [];
  const sample: PreviewRow[] = [];
  const sampleSize = options.sampleSize ?? 50;
  const sources = new Map<string, ImportSourceUse>();
  const errorRows = new Set<number>();
  let rowCount = 0;
  let blankRows = 0;
  let validRows = 0;
  let row = 0;
  let headerChecked = false;
  let collected: Collected | null = collect ? { rows: [], bySourceKey: new Map() } : null;
  const firstRows: string[][] = [];
  const location = input.kind === "pdf_table" ? pdfLocation(input) : null;

  const lookUpSource = async (key: string): Promise<ImportSourceUse> => {
    const doi = key.startsWith("doi:") ? key.slice(4) : null;
    const url = key.startsWith("url:") ? key.slice(4) : null;
    const use: ImportSourceUse = { key, doi, url, sourceId: doi ? ((await sourceIdsByDoi(db, [doi])).get(doi) ?? null) : await sourceIdByUrl(db, url!), rows: 0 };
    sources.set(key, use);
    return use;
  };

  const handle = async (cells: string[]) => {
    row++;
    const mapped = mapImportRow(cells, mapping.columns, mapping.defaults, row);
    if (mapped.blank) {
      blankRows++;
      return;
    }
    rowCount++;
    const rowProblems = mapped.problems;
    const cellKey = mapped.doi ? `doi:${mapped.doi}` : mapped.sourceUrl ? `url:${mapped.sourceUrl}` : defaultSource.id === null && defaultSource.doi ? `doi:${defaultSource.doi}` : null;
    // a NUL character cannot be looked up on PostgreSQL (nor stored): a row error on both engines
    const key = cellKey?.includes("\u0000") ? null : cellKey;
    if (cellKey !== key) rowProblems.push({ row, field: mapped.doi ? "doi" : "sourceUrl", severity: "error", message: NUL_MESSAGE });
    let sourceId: number | null = key ? null : defaultSource.id;
    let pendingLabel: string | null = null;
    if (key) {
      // a database look-up only for a source key not seen before in this table
      const use = sources.get(key) ?? (await lookUpSource(key));
      use.rows++;
      sourceId = use.sourceId;
      if (sourceId === null) pendingLabel = use.doi ?? use.url;
    }
    if (sourceId === null && pendingLabel === null && !rowProblems.some((p) => p.field === "doi")) {
      rowProblems.push({ row, field: "doi", severity: "error", message: "No source for this row: its DOI cell is empty and no source was chosen for the import." });
    }
    // The mapped input is this row's own: completed in place (a spread copy per row costs more).
    const recordInput = mapped.input as Omit<RowRecordInput, "locationPage"> & { sourceId?: number; locationPage: string | number | null };
    recordInput.sourceId = sourceId ?? PENDING_SOURCE;
    if (location) {
      recordInput.locationPage = location.page;
      recordInput.locationLabel = location.label;
    }
    const checked = prepareBulkRow(recordInput, row);
    if (!checked.ok) for (const e of checked.errors) rowProblems.push({ row, field: e.field, severity: "error", message: e.message });
    const rowHasError = rowProblems.some((p) => p.severity === "error");
    if (rowHasError) {
      errorRows.add(row);
      // nothing will be written: the rows kept so far can go
      if (!options.excludeErrors) collected = null;
    } else if (checked.ok && (sourceId !== null || pendingLabel !== null)) {
      validRows++;
      if (collected) {
        collected.rows.push(checked.prepared);
        if (sourceId === null && key) {
          const waiting = collected.bySourceKey.get(key);
          if (waiting) waiting.push(checked.prepared);
          else collected.bySourceKey.set(key, [checked.prepared]);
        }
      }
    }
    if (rowProblems.length) problems.push(...rowProblems);
    if (sample.length < sampleSize) {
      const values: Record<string, number | null> = {};
      if (checked.ok) for (const [f, k] of Object.entries(FIELD_KEY)) values[f] = (checked.prepared.write as unknown as Record<string, number | null>)[k] ?? null;
      sample.push({
        row,
        cells,
        values,
        outcome: mapped.input.outcome,
        sourceLabel: sourceId !== null ? `source ${sourceId}` : pendingLabel ? `new source (${pendingLabel})` : null,
        problems: rowProblems,
      });
    }
  };

  const sampleOnly = (cells: string[]) => {
    row++;
    if (sample.length < sampleSize) sample.push({ row, cells, values: {}, outcome: "unknown", sourceLabel: null, problems: [] });
  };
  const handleFirstRows = async () => {
    for (const c of firstRows) {
      if (hasMappingErrors(mapping.issues)) sampleOnly(c);
      else await handle(c);
    }
  };

  try {
    for await (const raw of table.rows) {
      const cells = raw.map(cellText);
      if (!headerChecked) {
        firstRows.push(cells);
        if (firstRows.length < 5) continue;
        checkHeader(head, firstRows);
        headerChecked = true;
        await handleFirstRows();
        continue;
      }
      if (hasMappingErrors(mapping.issues)) {
        // rows cannot be checked against a broken mapping; a few are kept to show what the columns hold
        if (sample.length >= sampleSize) break;
        sampleOnly(cells);
        continue;
      }
      await handle(cells);
      if (row % PROGRESS_EVERY === 0) {
        options.onProgress?.({ phase: "reading", rowsRead: row, rowsWritten: 0, rowsTotal: null });
        await yieldToLoop();
        if (cancelled(options.signal)) return "cancelled";
      }
    }
    if (!headerChecked) {
      if (!firstRows.length && head.headers.every((h) => h === "")) throw new TableError("The table is empty.", "file", 0);
      checkHeader(head, firstRows);
      await handleFirstRows();
    }
  } catch (error) {
    if (error instanceof TableError) return fail("invalid_input", error.message, { rowErrors: [{ row: error.row ?? row + 1, field: error.field, message: error.message }] });
    throw error;
  } finally {
    table.close();
  }
  if (rowCount === 0 && !hasMappingErrors(mapping.issues)) {
    return fail("invalid_input", `${head.sheet ? `Sheet "${head.sheet}"` : "The table"} has a header but no data rows.`, { rowErrors: [{ row: 1, field: "file", message: "No data rows below the header." }] });
  }
  return ok({
    analysis: { head, mapping, rowCount, blankRows, problems, errorRows: errorRows.size, sample, sources: [...sources.values()] },
    validRows,
    collected,
  });
}

function pdfLocation(input: Extract<TableInput, { kind: "pdf_table" }>): { page: number; label: string } {
  const b = normalizeBox(input.box);
  const r = (v: number) => Math.round(v);
  const box = `box ${r(b.x)},${r(b.y)} ${r(b.width)}×${r(b.height)} pt`;
  const label = input.label?.trim() ? `${input.label.trim().slice(0, 60)} · ${box}` : box;
  return { page: input.page, label };
}

const toRowError = (p: RowProblem) => ({ row: p.row, field: p.field, message: p.message });

/**
 * Reads a whole table with a mapping and checks every row, writing nothing: the mapping as
 * resolved (with its issues and unmapped columns), every problem by row and field, a sample of
 * rows with their canonical values, and the sources the DOI column names.
 */
export async function previewImport(input: TableInput, options: ImportOptions): Promise<Result<ImportAnalysis>> {
  return guard(async () => {
    const r = await analyse(input, options, sql(), false);
    if (r === "cancelled") return fail("invalid_input", "The preview was cancelled.");
    if (!r.ok) return r;
    return ok(r.data.analysis);
  });
}

const iso = (d: Date) => d.toISOString().replace("Z", "+00:00");

/** Thrown inside the writing transaction when the import is cancelled: it rolls everything back. */
class ImportCancelled extends Error {
  constructor() {
    super("The import was cancelled.");
  }
}

interface ImportWrite {
  fileName: string;
  fileSha256: string | null;
  format: TableInput["kind"];
  analysis: ImportAnalysis;
  collected: Collected;
  excludedRows: number[];
  mapping: unknown;
  sourceId: number | null;
  actor: Actor;
  at: Date;
  options: ImportOptions;
}

interface ImportWritten {
  runId: number;
  ids: { row: number; id: number }[];
  createdSources: { doi: string | null; url: string | null; id: number }[];
}

/**
 * Everything an import writes, in the transaction `tx`: the run, the sources the table names that
 * are not in the collection, the records, and one audit event. Only database work: on PostgreSQL
 * this runs again after a serialization failure, so it keeps nothing from an earlier attempt (the
 * prepared rows are completed afresh each time).
 */
async function writeImport(tx: SqlExecutor, w: ImportWrite): Promise<ImportWritten> {
  const { actor, analysis, collected, options } = w;
  const atText = iso(w.at);
  const runId = await insertImportRun(tx, {
    fileName: w.fileName, fileSha256: w.fileSha256, format: w.format, sheet: analysis.head.sheet, mapping: w.mapping, sourceId: w.sourceId,
    rowCount: analysis.rowCount, importedCount: 0, excludedCount: 0, status: "committed", createdById: actor.id, at: w.at,
  });

  // Sources the collection did not hold when the table was read: another writer may have added
  // one since, else it is created here, known only by its DOI or address.
  const createdSources: ImportWritten["createdSources"] = [];
  const keys = [...collected.bySourceKey.keys()];
  const byDoi = await sourceIdsByDoi(tx, keys.filter((k) => k.startsWith("doi:")).map((k) => k.slice(4)));
  const sourceIds = new Set<number>();
  for (const key of keys) {
    const doi = key.startsWith("doi:") ? key.slice(4) : null;
    const url = key.startsWith("url:") ? key.slice(4) : null;
    let id = doi ? (byDoi.get(doi) ?? null) : await sourceIdByUrl(tx, url!);
    if (id === null) {
      const title = doi ? `Source with DOI ${doi}` : `Source at ${url}`.slice(0, 500);
      id = await insertPlaceholderSource(
        tx,
        { kind: "journal_article", title, titleKey: titleKey(title), doi, url, notes: `Created by importing ${w.fileName} (import run ${runId}), known only by its ${doi ? "DOI" : "web address"}: complete the title, authors, year and kind.` },
        actor.id,
        w.at,
      );
      await appendAuditEvent(tx, { actorId: actor.id, actorName: actor.name, action: "create", entityType: "source", entityId: id, after: { doi, url, title, createdBy: `import run ${runId}` }, at: atText });
      createdSources.push({ doi, url, id });
    }
    for (const p of collected.bySourceKey.get(key)!) p.write.sourceId = id;
  }
  for (const p of collected.rows) sourceIds.add(p.write.sourceId);

  const quality = await qualityScorerFor(tx, sourceIds);
  const writeOptions = { importFile: w.fileName, importRunId: runId, materials: new Map<string, number>(), quality };
  const stamp = { actorId: actor.id, at: w.at };
  const ids: ImportWritten["ids"] = [];
  const total = collected.rows.length;
  for (let start = 0; start < total; start += WRITE_CHUNK) {
    const chunk = collected.rows.slice(start, start + WRITE_CHUNK);
    const chunkIds = await writePreparedRows(tx, chunk, stamp, writeOptions);
    for (let i = 0; i < chunk.length; i++) ids.push({ row: chunk[i]!.row, id: chunkIds[i]! });
    options.onProgress?.({ phase: "writing", rowsRead: analysis.rowCount, rowsWritten: ids.length, rowsTotal: total });
    // No turn of the event loop is given here on purpose. On PostgreSQL every statement already
    // waits on the server, and a cancel arrives meanwhile. On SQLite this transaction holds the
    // write lock: a request served now that saves through Prisma (a connection of its own, driven
    // synchronously) would wait on that lock with the event loop blocked, so this transaction could
    // not go on until the other's busy timeout gave up.
    if (cancelled(options.signal)) throw new ImportCancelled();
  }

  const imported = ids.length;
  await finishImportRun(tx, runId, { rowCount: analysis.rowCount, importedCount: imported, excludedCount: analysis.errorRows });
  await appendAuditEvent(tx, {
    actorId: actor.id, actorName: actor.name, action: "import", entityType: "import_run", entityId: runId,
    after: { fileName: w.fileName, format: w.format, sheet: analysis.head.sheet, imported, excludedRows: w.excludedRows, firstId: ids[0]?.id ?? null, lastId: ids[imported - 1]?.id ?? null, createdSources: createdSources.map((s) => s.id) },
    at: atText,
  });
  if (cancelled(options.signal)) throw new ImportCancelled();
  return { runId, ids, createdSources };
}

/**
 * Imports a table: reads and checks every row first (writing nothing), then writes the run, the
 * sources the DOI column names that are not yet in the collection, the records and one audit
 * event in one transaction. A row with errors stops the import before anything is written
 * unless `excludeErrors` is set; every problem is still listed. Progress is reported as rows are
 * read and as they are written; an aborted `signal` stops the reading or rolls the writing back,
 * so a cancelled import leaves no records, only a cancelled run. A dry run checks everything and
 * writes nothing.
 */
export async function commitImport(input: TableInput, options: ImportOptions, actor: Actor): Promise<Result<ImportCommit>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const now = options.now ?? (() => new Date());
    const fileName = input.fileName ?? (input.kind === "paste" ? "pasted table" : "table");
    const fileSha256 = "fileSha256" in input ? (input.fileSha256 ?? null) : null;
    const at = now();
    const db = sql();
    const cancelledResult = async (): Promise<Result<ImportCommit>> => {
      const id = await insertImportRun(db, {
        fileName, fileSha256, format: input.kind, sheet: input.kind === "xlsx" ? (input.sheet ?? null) : null, mapping: options.mapping ?? {},
        sourceId: options.sourceId ?? null, rowCount: 0, importedCount: 0, excludedCount: 0, status: "cancelled", createdById: actor.id, at,
      });
      options.onProgress?.({ phase: "done", rowsRead: 0, rowsWritten: 0, rowsTotal: 0 });
      return ok({ status: "cancelled", importRunId: id, imported: 0, excluded: 0, errors: [], warnings: [], records: [], createdSources: [], unmapped: [], mappingIssues: [], checks: null });
    };

    const analysed = await analyse(input, options, db, !options.dryRun);
    if (analysed === "cancelled") return cancelledResult();
    if (!analysed.ok) return analysed;
    const { analysis, validRows, collected } = analysed.data;
    const errors = analysis.problems.filter((p) => p.severity === "error").map(toRowError);
    const warnings = analysis.problems.filter((p) => p.severity === "warning").map(toRowError);
    const base = { errors, warnings, unmapped: analysis.mapping.unmapped, mappingIssues: analysis.mapping.issues };

    if (hasMappingErrors(analysis.mapping.issues)) {
      const mappingErrors = analysis.mapping.issues.filter((i) => i.severity === "error");
      return fail("invalid_input", `The column mapping needs attention; nothing was written. ${mappingErrors.map((i) => i.message).join(" ")}`, {
        rowErrors: mappingErrors.map((i) => ({ row: 0, field: i.field, message: i.message })),
        mappingIssues: analysis.mapping.issues,
        unmapped: analysis.mapping.unmapped,
      });
    }
    if (errors.length && !options.excludeErrors) {
      return fail("invalid_input", `${analysis.errorRows} of ${analysis.rowCount} rows have problems; nothing was written. Fix them, or choose to leave those rows out.`, { rowErrors: errors, ...base, rowCount: analysis.rowCount });
    }
    if (options.dryRun || !collected) {
      return ok({ status: "dry_run", importRunId: null, imported: validRows, excluded: analysis.errorRows, ...base, records: [], createdSources: [], checks: null });
    }

    options.onProgress?.({ phase: "writing", rowsRead: analysis.rowCount, rowsWritten: 0, rowsTotal: collected.rows.length });
    let written: ImportWritten;
    try {
      written = await db.transaction((tx) =>
        writeImport(tx, {
          fileName, fileSha256, format: input.kind, analysis, collected, excludedRows: [...new Set(errors.map((e) => e.row))], mapping: analysis.mapping.mapping,
          sourceId: options.sourceId ?? null, actor, at, options,
        }),
      );
    } catch (error) {
      if (error instanceof ImportCancelled) return cancelledResult();
      throw error;
    }
    // The written rows can go before the checks load the records they need (peak memory).
    collected.rows.length = 0;
    collected.bySourceKey.clear();
    const imported = written.ids.length;
    let checks: ImportCommit["checks"] = null;
    if (!options.deferChecks && imported > 0) {
      options.onProgress?.({ phase: "checking", rowsRead: analysis.rowCount, rowsWritten: imported, rowsTotal: imported });
      await yieldToLoop();
      // the records are committed; a failure here is logged and left to `meltledger check`
      const summary = await checksAfterSave(written.ids.map((r) => r.id));
      if (summary) checks = { opened: summary.opened + summary.reopened, openByCode: summary.openByCode, ms: summary.ms };
    }
    options.onProgress?.({ phase: "done", rowsRead: analysis.rowCount, rowsWritten: imported, rowsTotal: imported });
    return ok({ status: "committed", importRunId: written.runId, imported, excluded: analysis.errorRows, ...base, records: written.ids, createdSources: written.createdSources, checks });
  });
}

// ---------------------------------------------------------------------------------------------
// Presets and history

const presetInput = z.object({
  name: z.string().trim().min(1, { message: "Name the preset." }).max(100),
  sourceId: rowIdSchema.nullable().default(null),
});

/** Saves a mapping as a named preset (sourceId null) or as the mapping of a source. */
export async function saveImportPreset(input: { name: string; sourceId?: number | null; mapping: unknown }, actor: Actor): Promise<Result<MappingPresetRow>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const meta = presetInput.safeParse(input);
    if (!meta.success) return fail("invalid_input", meta.error.issues[0]?.message ?? "Name the preset.");
    const mapping = parseMappingJson(input.mapping);
    if (!mapping.ok) return mapping;
    for (const rule of Object.values(mapping.data.columns)) {
      if (rule?.field && !(IMPORT_FIELDS as readonly string[]).includes(rule.field)) return fail("invalid_input", `"${rule.field}" is not a field of a build record.`);
    }
    if (meta.data.sourceId !== null && !(await sourceExists(sql(), meta.data.sourceId))) return fail("not_found", `Source ${meta.data.sourceId} does not exist.`);
    return ok(await saveMappingPreset(meta.data.name, meta.data.sourceId, mapping.data));
  });
}

export async function listImportPresets(sourceId: number | null): Promise<Result<MappingPresetRow[]>> {
  // an id no source can have lists the named presets only, as for a source that does not exist
  return guard(async () => ok(await listMappingPresets(sourceId !== null && isRowId(sourceId) ? sourceId : null)));
}

export async function getImportPreset(id: number): Promise<Result<MappingPresetRow>> {
  return guard(async () => {
    const p = isRowId(id) ? await getMappingPreset(id) : null;
    return p ? ok(p) : fail("not_found", `Preset ${id} does not exist.`);
  });
}

export async function listRecentImports(limit = 20): Promise<Result<ImportRunRow[]>> {
  return guard(async () => ok(await listImportRuns(limit)));
}
