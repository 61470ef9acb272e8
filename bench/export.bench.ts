// Training-set export of 100k records with every feature group (melt-pool physics included) and
// SMOTE, end to end through the server layer (read, filter, label, split, fill, physics, SMOTE,
// CSV + Parquet + datasheet + manifest, write, record), against pandas + imbalanced-learn doing
// the same filter, SMOTE and CSV write on the same rows and columns in the same run. Each side runs
// in a process of its own. With BENCH_POSTGRES_URL (a PostgreSQL server the bench may create and
// drop a database on, e.g. the one scripts/test-postgres.sh starts), the same records are copied
// there (`db copy`) and exported again, and the two exports' files must be byte-identical.
import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { parse } from "csv-parse/sync";
import { closeSqlite, sqlite } from "../lib/db/connection";
import { disconnectPrisma } from "../lib/db/client";
import { migrate } from "../lib/db/migrate";
import { copyDatabase } from "../lib/server/db-copy";
import { localActor } from "../lib/server/actor";
import { insertRecordsBulk } from "../lib/server/records-bulk";
import { createSource } from "../lib/server/sources";
import { benchRecordInputs } from "./records-fixture";
import { withScratchPostgresDatabase } from "./postgres-scratch";
import type { BenchFigure, BenchSuite } from "./types";

const N = Number(process.env.BENCH_EXPORT_RECORDS ?? 100_000);
const SEED = 7;
const ROOT = path.resolve(import.meta.dirname, "..");

interface ChildSummary {
  ms: number;
  timings: Record<string, number>;
  counts: { synthetic: Record<string, Record<string, number>> };
  folder: string;
  files: { name: string; sha256: string }[];
}

function runChild(database: string, requestFile: string, env: NodeJS.ProcessEnv = process.env): ChildSummary {
  const out = execFileSync(process.execPath, ["--import", "tsx", path.join(ROOT, "bench/export-child.ts"), database, requestFile], { cwd: ROOT, env, maxBuffer: 1 << 24 }).toString();
  return JSON.parse(out.trim().split("\n").pop()!) as ChildSummary;
}

/** The same export on PostgreSQL, from a copy of the same database. */
async function postgresFigure(serverUrl: string, dir: string, requestFile: string, sqliteRun: ChildSummary): Promise<BenchFigure> {
  return withScratchPostgresDatabase(serverUrl, async (url) => {
    const filesTo = path.join(dir, "pg-files");
    const copied = await copyDatabase({ from: `file:${path.join(dir, "bench.db")}`, to: url, filesTo });
    if (!copied.ok) throw new Error(copied.error.message);
    // the SQLite run's record (ExportRun "bench") came along with the copy: this one gets another name
    writeFileSync(requestFile, JSON.stringify({ ...JSON.parse(readFileSync(requestFile, "utf8")), name: "bench-pg" }));
    const pg = runChild(url, requestFile, { ...process.env, MELTLEDGER_FILES_DIR: filesTo });
    const differ = pg.files.filter((f) => sqliteRun.files.find((g) => g.name === f.name)?.sha256 !== f.sha256).map((f) => f.name);
    const seconds = pg.ms / 1000;
    return {
      name: `the same export on PostgreSQL (records copied with db copy), files compared with the SQLite run's`,
      value: seconds,
      unit: "s",
      target: "byte-identical files; seconds, not minutes (<= 30 s)",
      pass: differ.length === 0 && seconds <= 30,
      baseline: { name: "the export on SQLite above", value: sqliteRun.ms / 1000, unit: "s" },
      ratio: { value: pg.ms / sqliteRun.ms },
      notes: `${differ.length ? `files that differ: ${differ.join(", ")}` : "every file byte-identical"}; ${Object.entries(pg.timings).map(([k, v]) => `${k} ${(v / 1000).toFixed(2)} s`).join(", ")}`,
    };
  });
}

