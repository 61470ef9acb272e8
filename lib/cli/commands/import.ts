import { createHash } from "node:crypto";
import { closeSync, createReadStream, existsSync, openSync, readFileSync, readSync, statSync } from "node:fs";
import path from "node:path";
import { cliActor } from "../../server/actor";
import { sniffFileKind, storeImportFile } from "../../server/files";
import { commitImport, parseMappingJson, type ImportCommit, type TableInput } from "../../server/imports";
import { parseCli } from "../args";
import type { CliCommand, CliIo } from "../types";

const USAGE = "meltledger import FILE.csv|FILE.xlsx [--sheet NAME] [--mapping FILE.json] [--source-doi DOI | --source-id ID] [--dry-run] [--exclude-errors] [--json]";

interface Output {
  status: ImportCommit["status"] | "refused";
  imported: number;
  excluded: number;
  errors: { row: number; field: string; message: string }[];
  warnings: { row: number; field: string; message: string }[];
  records: { row: number; id: number }[];
  unmapped: string[];
  import_run_id: number | null;
  created_sources: { id: number; doi: string | null; url: string | null }[];
  /** Flags the checks raised on the imported records, by rule. */
  checks?: { opened: number; open_by_code: Record<string, number> } | null;
  message?: string;
}

function print(io: CliIo, out: Output, json: boolean): void {
  if (json) {
    io.stdout(`${JSON.stringify(out)}\n`);
    return;
  }
  if (out.message) io.stderr(`${out.message}\n`);
  for (const e of out.errors.slice(0, 200)) io.stderr(`  row ${e.row}, ${e.field}: ${e.message}\n`);
  if (out.errors.length > 200) io.stderr(`  … and ${out.errors.length - 200} more\n`);
  if (out.unmapped.length) io.stdout(`Columns not imported: ${out.unmapped.join(", ")}\n`);
  if (out.warnings.length) io.stdout(`${out.warnings.length} warning(s), e.g. row ${out.warnings[0]!.row}, ${out.warnings[0]!.field}: ${out.warnings[0]!.message}\n`);
  if (out.status !== "refused") io.stdout(`${out.status === "dry_run" ? "Would import" : "Imported"} ${out.imported} record(s); ${out.excluded} row(s) left out; ${out.created_sources.length} source(s) ${out.status === "dry_run" ? "to create" : "created"}${out.checks ? `; ${out.checks.opened} flag(s) raised by the checks` : ""}.\n`);
}

function refused(message: string, errors: Output["errors"], extra: Partial<Output> = {}): Output {
  return { status: "refused", imported: 0, excluded: 0, errors, warnings: [], records: [], unmapped: [], import_run_id: null, created_sources: [], message, ...extra };
}

function head(file: string): Buffer {
  const fd = openSync(file, "r");
  try {
    const buf = Buffer.alloc(8192);
    return buf.subarray(0, readSync(fd, buf, 0, buf.length, 0));
  } finally {
    closeSync(fd);
  }
}

