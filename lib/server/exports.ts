/**
 * Use cases of the training-set export: preview the counts, build and save an export run (files
 * in a folder per run under the data folder, an ExportRun row with its options, seed, counts and
 * file hashes, an audit event), run a saved export again, list runs and open their files.
 */
import { createHash } from "node:crypto";
import { existsSync, mkdirSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import { writeFile } from "node:fs/promises";
import path from "node:path";
import packageJson from "../../package.json";
import { appendAuditEvent } from "../db/audit";
import { countExportCandidates, countRecords, exportRunNamesLike, getExportRun, insertExportRun, listExportRuns, loadExportRecords, loadExportSources, type ExportRunRow } from "../db/exports";
import { resolveDatabaseTarget } from "../db/location";
import { sql, type SqlExecutor } from "../db/sql";
import { buildTrainingSet, type BuiltExport } from "../domain/export/build";
import { exportFilesWith } from "../domain/export/files";
import { allowedStatuses } from "../domain/export/filters";
import type { ExportFileEntry } from "../domain/export/manifest";
import type { ExportOptions } from "../domain/export/types";
import { EXPORT_FILE_PATTERN, EXPORT_NAME_PATTERN, exportRequestSchema, requestFromOptions, toExportOptions, type ExportRequest } from "../schemas/export";
import { requireRole, type Actor } from "./actor";
import { parquetEncoder } from "./parquet-encoder";
import { fail, guard, invalid, ok, type Result } from "./result";

export const TOOL_VERSION: string = packageJson.version;

/** The folder export runs live in: <data folder>/exports/<name>/ (on PostgreSQL the data folder is MELTLEDGER_FILES_DIR). */
export function exportsDir(): string {
  return path.join(resolveDatabaseTarget().dataDir, "exports");
}

export interface ExportCounts {
  records: number;
  labelled: number;
  dropped: BuiltExport["counts"]["dropped"];
  before: BuiltExport["counts"]["before"];
  after: BuiltExport["counts"]["after"];
  synthetic: BuiltExport["counts"]["synthetic"];
  partitions: string[];
  classes: string[] | null;
}

export interface ExportPreview {
  options: ExportOptions;
  counts: ExportCounts;
  warnings: string[];
  sources: number;
}

export interface ExportRunSummary {
  name: string;
  folder: string;
  files: ExportFileEntry[];
  counts: ExportCounts;
  warnings: string[];
  ms: number;
  /** Stage timings of the build, ms. */
  timings: Record<string, number>;
}

const sha256Hex = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");

function countsOf(b: BuiltExport): ExportCounts {
  return { records: b.counts.records, labelled: b.counts.labelled, dropped: b.counts.dropped, before: b.counts.before, after: b.counts.after, synthetic: b.counts.synthetic, partitions: b.partitions, classes: b.classes };
}

function parseRequest(input: unknown): { ok: true; request: ExportRequest; options: ExportOptions } | { ok: false; error: ReturnType<typeof invalid> } {
  const parsed = exportRequestSchema.safeParse(input ?? {});
  if (!parsed.success) return { ok: false, error: invalid(parsed.error, "Some export options need attention; nothing was written.") };
  return { ok: true, request: parsed.data, options: toExportOptions(parsed.data) };
}

/** What an export reads, from one snapshot of the database. */
interface ExportInputs {
  records: Awaited<ReturnType<typeof loadExportRecords>>;
  sources: Awaited<ReturnType<typeof loadExportSources>>;
  narrowed: { total: number; dropped: { status: number; alloy: number; source: number } };
}

async function readInputs(tx: SqlExecutor, options: ExportOptions): Promise<ExportInputs> {
  const { alloys, sourceIds } = options.filters;
  const statuses = allowedStatuses(options.filters);
  const records = await loadExportRecords(tx, { statuses, alloys, sourceIds });
  // The query reads only records with an allowed status, alloy and source; those it leaves out are
  // counted under the first filter that leaves them out, as the core counts the rest.
  const total = await countRecords(tx);
  const withStatus = await countExportCandidates(tx, statuses, []);
  const withAlloy = alloys.length ? await countExportCandidates(tx, statuses, alloys) : withStatus;
  const narrowed = { total, dropped: { status: total - withStatus, alloy: withStatus - withAlloy, source: withAlloy - records.length } };
  return { records, sources: await loadExportSources(tx), narrowed };
}

function build(inputs: ExportInputs, options: ExportOptions, clock?: () => number) {
  return buildTrainingSet({ records: inputs.records, sources: inputs.sources, options, clock, narrowed: inputs.narrowed });
}

/** Counts and warnings of an export without writing anything. */
export async function previewExport(input: unknown): Promise<Result<ExportPreview>> {
  return guard(async () => {
    const p = parseRequest(input);
    if (!p.ok) return p.error;
    const inputs = await sql().transaction((tx) => readInputs(tx, p.options), { readOnly: true });
    const r = build(inputs, p.options);
    if (!r.ok) return fail("invalid_input", r.problem.message, { problem: r.problem.code, ...r.problem.details });
    return ok({ options: p.options, counts: countsOf(r.built), warnings: r.built.warnings, sources: r.built.sources.length });
  });
}

function uniqueName(base: string, taken: ReadonlySet<string>): string {
  if (!taken.has(base) && !existsSync(path.join(exportsDir(), base))) return base;
  for (let i = 2; ; i++) {
    const name = `${base}-${i}`;
    if (!taken.has(name) && !existsSync(path.join(exportsDir(), name))) return name;
  }
}

function defaultName(o: ExportOptions): string {
  return `${o.label.scheme}-${o.balance.method}-${o.split.kind === "source" ? "source" : `folds${o.split.k}`}-seed${o.seed}`;
}

export interface CreateExportOptions {
  /** Also write the files to this folder (the CLI's --out). */
  outDir?: string;
  clock?: () => number;
  /** Name to give when the request has none (re-runs). */
  fallbackName?: string;
}

/**
 * Builds an export, writes its files and records the run. Bad options, a filter that leaves no
 * rows, a class too small for SMOTE's k or fractions that do not sum to 1 come back as
 * invalid_input, and nothing is written.
 */
export async function createExport(input: unknown, actor: Actor, options: CreateExportOptions = {}): Promise<Result<ExportRunSummary>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const p = parseRequest(input);
    if (!p.ok) return p.error;
    const clock = options.clock ?? (() => performance.now());
    const t0 = clock();
    // The Parquet worker starts now, so it is ready by the time the tables are built.
    const encoder = parquetEncoder();
    const base = p.request.name ?? options.fallbackName ?? defaultName(p.options);
    let name: string;
    let staging: string;
    const root = exportsDir();
    let written: Awaited<ReturnType<typeof exportFilesWith>>;
    let r: ReturnType<typeof build>;
    let t1: number;
    try {
      // Everything the export reads comes from one snapshot; the files are made after it has ended.
      const read = await sql().transaction(async (tx) => {
        if (p.request.name && (await getExportRun(tx, p.request.name))) return null;
        return { taken: new Set(p.request.name ? [] : await exportRunNamesLike(tx, base)), inputs: await readInputs(tx, p.options) };
      }, { readOnly: true });
      if (!read) {
        return fail("conflict", `An export named "${p.request.name}" already exists; choose another name or run that one again.`, { fieldErrors: { name: ["This name is taken."] } });
      }
      name = p.request.name ?? uniqueName(base, read.taken);
      // Written beside the final folder and renamed into place, so a run is there whole or not at all.
      staging = path.join(root, `.staging-${process.pid}-${name}`);
      r = build(read.inputs, p.options, clock);
      if (!r.ok) return fail("invalid_input", `${r.problem.message} Nothing was written.`, { problem: r.problem.code, ...r.problem.details });
      t1 = clock();
      mkdirSync(root, { recursive: true });
      rmSync(staging, { recursive: true, force: true });
      mkdirSync(staging);
      // Each data file goes to disk (on the I/O threads) as soon as it is ready, while the next is encoded.
      const writes: Promise<void>[] = [];
      const started = new Set<string>();
      const writeOut = (f: { name: string; bytes: Uint8Array }) => {
        started.add(f.name);
        const w = writeFile(path.join(staging, f.name), f.bytes);
        w.catch(() => undefined); // awaited below
        writes.push(w);
      };
      try {
        written = await exportFilesWith(r.built, p.options, TOOL_VERSION, sha256Hex, (input, createdBy) => encoder.encode(input, createdBy), writeOut);
        // then the files made after the data files (the datasheet and the manifest)
        for (const f of written.files) if (!started.has(f.name)) writeOut(f);
        await Promise.all(writes);
      } catch (error) {
        await Promise.allSettled(writes);
        rmSync(staging, { recursive: true, force: true });
        throw error;
      }
    } finally {
      await encoder.close();
    }
    const { files, entries } = written;
    const t2 = clock();
    const folder = path.join(root, name);
    const counts = countsOf(r.built);
    const fileHashes = Object.fromEntries([...entries.map((e) => [e.name, e.sha256] as const), ["manifest.json", sha256Hex(files.at(-1)!.bytes)] as const]);
    const at = new Date();
    const built = r.built;
    const runCounts = { ...counts, warnings: built.warnings, rows: Object.fromEntries(entries.filter((e) => e.rows !== null && e.name.endsWith(".csv")).map((e) => [e.name, e.rows])) };
    let renamed = false;
    try {
      // The folder is in place before the run is recorded: a recorded run always has its files.
      renameSync(staging, folder);
      renamed = true;
      await sql().transaction(async (tx) => {
        const id = await insertExportRun(tx, { name, params: { request: requestFromOptions(p.options) }, seed: p.options.seed, counts: runCounts, files: fileHashes, toolVersion: TOOL_VERSION, createdById: actor.id, at });
        await appendAuditEvent(tx, { actorId: actor.id, actorName: actor.name, action: "export", entityType: "export", entityId: id, after: { name, seed: p.options.seed, labelled: counts.labelled, files: fileHashes }, at: at.toISOString() });
      });
    } catch (error) {
      rmSync(staging, { recursive: true, force: true });
      // only the folder this run put in place: another run of the same name may own the one there
      if (renamed && !(await getExportRun(sql(), name))) rmSync(folder, { recursive: true, force: true });
      throw error;
    }
    if (options.outDir) {
      mkdirSync(/* turbopackIgnore: true */ options.outDir, { recursive: true });
      for (const f of files) writeFileSync(path.join(/* turbopackIgnore: true */ options.outDir, f.name), f.bytes);
    }
    const t3 = clock();
    const allEntries = [...entries, { name: "manifest.json", rows: null, bytes: files.at(-1)!.bytes.byteLength, sha256: fileHashes["manifest.json"]! }];
    return ok({ name, folder, files: allEntries, counts, warnings: r.built.warnings, ms: t3 - t0, timings: { ...r.built.timings, "build total": t1 - t0, "files (CSV, Parquet, datasheet, written to disk)": t2 - t1, "rename and record": t3 - t2 } });
  });
}

