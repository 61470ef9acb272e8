// Import figures: a 100k-row CSV through the whole import (streamed parse, mapping, units,
// validation, sources from the DOI column, writes in one transaction) beside raw better-sqlite3
// inserts of the same rows, and the import's peak memory. With BENCH_POSTGRES_URL (a PostgreSQL
// server the bench may create and drop a database on, e.g. the one scripts/test-postgres.sh
// starts), also a 10k-row import on PostgreSQL.
import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, statSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { openSqlite } from "../lib/db/connection";
import { migrate } from "../lib/db/migrate";
import { RECORD_INSERT_SQL } from "../lib/db/records";
import { writeImportBenchCsv } from "./import-fixture";
import { withScratchPostgresDatabase } from "./postgres-scratch";
import type { BenchFigure, BenchSuite } from "./types";

const N = Number(process.env.BENCH_IMPORT_ROWS ?? 100_000);
const ROOT = path.resolve(import.meta.dirname, "..");
const PG_ROWS = Number(process.env.BENCH_IMPORT_PG_ROWS ?? 10_000);

interface ChildFigures {
  ms: number;
  readMs: number;
  peakRssBytes: number;
  maxRssBytes: number;
  imported: number;
  checksMs: number;
  flagsOpened: number;
  checksRan: boolean;
}

function runChild(csv: string, database: string): ChildFigures {
  const out = execFileSync(process.execPath, ["--import", "tsx", path.join(ROOT, "bench/import-child.ts"), csv, database], { cwd: ROOT, maxBuffer: 1 << 20 }).toString();
  return JSON.parse(out.trim().split("\n").pop()!) as ChildFigures;
}

/** The same import of a smaller CSV into a fresh database on a PostgreSQL server. */
async function postgresFigure(serverUrl: string, dir: string): Promise<BenchFigure> {
  const csv = path.join(dir, "bench-pg.csv");
  await writeImportBenchCsv(csv, PG_ROWS);
  return withScratchPostgresDatabase(serverUrl, async (url) => {
    const child = runChild(csv, url);
    if (child.imported !== PG_ROWS) throw new Error(`import wrote ${child.imported} of ${PG_ROWS} rows`);
    const seconds = child.ms / 1000;
    return {
      name: `import a ${PG_ROWS.toLocaleString("en")}-row CSV on PostgreSQL (the same steps, multi-row inserts in one serializable transaction)`,
      value: seconds,
      unit: "s",
      target: "seconds, not minutes (<= 30 s)",
      pass: seconds <= 30,
      notes: `reading and validating ${(child.readMs / 1000).toFixed(1)} s, ${child.checksRan ? `checks ${(child.checksMs / 1000).toFixed(1)} s` : "checks did not run"}`,
    };
  });
}

export const importBench: BenchSuite = async () => {
  const dir = mkdtempSync(path.join(os.tmpdir(), "meltledger-bench-import-"));
  try {
    const csv = path.join(dir, "bench.csv");
    await writeImportBenchCsv(csv, N);
    const importDb = path.join(dir, "import.db");
    const child = runChild(csv, importDb);
    if (child.imported !== N) throw new Error(`import wrote ${child.imported} of ${N} rows`);

    // Baseline: the very rows the import wrote, inserted again with one prepared statement in one transaction.
    const src = openSqlite(importDb, { readonly: true });
    const columns = RECORD_INSERT_SQL.slice(RECORD_INSERT_SQL.indexOf("(") + 1, RECORD_INSERT_SQL.indexOf(")")).split(",").map((c) => c.trim());
    const rows = src.prepare(`SELECT ${columns.join(", ")} FROM BuildRecord ORDER BY id`).raw().all() as unknown[][];
    const sourceCount = (src.prepare(`SELECT MAX(id) AS n FROM Source`).get() as { n: number }).n;
    const materialCount = (src.prepare(`SELECT MAX(id) AS n FROM Material`).get() as { n: number }).n;
    const runCount = (src.prepare(`SELECT MAX(id) AS n FROM ImportRun`).get() as { n: number }).n;
    src.close();
    const raw = openSqlite(path.join(dir, "raw.db"));
    migrate(raw);
    raw.exec(`INSERT INTO Source (kind, title, titleKey, updatedAt) VALUES ${Array.from({ length: sourceCount }, () => "('report','s','s','2026-01-01')").join(",")}`);
    raw.exec(`INSERT INTO Material (designation, alloyKey, fingerprint) VALUES ${Array.from({ length: materialCount }, (_, i) => `('m','m','f${i}')`).join(",")}`);
    raw.exec(`INSERT INTO ImportRun (fileName, format) VALUES ${Array.from({ length: runCount }, () => "('bench.csv','csv')").join(",")}`);
    const stmt = raw.prepare(RECORD_INSERT_SQL);
    const t0 = performance.now();
    raw.transaction(() => {
      for (const r of rows) stmt.run(...r);
    })();
    const rawMs = performance.now() - t0;
    raw.close();

    const seconds = child.ms / 1000;
    const peakMiB = Math.max(child.peakRssBytes, child.maxRssBytes) / 1024 / 1024;
    const ratio = child.ms / rawMs;
    const sizeMiB = statSync(csv).size / 1024 / 1024;
    const figures: BenchFigure[] = [
      {
        name: `import a ${N.toLocaleString("en")}-row CSV (${sizeMiB.toFixed(1)} MiB; streamed parse, mapping, units, validation, sources from DOIs, one transaction, then plausibility and duplicate checks)`,
        value: seconds,
        unit: "s",
        target: "<= 10 s",
        pass: seconds <= 10,
        baseline: { name: "raw better-sqlite3 inserts of the same rows, one transaction", value: rawMs / 1000, unit: "s" },
        ratio: { value: ratio },
        notes: `reading and validating the rows ${(child.readMs / 1000).toFixed(1)} s, checks ${(child.checksMs / 1000).toFixed(1)} s of it, ${child.flagsOpened.toLocaleString("en")} flags opened`,
      },
      {
        name: `peak memory (RSS) of the ${N.toLocaleString("en")}-row import process`,
        value: peakMiB,
        unit: "MiB",
        target: "< 1024 MiB",
        pass: peakMiB < 1024,
      },
    ];
    const pgServer = process.env.BENCH_POSTGRES_URL?.trim();
    if (pgServer) figures.push(await postgresFigure(pgServer, dir));
    return figures;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
};
