import type { Prisma } from "../generated/prisma/client";
import { prismaReady } from "./client";

type Tx = Prisma.TransactionClient;

export interface SourceRow {
  id: number;
  kind: string;
  title: string;
  titleKey: string;
  authors: string[];
  year: number | null;
  venue: string | null;
  doi: string | null;
  url: string | null;
  notes: string | null;
  densityMethod: string;
  outcomeEvidence: string;
  machineStated: boolean;
  spotSizeDefinition: string | null;
  powderReported: boolean;
  atmosphereReported: boolean;
  qualityOverride: number | null;
  qualityOverrideReason: string | null;
  version: number;
  createdAt: Date;
  updatedAt: Date;
}

export type SourceData = Omit<SourceRow, "id" | "version" | "createdAt" | "updatedAt" | "qualityOverride" | "qualityOverrideReason">;

type DbSource = Prisma.SourceGetPayload<object>;

/** The authors column (a JSON array of names) as a list; anything unreadable is no authors. */
export function parseAuthors(text: string): string[] {
  try {
    const parsed: unknown = JSON.parse(text);
    return Array.isArray(parsed) ? parsed.map(String) : [];
  } catch {
    return [];
  }
}

function toRow(s: DbSource): SourceRow {
  const authors = parseAuthors(s.authors);
  return {
    id: s.id, kind: s.kind, title: s.title, titleKey: s.titleKey, authors, year: s.year, venue: s.venue, doi: s.doi, url: s.url,
    notes: s.notes, densityMethod: s.densityMethod, outcomeEvidence: s.outcomeEvidence, machineStated: s.machineStated,
    spotSizeDefinition: s.spotSizeDefinition, powderReported: s.powderReported, atmosphereReported: s.atmosphereReported,
    qualityOverride: s.qualityOverride, qualityOverrideReason: s.qualityOverrideReason, version: s.version,
    createdAt: s.createdAt, updatedAt: s.updatedAt,
  };
}

const toData = (d: SourceData) => ({ ...d, authors: JSON.stringify(d.authors) });

export async function getSource(id: number): Promise<SourceRow | null> {
  const db = await prismaReady();
  const s = await db.source.findUnique({ where: { id } });
  return s ? toRow(s) : null;
}

export async function findSourceByDoi(doi: string): Promise<SourceRow | null> {
  const db = await prismaReady();
  const s = await db.source.findUnique({ where: { doi } });
  return s ? toRow(s) : null;
}

export async function findSourcesByTitleKey(titleKey: string, year: number | null): Promise<SourceRow[]> {
  const db = await prismaReady();
  const rows = await db.source.findMany({ where: { titleKey, year } });
  return rows.map(toRow);
}

export interface SourceListRow extends SourceRow {
  recordCount: number;
}

/** Every source, newest year first; sources without a year last (on both engines), then by id. */
export async function listSources(): Promise<SourceListRow[]> {
  const db = await prismaReady();
  const rows = await db.source.findMany({ orderBy: [{ year: { sort: "desc", nulls: "last" } }, { id: "asc" }], include: { _count: { select: { records: true } } } });
  return rows.map((s) => ({ ...toRow(s), recordCount: s._count.records }));
}

export async function insertSource(tx: Tx, data: SourceData, actorId: number | null): Promise<SourceRow> {
  const s = await tx.source.create({ data: { ...toData(data), createdById: actorId, updatedById: actorId } });
  return toRow(s);
}

/** Updates when `version` still matches; returns null when someone saved first. */
export async function updateSourceIfVersion(tx: Tx, id: number, version: number, data: SourceData, actorId: number | null): Promise<SourceRow | null> {
  const { count } = await tx.source.updateMany({ where: { id, version }, data: { ...toData(data), updatedById: actorId, version: { increment: 1 } } });
  if (count === 0) return null;
  const s = await tx.source.findUniqueOrThrow({ where: { id } });
  return toRow(s);
}

export async function getSourceTx(tx: Tx, id: number): Promise<SourceRow | null> {
  const s = await tx.source.findUnique({ where: { id } });
  return s ? toRow(s) : null;
}
