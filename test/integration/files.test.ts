// PDF uploads to sources: content-addressed storage, the type check on the bytes, the size limit,
// and file names that never reach the file system.
import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, test } from "vitest";
import { sql } from "@/lib/db/sql";
import { localActor, type Actor } from "@/lib/server/actor";
import { attachPdfToSource, filesDir, listDocuments, openDocument, safeDisplayName, sniffFileKind, storedFilePath, uploadLimitBytes } from "@/lib/server/files";
import { createSource } from "@/lib/server/sources";
import { sourceInput } from "../support/fixtures";
import { inventedPaperPdf, makePdf } from "../support/pdf";
import { describeEachEngine } from "../support/engines";

describeEachEngine("stored files", (current) => {
let actor: Actor;
let sourceA: number;
let sourceB: number;
const { pdf } = inventedPaperPdf();

beforeAll(async () => {
  actor = await localActor();
  const a = await createSource(sourceInput({ doi: "10.5555/files.a", title: "First invented paper for file tests" }), actor);
  const b = await createSource(sourceInput({ doi: "10.5555/files.b", title: "Second invented paper for file tests" }), actor);
  if (!a.ok || !b.ok) throw new Error("sources");
  sourceA = a.data.id;
  sourceB = b.data.id;
});

const count = async (table: string) => (await sql().get<{ n: number }>(`SELECT COUNT(*) AS n FROM "${table}"`))!.n;

describe("PDF upload", () => {
  test("is stored once by its SHA-256 next to the database, however often it is uploaded", async () => {
    const first = await attachPdfToSource(sourceA, [pdf], "paper.pdf", actor);
    if (!first.ok) throw new Error(first.error.message);
    expect(first.data).toMatchObject({ sourceId: sourceA, fileName: "paper.pdf", alreadyStored: false, alreadyAttached: false, mimeType: "application/pdf", sizeBytes: pdf.length });
    const file = storedFilePath(first.data.sha256)!;
    expect(file).toBe(path.join(current().filesDir, first.data.sha256.slice(0, 2), first.data.sha256));
    expect(readFileSync(file).equals(pdf)).toBe(true);

    const again = await attachPdfToSource(sourceA, [pdf.subarray(0, 100), pdf.subarray(100)], "copy.pdf", actor);
    expect(again.ok && again.data).toMatchObject({ id: first.data.id, alreadyStored: true, alreadyAttached: true });
    const other = await attachPdfToSource(sourceB, [pdf], "paper.pdf", actor);
    expect(other.ok && other.data).toMatchObject({ alreadyStored: true, alreadyAttached: false });
    expect(await count("StoredFile")).toBe(1);
    expect(readdirSync(path.join(filesDir(), first.data.sha256.slice(0, 2)))).toEqual([first.data.sha256]);
    expect(readdirSync(path.join(filesDir(), ".incoming"))).toEqual([]);

    const docs = await listDocuments(sourceA);
    expect(docs.ok && docs.data.map((d) => d.fileName)).toEqual(["paper.pdf"]);
    const opened = await openDocument(first.data.id);
    expect(opened.ok && opened.data.sizeBytes).toBe(pdf.length);
    if (opened.ok) opened.data.stream.destroy();
  });

  test.each([
    ["a text file named .pdf", Buffer.from("Alloy,P\n316L,200\n"), "unsupported_type", /not a PDF: its content is plain text/],
    ["a ZIP named .pdf", Buffer.from([0x50, 0x4b, 0x03, 0x04, 1, 2, 3]), "unsupported_type", /ZIP/],
    ["an empty file", Buffer.alloc(0), "invalid_input", /empty/],
  ])("%s is refused and nothing is stored", async (_label, bytes, code, message) => {
    const files = await count("StoredFile");
    const r = await attachPdfToSource(sourceA, [bytes], "fake.pdf", actor);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.error.code).toBe(code);
      expect(r.error.message).toMatch(message);
    }
    expect(await count("StoredFile")).toBe(files);
    expect(readdirSync(path.join(filesDir(), ".incoming"))).toEqual([]);
  });

  test("a file over the limit is refused while streaming", async () => {
    const big = makePdf([{ texts: Array.from({ length: 400 }, (_, i) => ({ text: `line ${i} of a long invented page`, x: 72, y: 800 - (i % 70) * 11 })) }]);
    const r = await attachPdfToSource(sourceA, [big], "big.pdf", actor, { limitBytes: 1000 });
    expect(!r.ok && r.error.code).toBe("too_large");
    expect(uploadLimitBytes({})).toBe(50 * 1024 * 1024);
    expect(uploadLimitBytes({ MELTLEDGER_UPLOAD_LIMIT_MB: "2" })).toBe(2 * 1024 * 1024);
  });

  test("a hostile file name is only a label; the stored path is the hash", async () => {
    const hostile = makePdf([{ texts: [{ text: "another invented page", x: 72, y: 700 }] }]);
    const r = await attachPdfToSource(sourceB, [hostile], "../../../etc/passwd\u0000.pdf", actor);
    if (!r.ok) throw new Error(r.error.message);
    expect(r.data.fileName).toBe("passwd.pdf");
    expect(existsSync(storedFilePath(r.data.sha256)!)).toBe(true);
    expect(storedFilePath("../../etc/passwd")).toBeNull();
    expect(safeDisplayName("C:\\Users\\x\\paper (final).pdf")).toBe("paper (final).pdf");
  });

  test("a missing source is not found", async () => {
    const r = await attachPdfToSource(99_999, [pdf], "paper.pdf", actor);
    expect(!r.ok && r.error.code).toBe("not_found");
  });

  test.each([
    [Buffer.from("%PDF-1.7\n"), "pdf"],
    [Buffer.concat([Buffer.from("junk before the header\n"), Buffer.from("%PDF-1.4")]), "pdf"],
    [Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]), "ole"],
    [Buffer.from([0x41, 0x00, 0x42]), "binary"],
    [Buffer.alloc(0), "empty"],
  ])("sniffFileKind %#", (bytes, kind) => {
    expect(sniffFileKind(bytes)).toBe(kind);
  });
});
});
