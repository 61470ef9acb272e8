import type { SqliteDatabase } from "./connection";

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
export function distinctPairKeys(db: SqliteDatabase): Set<string> {
  const rows = db.prepare(`SELECT recordAId AS a, recordBId AS b FROM PairDecision WHERE decision = 'distinct'`).all() as { a: number; b: number }[];
  return new Set(rows.map((r) => pairKey(r.a, r.b)));
}

export function getPairDecision(db: SqliteDatabase, a: number, b: number): PairDecisionRow | null {
  const [x, y] = a < b ? [a, b] : [b, a];
  return (db.prepare(`SELECT * FROM PairDecision WHERE recordAId = ? AND recordBId = ?`).get(x, y) as PairDecisionRow | undefined) ?? null;
}

/** Records a verdict inside the caller's transaction; null when the pair already has one. */
export function insertPairDecision(db: SqliteDatabase, d: { a: number; b: number; decision: PairVerdict; reason: string | null; actorId: number | null; at: string }): number | null {
  const [x, y] = d.a < d.b ? [d.a, d.b] : [d.b, d.a];
  const r = db.prepare(`INSERT INTO PairDecision (recordAId, recordBId, decision, reason, decidedById, decidedAt) VALUES (?, ?, ?, ?, ?, ?) ON CONFLICT (recordAId, recordBId) DO NOTHING`).run(x, y, d.decision, d.reason, d.actorId, d.at);
  return r.changes ? Number(r.lastInsertRowid) : null;
}
