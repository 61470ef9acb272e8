// Records for tests that run on both engines: the inputs go through the same validation and
// normalization as every save (prepareBulkRow: units, decimal commas, alloy names, E_v) and are
// written with the engine-neutral SQL interface, one transaction, at a fixed time — so the same
// inputs give the same rows, ids included, on SQLite and on PostgreSQL. Checks are not run (as
// with the bulk insert's deferChecks): quality scores stay empty.
import { execFile } from "node:child_process";
import path from "node:path";
import { promisify } from "node:util";
import { materialFingerprint } from "@/lib/db/materials";
import { sql, type SqlValue } from "@/lib/db/sql";
import { prepareBulkRow } from "@/lib/server/records-bulk";
import type { CliRun } from "./cli";

const COLUMNS = [
  "sourceId", "locationPage", "locationLabel", "materialId", "alloyKey", "machine", "laserPowerW", "scanSpeedMmPerS", "hatchSpacingUm",
  "layerThicknessUm", "spotDiameterUm", "spotDefinition", "preheatC", "atmosphere", "scanStrategy", "powderD10Um", "powderD50Um",
  "powderD90Um", "outcome", "outcomeText", "relativeDensityPct", "volumetricEnergyJMm3", "enteredValues", "status", "qualityScore",
  "createdById", "updatedById", "createdAt", "updatedAt",
] as const;
const INSERT = `INSERT INTO "BuildRecord" (${COLUMNS.map((c) => `"${c}"`).join(", ")}) VALUES (${COLUMNS.map(() => "?").join(", ")}) RETURNING "id"`;

/** Writes the records (all or none); throws naming the first input that does not validate. Returns the ids in input order. */
export async function writeRecordsForTest(inputs: readonly unknown[], options: { actorId?: number | null; at?: Date } = {}): Promise<number[]> {
  const prepared = inputs.map((input, i) => {
    const r = prepareBulkRow(input, i + 1);
    if (!r.ok) throw new Error(`writeRecordsForTest: input ${i + 1}: ${r.errors.map((e) => `${e.field}: ${e.message}`).join("; ")}`);
    return r.prepared;
  });
  const at = options.at ?? new Date("2026-11-30T09:00:00.000Z");
  const actorId = options.actorId ?? null;
  return sql().transaction(async (tx) => {
    const materials = new Map<string, number>();
    const ids: number[] = [];
    for (const { write: w, material: m } of prepared) {
      const fingerprint = materialFingerprint(m);
      let materialId = materials.get(fingerprint);
      if (materialId === undefined) {
        const inserted = await tx.run(
          `INSERT INTO "Material" ("designation", "alloyKey", "basis", "compositionKind", "fingerprint", "createdAt") VALUES (?, ?, ?, ?, ?, ?) ON CONFLICT ("fingerprint") DO NOTHING RETURNING "id"`,
          [m.designation, m.alloyKey, m.basis, m.compositionKind, fingerprint, at],
        );
        if (inserted.lastInsertId !== null) {
          for (const c of m.components) await tx.run(`INSERT INTO "MaterialComponent" ("materialId", "element", "amount", "isBalance") VALUES (?, ?, ?, ?)`, [inserted.lastInsertId, c.element, c.amount, c.isBalance]);
        }
        materialId = inserted.lastInsertId ?? (await tx.get<{ id: number }>(`SELECT "id" FROM "Material" WHERE "fingerprint" = ?`, [fingerprint]))!.id;
        materials.set(fingerprint, materialId);
      }
      const values: SqlValue[] = [
        w.sourceId, w.locationPage, w.locationLabel, materialId, w.alloyKey, w.machine, w.laserPowerW, w.scanSpeedMmPerS, w.hatchSpacingUm,
        w.layerThicknessUm, w.spotDiameterUm, w.spotDefinition, w.preheatC, w.atmosphere, w.scanStrategy, w.powderD10Um, w.powderD50Um,
        w.powderD90Um, w.outcome, w.outcomeText, w.relativeDensityPct, w.volumetricEnergyJMm3, JSON.stringify(w.enteredValues), w.status, w.qualityScore,
        actorId, actorId, at, at,
      ];
      ids.push((await tx.run(INSERT, values)).lastInsertId!);
    }
    return ids;
  });
}

/**
 * TEST HELPER ONLY: marks records awaiting review accepted, standing in for a reviewer working
 * through the queue (exports read accepted records only by default). Returns how many changed.
 */
export async function acceptAllForTest(): Promise<number> {
  return (await sql().run(`UPDATE "BuildRecord" SET "status" = 'accepted', "version" = "version" + 1 WHERE "status" = 'needs_review'`)).changes;
}

const run = promisify(execFile);
const BIN = path.resolve(import.meta.dirname, "../../bin/meltledger.mjs");

/** The real `meltledger` command in a child process, on the database DATABASE_URL names when it is called; never throws on a non-zero exit. */
export async function cliHere(...args: string[]): Promise<CliRun> {
  try {
    const { stdout, stderr } = await run(process.execPath, [BIN, ...args], { env: { ...process.env }, maxBuffer: 64 * 1024 * 1024 });
    return { code: 0, stdout, stderr };
  } catch (error) {
    const e = error as CliRun;
    return { code: e.code, stdout: e.stdout, stderr: e.stderr };
  }
}
