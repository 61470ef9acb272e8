import { randomUUID } from "node:crypto";
import { existsSync } from "node:fs";
import { importRequestSchema } from "../schemas/import";
import { hasRole, requireRole, type Actor } from "./actor";
import { storedFilePath } from "./files";
import type { ImportRunRow } from "../db/imports";
import { getNewRecordForm } from "./record-editor";
import type { SourceOption } from "./records-facets";
import { commitImport, listRecentImports, parseMappingJson, previewImport, type ImportAnalysis, type ImportCommit, type ImportOptions, type ImportProgress, type TableInput } from "./imports";
import { fail, guard, invalid, nulRefusal, ok, type Result } from "./result";

/** Turns a validated request into the importer's input; a file is found by its hash in the store. */
function toInput(body: unknown): Result<{ input: TableInput; options: ImportOptions }> {
  const nul = nulRefusal(body);
  if (nul) return nul;
  const parsed = importRequestSchema.safeParse(body);
  if (!parsed.success) return invalid(parsed.error);
  const r = parsed.data;
  let mapping: ImportOptions["mapping"] = null;
  if (r.mapping !== null) {
    const m = parseMappingJson(r.mapping);
    if (!m.ok) return m;
    mapping = m.data;
  }
  let input: TableInput;
  const t = r.table;
  if (t.kind === "file") {
    const file = storedFilePath(t.sha256);
    if (!file || !existsSync(file)) return fail("not_found", "The uploaded file is no longer stored; upload it again.");
    input = t.format === "xlsx" ? { kind: "xlsx", path: file, fileName: t.fileName, fileSha256: t.sha256, sheet: t.sheet } : { kind: "csv", path: file, fileName: t.fileName, fileSha256: t.sha256, ...(t.delimiter ? { delimiter: t.delimiter } : {}) };
  } else if (t.kind === "paste") {
    input = { kind: "paste", text: t.text, splitter: t.splitter, fileName: "pasted table" };
  } else {
    input = { kind: "pdf_table", rows: t.rows, page: t.page, box: t.box, fileName: t.fileName, label: t.label };
  }
  return ok({ input, options: { mapping, sourceId: r.sourceId, sourceDoi: r.sourceDoi, excludeErrors: r.excludeErrors } });
}

/** Preview of an import request from the import page. */
export async function previewImportRequest(body: unknown): Promise<Result<ImportAnalysis>> {
  return guard(async () => {
    const r = toInput(body);
    if (!r.ok) return r;
    return previewImport(r.data.input, r.data.options);
  });
}

interface ImportJob {
  id: string;
  actorId: number;
  state: "running" | "finished";
  progress: ImportProgress;
  result: Result<ImportCommit> | null;
  controller: AbortController;
  startedAt: number;
}

const globalJobs = globalThis as unknown as { meltledgerImportJobs?: Map<string, ImportJob> };
const jobs = (globalJobs.meltledgerImportJobs ??= new Map());
/** Finished jobs are kept this long for the page to read their result (common practice: an hour). */
const KEEP_MS = 60 * 60 * 1000;

export interface ImportJobView {
  id: string;
  state: ImportJob["state"];
  progress: ImportProgress;
  result: Result<ImportCommit> | null;
}

const view = (j: ImportJob): ImportJobView => ({ id: j.id, state: j.state, progress: j.progress, result: j.result });

/** Starts a commit in the background and returns its id; progress and the result are read with getImportJob. */
export async function startImportJob(body: unknown, actor: Actor): Promise<Result<ImportJobView>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const r = toInput(body);
    if (!r.ok) return r;
    for (const [id, j] of jobs) if (j.state === "finished" && Date.now() - j.startedAt > KEEP_MS) jobs.delete(id);
    const job: ImportJob = { id: randomUUID(), actorId: actor.id, state: "running", progress: { phase: "reading", rowsRead: 0, rowsWritten: 0, rowsTotal: null }, result: null, controller: new AbortController(), startedAt: Date.now() };
    jobs.set(job.id, job);
    void commitImport(r.data.input, { ...r.data.options, signal: job.controller.signal, onProgress: (p) => (job.progress = p) }, actor).then(
      (result) => {
        job.result = result;
        job.state = "finished";
      },
      (error: unknown) => {
        console.error("[meltledger] import job failed", error);
        job.result = fail("internal", "The import failed on the server; nothing was written. The error was logged.");
        job.state = "finished";
      },
    );
    return ok(view(job));
  });
}

export async function getImportJob(id: string): Promise<Result<ImportJobView>> {
  const job = jobs.get(id);
  return job ? ok(view(job)) : fail("not_found", "No such import (finished imports are kept for an hour).");
}

/**
 * Asks a running import to stop; its transaction rolls back, so nothing of it stays. With an
 * actor, only the one who started it or an admin may stop it.
 */
export async function cancelImportJob(id: string, actor?: Actor): Promise<Result<ImportJobView>> {
  const job = jobs.get(id);
  if (!job) return fail("not_found", "No such import.");
  if (actor && job.actorId !== actor.id && !hasRole(actor, "admin")) return fail("forbidden", "Only the one who started this import, or an admin, may cancel it.");
  job.controller.abort();
  return ok(view(job));
}

/** What the import page shows: the sources to choose from and the latest import runs. */
export async function getImportPage(): Promise<Result<{ sources: SourceOption[]; recent: ImportRunRow[] }>> {
  return guard(async () => {
    const [form, recent] = await Promise.all([getNewRecordForm(), listRecentImports(10)]);
    if (!form.ok) return form;
    if (!recent.ok) return recent;
    return ok({ sources: form.data.sources, recent: recent.data });
  });
}