export interface ExportRunView {
  name: string;
  seed: number;
  toolVersion: string;
  createdAt: string;
  files: { name: string; sha256: string }[];
  counts: ExportRunRow["counts"];
  request: unknown;
}

const view = (r: ExportRunRow): ExportRunView => ({
  name: r.name,
  seed: r.seed,
  toolVersion: r.toolVersion,
  createdAt: r.createdAt,
  files: Object.entries(r.files).map(([name, sha256]) => ({ name, sha256 })),
  counts: r.counts,
  request: (r.params as { request?: unknown })?.request ?? null,
});

/** Saved export runs, newest first. */
export async function listExports(): Promise<Result<ExportRunView[]>> {
  return guard(async () => ok((await listExportRuns(sql())).map(view)));
}

/** One saved export run. */
export async function getExport(name: string): Promise<Result<ExportRunView>> {
  return guard(async () => {
    if (!EXPORT_NAME_PATTERN.test(name)) return fail("not_found", `There is no export named "${name}".`);
    const r = await getExportRun(sql(), name);
    return r ? ok(view(r)) : fail("not_found", `There is no export named "${name}".`);
  });
}

/**
 * Runs a saved export again with its options and seed, under a new name; says whether every file
 * came out byte-identical (it does unless the records changed).
 */
