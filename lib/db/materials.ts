import type { Prisma } from "../generated/prisma/client";
import type { SqlExecutor } from "./sql";

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

// Bulk writes hand the same spec object for every row of one alloy (record-write memoizes them):
// its fingerprint is worked out once.
const fingerprintOf = new WeakMap<MaterialSpec, string>();

/**
 * The material's id, created with its components when it is new: findOrCreateMaterial for the bulk
 * paths, inside the caller's transaction on either engine (sql.ts). `cache` (fingerprint -> id) is
 * the caller's for one transaction, so each material is looked up once per batch.
 */
export async function materialIdFor(db: SqlExecutor, m: MaterialSpec, cache: Map<string, number>): Promise<number> {
  let fingerprint = fingerprintOf.get(m);
  if (fingerprint === undefined) fingerprintOf.set(m, (fingerprint = materialFingerprint(m)));
  const cached = cache.get(fingerprint);
  if (cached !== undefined) return cached;
  // DO NOTHING when another writer has it already: that row is read below
  const created = await db.run(
    `INSERT INTO "Material" ("designation", "alloyKey", "basis", "compositionKind", "fingerprint", "createdAt") VALUES (?, ?, ?, ?, ?, ?) ON CONFLICT ("fingerprint") DO NOTHING RETURNING "id"`,
    [m.designation, m.alloyKey, m.basis, m.compositionKind, fingerprint, new Date()],
  );
  let id: number;
  if (created.lastInsertId !== null) {
    id = created.lastInsertId;
    for (const c of m.components) {
      await db.run(`INSERT INTO "MaterialComponent" ("materialId", "element", "amount", "isBalance") VALUES (?, ?, ?, ?)`, [id, c.element, c.amount, c.isBalance]);
    }
  } else {
    id = (await db.get<{ id: number }>(`SELECT "id" FROM "Material" WHERE "fingerprint" = ?`, [fingerprint]))!.id;
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
