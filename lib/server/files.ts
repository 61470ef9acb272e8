import { createHash, randomUUID } from "node:crypto";
import { createReadStream, createWriteStream, existsSync, mkdirSync, renameSync, rmSync, statSync, type ReadStream } from "node:fs";
import path from "node:path";
import { z } from "zod";
import { attachStoredFile, getSourceDocument, listSourceDocuments, recordStoredFile, type SourceDocumentRow } from "../db/files";
import { resolveDatabaseTarget } from "../db/location";
import { getSource } from "../db/sources";
import { requireRole, type Actor } from "./actor";
import { fail, guard, ok, type Result } from "./result";
import { isRowId } from "../schemas/ids";

/** Default upload limit; MELTLEDGER_UPLOAD_LIMIT_MB overrides it (papers with scanned figures run to tens of MB). */
export const DEFAULT_UPLOAD_LIMIT_MB = 50;

const limitSchema = z.object({ MELTLEDGER_UPLOAD_LIMIT_MB: z.coerce.number().positive().max(2048).optional() });

/** The upload limit in bytes from the environment (1 MB = 1,048,576 bytes here). */
export function uploadLimitBytes(env: Record<string, string | undefined> = process.env): number {
  const parsed = limitSchema.safeParse(env);
  const mb = parsed.success ? (parsed.data.MELTLEDGER_UPLOAD_LIMIT_MB ?? DEFAULT_UPLOAD_LIMIT_MB) : DEFAULT_UPLOAD_LIMIT_MB;
  return Math.floor(mb * 1024 * 1024);
}

export type FileKind = "pdf" | "xlsx" | "csv";

const MIME: Record<FileKind, string> = { pdf: "application/pdf", xlsx: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet", csv: "text/csv" };
const LABEL: Record<FileKind, string> = { pdf: "a PDF", xlsx: "an XLSX workbook", csv: "a CSV text file" };

/**
 * What the first bytes of a file say it is. PDF: "%PDF-" (ISO 32000-1, 7.5.2); readers accept it
 * within the first 1,024 bytes (common practice), so this does too. XLSX is a ZIP package: local
 * file header "PK\x03\x04" (PKWARE APPNOTE 4.3.7). A legacy .xls is an OLE compound file
 * (D0 CF 11 E0 A1 B1 1A E1). Text has no NUL byte in its first kilobytes.
 */
export function sniffFileKind(head: Uint8Array): "pdf" | "zip" | "ole" | "text" | "binary" | "empty" {
  if (head.length === 0) return "empty";
  const ascii = Buffer.from(head.subarray(0, 1024)).toString("latin1");
  if (ascii.includes("%PDF-")) return "pdf";
  if (head[0] === 0x50 && head[1] === 0x4b && head[2] === 0x03 && head[3] === 0x04) return "zip";
  if (head[0] === 0xd0 && head[1] === 0xcf && head[2] === 0x11 && head[3] === 0xe0) return "ole";
  // UTF-16 text starts with a byte-order mark and has NULs; it is text, but not a supported encoding
  for (let i = 0; i < Math.min(head.length, 8192); i++) if (head[i] === 0) return "binary";
  return "text";
}

function kindMismatch(expected: FileKind, seen: ReturnType<typeof sniffFileKind>, fileName: string): string | null {
  if (seen === "empty") return `"${fileName}" is empty.`;
  const ok = (expected === "pdf" && seen === "pdf") || (expected === "xlsx" && seen === "zip") || (expected === "csv" && seen === "text");
  if (ok) return null;
  const what = { pdf: "a PDF", zip: "a ZIP package (such as XLSX)", ole: "a legacy Excel .xls file (save it as .xlsx or CSV)", text: "plain text", binary: "binary data" }[seen];
  return `"${fileName}" is not ${LABEL[expected]}: its content is ${what}.`;
}

/**
 * The name shown for an uploaded file: no folders, no control characters, at most 200 characters.
 * It is only ever displayed; stored files are named by their hash.
 *
 * @example safeDisplayName("../../etc/passwd\u0000.pdf"); // "passwd.pdf"
 */
export function safeDisplayName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? "";
  // eslint-disable-next-line no-control-regex
  const clean = base.replace(/[\u0000-\u001f\u007f]/g, "").replace(/\s+/g, " ").trim();
  return (clean || "upload").slice(0, 200);
}

/** The folder stored files live in: <folder of the SQLite file>/files, or MELTLEDGER_FILES_DIR (default ./data/files) beside a PostgreSQL server. */
export function filesDir(): string {
  return resolveDatabaseTarget().dataDir;
}

const SHA256_HEX = /^[0-9a-f]{64}$/;

/** Path of a stored file, or null for anything that is not a SHA-256 in lower-case hex. */
export function storedFilePath(sha256: string): string | null {
  if (!SHA256_HEX.test(sha256)) return null;
  return path.join(filesDir(), sha256.slice(0, 2), sha256);
}

export interface StoredFileInfo {
  sha256: string;
  sizeBytes: number;
  mimeType: string;
  path: string;
  /** The same content was already stored; nothing new was written. */
  alreadyStored: boolean;
}

type Chunks = AsyncIterable<Uint8Array> | Iterable<Uint8Array> | ReadableStream<Uint8Array>;

async function* chunksOf(input: Chunks): AsyncGenerator<Uint8Array> {
  if (Symbol.asyncIterator in input || Symbol.iterator in input) {
    for await (const c of input as AsyncIterable<Uint8Array>) yield c;
    return;
  }
  const reader = (input as ReadableStream<Uint8Array>).getReader();
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) return;
      if (value) yield value;
    }
  } finally {
    reader.releaseLock();
  }
}