export async function rerunExport(name: string, actor: Actor): Promise<Result<ExportRunSummary & { original: string; identical: boolean; changed: string[] }>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const run = EXPORT_NAME_PATTERN.test(name) ? await getExportRun(sql(), name) : null;
    if (!run) return fail("not_found", `There is no export named "${name}".`);
    const request = (run.params as { request?: unknown })?.request;
    const r = await createExport(request, actor, { fallbackName: `${name}-rerun` });
    if (!r.ok) return r;
    const changed = r.data.files.filter((f) => run.files[f.name] !== f.sha256).map((f) => f.name);
    return ok({ ...r.data, original: name, identical: changed.length === 0, changed });
  });
}

const CONTENT_TYPES: Record<string, string> = { csv: "text/csv; charset=utf-8", parquet: "application/vnd.apache.parquet", md: "text/markdown; charset=utf-8", json: "application/json" };

/** A file of a saved export for download: names are checked against fixed patterns, so no path can leave the run's folder. */
export async function openExportFile(name: string, file: string): Promise<Result<{ path: string; sizeBytes: number; contentType: string; sha256: string }>> {
  return guard(async () => {
    if (!EXPORT_NAME_PATTERN.test(name) || !EXPORT_FILE_PATTERN.test(file)) return fail("not_found", `There is no file "${file}" in an export named "${name}".`);
    const run = await getExportRun(sql(), name);
    const sha256 = run?.files[file];
    if (!run || !sha256) return fail("not_found", `There is no file "${file}" in an export named "${name}".`);
    const p = path.join(exportsDir(), name, file);
    if (!existsSync(p)) return fail("not_found", `The file "${file}" of export "${name}" is missing from the data folder.`);
    return ok({ path: p, sizeBytes: statSync(p).size, contentType: CONTENT_TYPES[file.split(".").pop()!] ?? "application/octet-stream", sha256 });
  });
}
