import { appendAudit } from "./audit";
import { prismaReady } from "./client";

export interface SourceDocumentRow {
  id: number;
  sourceId: number;
  sha256: string;
  fileName: string;
  sizeBytes: number;
  mimeType: string;
  uploadedAt: Date;
}

/**
 * Records a stored file (once per content) and its link to a source (once per source and content).
 * Returns the document and whether the source already had this exact file.
 */
export async function attachStoredFile(sourceId: number, file: { sha256: string; sizeBytes: number; mimeType: string; fileName: string }, actor: { id: number | null; name: string }): Promise<{ document: SourceDocumentRow; alreadyAttached: boolean }> {
  const db = await prismaReady();
  return db.$transaction(async (tx) => {
    await tx.storedFile.upsert({ where: { sha256: file.sha256 }, create: { sha256: file.sha256, sizeBytes: file.sizeBytes, mimeType: file.mimeType }, update: {} });
    const existing = await tx.sourceDocument.findUnique({ where: { sourceId_sha256: { sourceId, sha256: file.sha256 } }, include: { file: true } });
    if (existing) return { document: toRow(existing), alreadyAttached: true };
    const created = await tx.sourceDocument.create({ data: { sourceId, sha256: file.sha256, fileName: file.fileName, uploadedById: actor.id }, include: { file: true } });
    await appendAudit(tx, { actorId: actor.id, actorName: actor.name, action: "attach_document", entityType: "source", entityId: sourceId, after: { documentId: created.id, sha256: file.sha256, fileName: file.fileName } });
    return { document: toRow(created), alreadyAttached: false };
  });
}

/** Records a stored file that belongs to no source (an imported spreadsheet). */
export async function recordStoredFile(file: { sha256: string; sizeBytes: number; mimeType: string }): Promise<void> {
  const db = await prismaReady();
  await db.storedFile.upsert({ where: { sha256: file.sha256 }, create: file, update: {} });
}

type DocWithFile = { id: number; sourceId: number; sha256: string; fileName: string; uploadedAt: Date; file: { sizeBytes: number; mimeType: string } };

function toRow(d: DocWithFile): SourceDocumentRow {
  return { id: d.id, sourceId: d.sourceId, sha256: d.sha256, fileName: d.fileName, sizeBytes: d.file.sizeBytes, mimeType: d.file.mimeType, uploadedAt: d.uploadedAt };
}

export async function listSourceDocuments(sourceId: number): Promise<SourceDocumentRow[]> {
  const db = await prismaReady();
  const rows = await db.sourceDocument.findMany({ where: { sourceId }, include: { file: true }, orderBy: { id: "asc" } });
  return rows.map(toRow);
}

export async function getSourceDocument(id: number): Promise<SourceDocumentRow | null> {
  const db = await prismaReady();
  const d = await db.sourceDocument.findUnique({ where: { id }, include: { file: true } });
  return d ? toRow(d) : null;
}