/**
 * Streams an upload to the content-addressed store: hashed while written to a temporary file,
 * refused (and the temporary file removed) when larger than the limit or not of the expected
 * kind, then moved to <files>/<sha[0:2]>/<sha>. The same content twice is stored once.
 */
export async function storeUpload(input: Chunks, expected: FileKind, fileName: string, options: { limitBytes?: number } = {}): Promise<Result<StoredFileInfo>> {
  const limit = options.limitBytes ?? uploadLimitBytes();
  const dir = filesDir();
  const incoming = path.join(dir, ".incoming");
  mkdirSync(incoming, { recursive: true });
  const tmp = path.join(incoming, randomUUID());
  const out = createWriteStream(tmp, { flags: "wx" });
  const hash = createHash("sha256");
  const head: Buffer[] = [];
  let headBytes = 0;
  let size = 0;
  let refusal: Result<StoredFileInfo> | null = null;
  try {
    for await (const chunk of chunksOf(input)) {
      size += chunk.byteLength;
      if (size > limit) {
        refusal = fail("too_large", `"${fileName}" is larger than the upload limit of ${(limit / 1024 / 1024).toLocaleString("en")} MB (MELTLEDGER_UPLOAD_LIMIT_MB); nothing was stored.`);
        break;
      }
      if (headBytes < 8192) {
        head.push(Buffer.from(chunk.subarray(0, 8192 - headBytes)));
        headBytes += Math.min(chunk.byteLength, 8192 - headBytes);
      }
      hash.update(chunk);
      if (!out.write(chunk)) await new Promise<void>((resolve) => out.once("drain", () => resolve()));
    }
    await new Promise<void>((resolve, reject) => out.end((error?: Error | null) => (error ? reject(error) : resolve())));
    if (!refusal) {
      const mismatch = kindMismatch(expected, sniffFileKind(Buffer.concat(head)), fileName);
      if (mismatch) refusal = fail(size === 0 ? "invalid_input" : "unsupported_type", `${mismatch} Nothing was stored.`);
    }
    if (refusal) return refusal;
    const sha256 = hash.digest("hex");
    const final = storedFilePath(sha256)!;
    // stored files are named by hash at run time; nothing here belongs in the build trace
    const alreadyStored = existsSync(/*turbopackIgnore: true*/ final);
    if (!alreadyStored) {
      mkdirSync(path.dirname(final), { recursive: true });
      renameSync(tmp, final);
    }
    return ok({ sha256, sizeBytes: size, mimeType: MIME[expected], path: final, alreadyStored });
  } finally {
    if (!out.closed) out.destroy();
    rmSync(tmp, { force: true });
  }
}

export interface AttachedDocument extends SourceDocumentRow {
  alreadyStored: boolean;
  alreadyAttached: boolean;
}

/** Uploads a paper's PDF to a source. */
export async function attachPdfToSource(sourceId: number, input: Chunks, fileName: string, actor: Actor, options: { limitBytes?: number } = {}): Promise<Result<AttachedDocument>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    if (!isRowId(sourceId) || !(await getSource(sourceId))) return fail("not_found", `Source ${sourceId} does not exist.`);
    const name = safeDisplayName(fileName);
    const stored = await storeUpload(input, "pdf", name, options);
    if (!stored.ok) return stored;
    const { document, alreadyAttached } = await attachStoredFile(sourceId, { sha256: stored.data.sha256, sizeBytes: stored.data.sizeBytes, mimeType: stored.data.mimeType, fileName: name }, actor);
    return ok({ ...document, alreadyStored: stored.data.alreadyStored, alreadyAttached });
  });
}

/** Stores an uploaded spreadsheet for an import; the import run refers to it by hash. */
export async function storeImportFile(input: Chunks, kind: "csv" | "xlsx", fileName: string, actor: Actor, options: { limitBytes?: number } = {}): Promise<Result<StoredFileInfo & { fileName: string }>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const name = safeDisplayName(fileName);
    const stored = await storeUpload(input, kind, name, options);
    if (!stored.ok) return stored;
    await recordStoredFile({ sha256: stored.data.sha256, sizeBytes: stored.data.sizeBytes, mimeType: stored.data.mimeType });
    return ok({ ...stored.data, fileName: name });
  });
}

export async function listDocuments(sourceId: number): Promise<Result<SourceDocumentRow[]>> {
  return guard(async () => ok(isRowId(sourceId) ? await listSourceDocuments(sourceId) : []));
}

/** A source's PDFs and its DOI, for the paper pane (which offers a DOI found in the paper). */
export async function getSourcePapers(sourceId: number): Promise<Result<{ documents: SourceDocumentRow[]; sourceDoi: string | null }>> {
  return guard(async () => {
    const source = isRowId(sourceId) ? await getSource(sourceId) : null;
    if (!source) return fail("not_found", `Source ${sourceId} does not exist.`);
    return ok({ documents: await listSourceDocuments(sourceId), sourceDoi: source.doi });
  });
}

/** A source document's bytes for the PDF pane. */
export async function openDocument(documentId: number): Promise<Result<{ document: SourceDocumentRow; stream: ReadStream; sizeBytes: number }>> {
  return guard(async () => {
    if (!isRowId(documentId)) return fail("not_found", "No such document.");
    const document = await getSourceDocument(documentId);
    if (!document) return fail("not_found", `Document ${documentId} does not exist.`);
    const file = storedFilePath(document.sha256);
    if (!file || !existsSync(/*turbopackIgnore: true*/ file)) return fail("not_found", `The file of document ${documentId} is missing from the data folder.`);
    return ok({ document, stream: createReadStream(/*turbopackIgnore: true*/ file), sizeBytes: statSync(/*turbopackIgnore: true*/ file).size });
  });
}
