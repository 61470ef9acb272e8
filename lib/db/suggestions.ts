/**
 * Suggestion sets: the inputs, the seed and the suggestions of one request, kept so a set can be
 * shown, exported and reproduced later.
 */
import { prismaReady } from "./client";

export interface SuggestionSetRow {
  id: number;
  alloyKey: string;
  seed: number;
  inputs: unknown;
  suggestions: unknown;
  createdById: number | null;
  createdAt: Date;
}

function parse(text: string): unknown {
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return null;
  }
}

export async function insertSuggestionSet(row: { alloyKey: string; seed: number; inputs: unknown; suggestions: unknown; createdById: number | null }): Promise<SuggestionSetRow> {
  const db = await prismaReady();
  const r = await db.suggestionSet.create({
    data: { alloyKey: row.alloyKey, seed: row.seed, inputs: JSON.stringify(row.inputs), suggestions: JSON.stringify(row.suggestions), createdById: row.createdById },
  });
  return { ...r, inputs: row.inputs, suggestions: row.suggestions };
}

export async function getSuggestionSet(id: number): Promise<SuggestionSetRow | null> {
  const db = await prismaReady();
  const r = await db.suggestionSet.findUnique({ where: { id } });
  return r ? { ...r, inputs: parse(r.inputs), suggestions: parse(r.suggestions) } : null;
}

/** The newest sets, optionally of one alloy, without their suggestions. */
export async function listSuggestionSets(alloyKey: string | null, limit = 20): Promise<Omit<SuggestionSetRow, "suggestions">[]> {
  const db = await prismaReady();
  const rows = await db.suggestionSet.findMany({
    where: alloyKey ? { alloyKey } : {},
    orderBy: { id: "desc" },
    take: limit,
    select: { id: true, alloyKey: true, seed: true, inputs: true, createdById: true, createdAt: true },
  });
  return rows.map((r) => ({ ...r, inputs: parse(r.inputs) }));
}