export const exportBench: BenchSuite = async () => {
  await disconnectPrisma();
  closeSqlite();
  const dir = mkdtempSync(path.join(os.tmpdir(), "meltledger-bench-export-"));
  process.env.DATABASE_URL = `file:${path.join(dir, "bench.db")}`;
  migrate(sqlite());
  const actor = await localActor();
  const sourceIds: number[] = [];
  for (let i = 0; i < 40; i++) {
    const s = await createSource({ kind: "journal_article", title: `Export benchmark source ${i}`, year: 2010 + (i % 15), doi: `10.5555/bench.export.${i}` }, actor);
    if (!s.ok) throw new Error(s.error.message);
    sourceIds.push(s.data.id);
  }
  const inserted = await insertRecordsBulk(benchRecordInputs(N, sourceIds), actor, { deferChecks: true });
  if (!inserted.ok) throw new Error(inserted.error.message);
  // The fixture's records await review; the benchmark stands in for the reviewer.
  sqlite().prepare(`UPDATE BuildRecord SET status = 'accepted'`).run();

  const request = { label: "binary", balance: "smote", k: 5, maxSyntheticMultiple: 1000, split: "source:0.7,0.15,0.15", seed: SEED };
  // The export runs in a process of its own (as the baseline does), after the set-up has closed the database.
  await disconnectPrisma();
  closeSqlite();
  const requestFile = path.join(dir, "request.json");
  writeFileSync(requestFile, JSON.stringify({ ...request, name: "bench" }));
  const ours = runChild(path.join(dir, "bench.db"), requestFile);
  const synthetic = Object.values(ours.counts.synthetic).reduce((s, m) => s + Object.values(m).reduce((a, n) => a + n, 0), 0);

  // Baseline input: the same real rows and columns, plus the status the filter reads.
  const baseDir = path.join(dir, "baseline");
  mkdirSync(baseDir);
  const header = readFileSync(path.join(ours.folder, "train.csv"), "utf8").split("\n", 1)[0]!;
  const lines = [`${header},status`];
  for (const split of ["train", "validation", "test"]) {
    const text = readFileSync(path.join(ours.folder, `${split}.csv`), "utf8");
    const rows = parse(text, { from_line: 2, raw: true, relax_column_count: true }) as unknown as { raw: string; record: string[] }[];
    const synthCol = header.split(",").indexOf("is_synthetic");
    for (const row of rows) if (row.record[synthCol] === "0") lines.push(`${row.raw.replace(/\r?\n$/, "")},accepted`);
  }
  const input = path.join(baseDir, "input.csv");
  writeFileSync(input, `${lines.join("\n")}\n`);
  const base = JSON.parse(execFileSync("/usr/bin/python3", [path.resolve(import.meta.dirname, "export_baseline.py"), input, baseDir, String(SEED)], { encoding: "utf8", maxBuffer: 1 << 26 })) as { seconds: number; synthetic: number };

  const seconds = ours.ms / 1000;
  const ratio = seconds / base.seconds;
  const timing = Object.entries(ours.timings).map(([k, v]) => `${k} ${(v / 1000).toFixed(2)} s`).join(", ");
  const figures: BenchFigure[] = [
    {
      name: `export ${N.toLocaleString("en")} records, all feature groups (melt-pool physics), SMOTE k=5, CSV + Parquet + datasheet`,
      value: seconds,
      unit: "s",
      target: "<= 5 s; ratio <= 1.0",
      pass: seconds <= 5,
      baseline: { name: "pandas + imbalanced-learn: filter, SMOTE per alloy, CSV write (same rows and columns)", value: base.seconds, unit: "s" },
      ratio: { value: ratio, target: "<= 1.0", pass: ratio <= 1 },
      notes: `${synthetic} synthetic rows (baseline ${base.synthetic}); ${timing}`,
    },
  ];
  const pgServer = process.env.BENCH_POSTGRES_URL?.trim();
  if (pgServer) figures.push(await postgresFigure(pgServer, dir, requestFile, ours));
  await disconnectPrisma();
  closeSqlite();
  rmSync(dir, { recursive: true, force: true });
  return figures;
};
