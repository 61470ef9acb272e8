import type { SqlExecutor } from "./sql";

export type PairVerdict = "distinct" | "merged";

export interface PairDecisionRow {
  id: number;
  recordAId: number;
  recordBId: number;
  decision: PairVerdict;
  reason: string | null;
  decidedById: number | null;
  decidedAt: string;
}

/** The key of an unordered pair: smaller id first. */
export function pairKey(a: number, b: number): string {
  return a < b ? `${a}|${b}` : `${b}|${a}`;
}

/** Every pair a reviewer marked distinct, as pairKey strings. The table holds only decisions, so it stays small. */
export async function distinctPairKeys(db: SqlExecutor): Promise<Set<string>> {
  const rows = await db.all<{ a: number; b: number }>(`SELECT "recordAId" AS a, "recordBId" AS b FROM "PairDecision" WHERE "decision" = 'distinct'`);
  return new Set(rows.map((r) => pairKey(r.a, r.b)));
}

export async function getPairDecision(db: SqlExecutor, a: number, b: number): Promise<PairDecisionRow | null> {
  const [x, y] = a < b ? [a, b] : [b, a];
  return (
    (await db.get<PairDecisionRow>(
      `SELECT "id", "recordAId", "recordBId", "decision", "reason", "decidedById", "decidedAt" FROM "PairDecision" WHERE "recordAId" = ? AND "recordBId" = ?`,
      [x, y],
    )) ?? null
  );
}

/** Records a verdict inside the caller's transaction; null when the pair already has one. */
export async function insertPairDecision(db: SqlExecutor, d: { a: number; b: number; decision: PairVerdict; reason: string | null; actorId: number | null; at: string }): Promise<number | null> {
  const [x, y] = d.a < d.b ? [d.a, d.b] : [d.b, d.a];
  const r = await db.run(
    `INSERT INTO "PairDecision" ("recordAId", "recordBId", "decision", "reason", "decidedById", "decidedAt") VALUES (?, ?, ?, ?, ?, ?) ON CONFLICT ("recordAId", "recordBId") DO NOTHING RETURNING "id"`,
    [x, y, d.decision, d.reason, d.actorId, d.at],
  );
  return r.changes ? r.lastInsertId : null;
}