/** `meltledger import FILE`: imports a CSV or XLSX table, every row or none. */
export const importCommand: CliCommand = async (argv, io) => {
  const parsed = parseCli(
    argv,
    {
      json: { type: "boolean" }, sheet: { type: "string" }, mapping: { type: "string" }, "source-doi": { type: "string" }, "source-id": { type: "string" },
      "dry-run": { type: "boolean" }, "exclude-errors": { type: "boolean" },
    },
    io,
    USAGE,
  );
  if (!parsed.ok) return 2;
  const v = parsed.values as Record<string, string | boolean | undefined>;
  const json = v.json === true;
  const [file, ...extra] = parsed.positionals;
  if (!file || extra.length) {
    io.stderr(`Give exactly one file to import.\n\nUsage: ${USAGE}\n`);
    return 2;
  }
  if (v["source-doi"] !== undefined && v["source-id"] !== undefined) {
    io.stderr(`Give --source-doi or --source-id, not both.\n\nUsage: ${USAGE}\n`);
    return 2;
  }
  let sourceId: number | null = null;
  if (typeof v["source-id"] === "string") {
    sourceId = Number(v["source-id"]);
    if (!Number.isInteger(sourceId) || sourceId <= 0) {
      io.stderr(`--source-id takes a source number, got "${v["source-id"]}".\n`);
      return 2;
    }
  }
  const fileName = path.basename(file);
  if (!existsSync(file) || !statSync(file).isFile()) {
    print(io, refused(`No file at ${file}.`, [{ row: 0, field: "file", message: `No file at ${file}.` }]), json);
    return 2;
  }
  const ext = path.extname(file).toLowerCase();
  const kind = ext === ".xlsx" ? "xlsx" : [".csv", ".tsv", ".txt"].includes(ext) ? "csv" : null;
  if (!kind) {
    print(io, refused(`"${fileName}" is neither .csv nor .xlsx.`, [{ row: 0, field: "file", message: "Use a .csv (any delimiter) or .xlsx file." }]), json);
    return 2;
  }
  const seen = sniffFileKind(head(file));
  const expected = kind === "xlsx" ? "zip" : "text";
  if (seen !== expected) {
    const what = seen === "empty" ? "empty" : `not ${kind === "xlsx" ? "an XLSX workbook" : "a CSV text file"} (its content is ${{ pdf: "a PDF", zip: "a ZIP package", ole: "a legacy .xls workbook; save it as .xlsx", text: "plain text", binary: "binary data", empty: "empty" }[seen]})`;
    const message = `"${fileName}" is ${what}; nothing was imported.`;
    print(io, refused(message, [{ row: 0, field: "file", message }]), json);
    return 2;
  }

  let mapping = null;
  if (typeof v.mapping === "string") {
    let raw: unknown;
    try {
      raw = JSON.parse(readFileSync(v.mapping, "utf8"));
    } catch (error) {
      const message = `Cannot read the mapping file ${v.mapping}: ${(error as Error).message}`;
      print(io, refused(message, [{ row: 0, field: "mapping", message }]), json);
      return 2;
    }
    const m = parseMappingJson(raw);
    if (!m.ok) {
      print(io, refused(m.error.message, [{ row: 0, field: "mapping", message: m.error.message }]), json);
      return 2;
    }
    mapping = m.data;
  }

  const actor = await cliActor();
  // the import run names the file by its hash; the file itself is kept only once the import is written
  const hash = createHash("sha256");
  for await (const chunk of createReadStream(file)) hash.update(chunk as Buffer);
  const fileSha256 = hash.digest("hex");
  const input: TableInput = kind === "xlsx" ? { kind, path: file, fileName, fileSha256, sheet: typeof v.sheet === "string" ? v.sheet : null } : { kind, path: file, fileName, fileSha256 };
  const r = await commitImport(input, { mapping, sourceId, sourceDoi: typeof v["source-doi"] === "string" ? v["source-doi"] : null, dryRun: v["dry-run"] === true, excludeErrors: v["exclude-errors"] === true }, actor);
  if (!r.ok) {
    const d = (r.error.details ?? {}) as { rowErrors?: Output["errors"]; fieldErrors?: Record<string, string[]>; unmapped?: string[]; warnings?: Output["warnings"] };
    const errors = d.rowErrors ?? Object.entries(d.fieldErrors ?? {}).flatMap(([field, ms]) => ms.map((message) => ({ row: 0, field, message })));
    print(io, refused(r.error.message, errors.length ? errors : [{ row: 0, field: "file", message: r.error.message }], { unmapped: d.unmapped ?? [], warnings: d.warnings ?? [] }), json);
    return r.error.code === "internal" ? 1 : 2;
  }
  const c = r.data;
  if (c.status === "committed") {
    const stored = await storeImportFile(createReadStream(file), kind, fileName, actor);
    if (!stored.ok) io.stderr(`The records are imported, but the file could not be kept in the data folder: ${stored.error.message}\n`);
  }
  print(io, { status: c.status, imported: c.imported, excluded: c.excluded, errors: c.errors, warnings: c.warnings, records: c.records, unmapped: c.unmapped, import_run_id: c.importRunId, created_sources: c.createdSources, checks: c.checks ? { opened: c.checks.opened, open_by_code: c.checks.openByCode } : null }, json);
  return 0;
};
