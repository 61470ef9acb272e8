import type { Prisma } from "../generated/prisma/client";
import type { SqliteDatabase } from "./connection";

type Tx = Prisma.TransactionClient;

export interface MaterialSpec {
  designation: string;
  alloyKey: string;
  basis: "wt" | "at";
  compositionKind: "nominal" | "measured";
  components: { element: string; amount: number; isBalance: boolean }[];
}

/** One row per distinct (designation, alloy, basis, kind, composition): records share it. */
export function materialFingerprint(m: MaterialSpec): string {
  const comp = [...m.components]
    .sort((a, b) => a.element.localeCompare(b.element))
    .map((c) => `${c.element}:${c.isBalance ? "bal" : c.amount.toFixed(4)}`)
    .join(",");
  return `${m.designation}|${m.alloyKey}|${m.basis}|${m.compositionKind}|${comp}`;
}

export async function findOrCreateMaterial(tx: Tx, m: MaterialSpec): Promise<number> {
  const fingerprint = materialFingerprint(m);
  const found = await tx.material.findUnique({ where: { fingerprint }, select: { id: true } });
  if (found) return found.id;
  const created = await tx.material.create({
    data: {
      designation: m.designation,
      alloyKey: m.alloyKey,
      basis: m.basis,
      compositionKind: m.compositionKind,
      fingerprint,
      components: { create: m.components.map((c) => ({ element: c.element, amount: c.amount, isBalance: c.isBalance })) },
    },
    select: { id: true },
  });
  return created.id;
}

/** The same on the raw connection, for bulk writes already inside a better-sqlite3 transaction. */
// Bulk writes hand the same spec object for every row of one alloy (record-write memoizes them):
// its fingerprint is worked out once.
const fingerprintOf = new WeakMap<MaterialSpec, string>();

export function findOrCreateMaterialRaw(db: SqliteDatabase, m: MaterialSpec, cache: Map<string, number>): number {
  let fingerprint = fingerprintOf.get(m);
  if (fingerprint === undefined) fingerprintOf.set(m, (fingerprint = materialFingerprint(m)));
  const cached = cache.get(fingerprint);
  if (cached !== undefined) return cached;
  const found = db.prepare(`SELECT id FROM Material WHERE fingerprint = ?`).get(fingerprint) as { id: number } | undefined;
  let id: number;
  if (found) id = found.id;
  else {
    id = Number(
      db.prepare(`INSERT INTO Material (designation, alloyKey, basis, compositionKind, fingerprint, createdAt) VALUES (?, ?, ?, ?, ?, ?)`)
        .run(m.designation, m.alloyKey, m.basis, m.compositionKind, fingerprint, new Date().toISOString().replace("Z", "+00:00")).lastInsertRowid,
    );
    const comp = db.prepare(`INSERT INTO MaterialComponent (materialId, element, amount, isBalance) VALUES (?, ?, ?, ?)`);
    for (const c of m.components) comp.run(id, c.element, c.amount, c.isBalance ? 1 : 0);
  }
  cache.set(fingerprint, id);
  return id;
}

export interface MaterialRow {
  id: number;
  designation: string;
  alloyKey: string;
  basis: string;
  compositionKind: string;
  components: { element: string; amount: number; isBalance: boolean }[];
}
