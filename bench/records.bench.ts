// Foundation figures: bulk insert through the server layer vs raw prepared inserts, and a
// filtered, sorted records-table page vs the bare indexed query.
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { closeSqlite, openSqlite, sqlite } from "../lib/db/connection";
import { disconnectPrisma } from "../lib/db/client";
import { migrate } from "../lib/db/migrate";
import { closeSql } from "../lib/db/sql";
import { RECORD_FILTER_INDEX, RECORD_INSERT_SQL, recordInsertValues, recordsOrderBy, recordsWhere, type RecordWrite } from "../lib/db/records";
import { localActor } from "../lib/server/actor";
import { listRecords } from "../lib/server/records";
import { insertRecordsBulk } from "../lib/server/records-bulk";
import { createSource } from "../lib/server/sources";
import { prepareRecord } from "../lib/server/record-write";
import { recordInputSchema } from "../lib/schemas/record";
import { recordsQuerySchema } from "../lib/schemas/records-query";
import { benchRecordInputs } from "./records-fixture";
import type { BenchFigure, BenchSuite } from "./types";

const N = Number(process.env.BENCH_RECORDS ?? 100_000);

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

async function freshDatabase(label: string): Promise<{ dir: string }> {
  await closeSql();
  await disconnectPrisma();
  closeSqlite();
  const dir = mkdtempSync(path.join(os.tmpdir(), `meltledger-bench-${label}-`));
  process.env.DATABASE_URL = `file:${path.join(dir, "bench.db")}`;
  migrate(sqlite());
  return { dir };
}

export const recordsBench: BenchSuite = async () => {
  const figures: BenchFigure[] = [];

  // --- Insert through the server layer -------------------------------------------------------
  const serverDb = await freshDatabase("server");
  const actor = await localActor();
  const sourceIds: number[] = [];
  for (let i = 0; i < 10; i++) {
    const s = await createSource({ kind: "report", title: `Benchmark source ${i}`, year: 2020, doi: `10.5555/bench.${i}` }, actor);
    if (!s.ok) throw new Error(s.error.message);
    sourceIds.push(s.data.id);
  }
  const inputs = benchRecordInputs(N, sourceIds);
  // The baseline writes the same canonical rows; preparing them is not part of its time.
  const materialIds = new Map<string, number>();
  const canonical: RecordWrite[] = inputs.map((input) => {
    const p = prepareRecord(recordInputSchema.parse(input));
    if (!p.ok) throw new Error("bench input invalid");
    const key = p.material.alloyKey;
    if (!materialIds.has(key)) materialIds.set(key, materialIds.size + 1);
    return { ...p.write, materialId: materialIds.get(key)! };
  });

  const t0 = performance.now();
  // Validation and normalization only: the checks that normally follow a save have their own figure (checks suite).
  const inserted = await insertRecordsBulk(inputs, actor, { deferChecks: true });
  const serverMs = performance.now() - t0;
  if (!inserted.ok) throw new Error(inserted.error.message);

  const rawDir = mkdtempSync(path.join(os.tmpdir(), "meltledger-bench-raw-"));
  const raw = openSqlite(path.join(rawDir, "raw.db"));
  migrate(raw);
  raw.exec(`INSERT INTO Source (kind, title, titleKey, updatedAt) VALUES ${sourceIds.map(() => "('report','s','s','2026-01-01')").join(",")}`);
  raw.exec(`INSERT INTO Material (designation, alloyKey, fingerprint) VALUES ${[...materialIds.keys()].map((k, i) => `('${k}','${k}','f${i}')`).join(",")}`);
  const stmt = raw.prepare(RECORD_INSERT_SQL);
  const at = new Date().toISOString();
  const t1 = performance.now();
  raw.transaction(() => {
    for (const r of canonical) stmt.run(...recordInsertValues(r, null, at));
  })();
  const rawMs = performance.now() - t1;
  raw.close();
  rmSync(rawDir, { recursive: true, force: true });

  const insertRatio = serverMs / rawMs;
  figures.push({
    name: `insert ${N.toLocaleString("en")} records through the server layer (validation + normalization; checks deferred)`,
    value: serverMs / 1000,
    unit: "s",
    target: "ratio <= 5 to raw inserts",
    pass: insertRatio <= 5,
    baseline: { name: "raw better-sqlite3 prepared inserts, one transaction", value: rawMs / 1000, unit: "s" },
    ratio: { value: insertRatio, target: "<= 5", pass: insertRatio <= 5 },
  });

  // --- Records table page over the same database ----------------------------------------------
  const db = sqlite();
  db.exec("ANALYZE");
  const queries = [
    { alloy: ["316L"], sort: "laserPowerW", direction: "desc", page: 3, pageSize: 100 },
    { alloy: ["IN718", "AlSi10Mg"], outcome: ["dense"], ranges: { laserPowerW: { min: 150, max: 300 } }, sort: "scanSpeedMmPerS", direction: "asc", page: 1, pageSize: 100 },
    { status: ["needs_review"], ranges: { volumetricEnergyJMm3: { min: 40, max: 120 } }, sort: "volumetricEnergyJMm3", direction: "desc", page: 0, pageSize: 100 },
    { sourceId: [sourceIds[2]!], sort: "id", direction: "asc", page: 5, pageSize: 100 },
  ] as const;
  const apiTimes: number[] = [];
  const bareTimes: number[] = [];
  const selectTimes: number[] = [];
  for (let round = 0; round < 15; round++) {
    for (const q of queries) {
      const ta = performance.now();
      const r = await listRecords(q);
      apiTimes.push(performance.now() - ta);
      if (!r.ok) throw new Error(r.error.message);
      const parsed = recordsQuerySchema.parse(q);
      const where = recordsWhere(parsed);
      // The bare SQL a page needs — its total and its rows — prepared and run directly.
      const tb = performance.now();
      db.prepare(`SELECT COUNT(*) AS n FROM BuildRecord r INDEXED BY ${RECORD_FILTER_INDEX} ${where.sql}`).get(...where.params);
      const tc = performance.now();
      db.prepare(`SELECT r.* FROM BuildRecord r ${where.sql} ${recordsOrderBy(parsed, "sqlite")} LIMIT ? OFFSET ?`).all(...where.params, parsed.pageSize, parsed.page * parsed.pageSize);
      const td = performance.now();
      bareTimes.push(td - tb);
      selectTimes.push(td - tc);
    }
  }
  const apiMedian = median(apiTimes.slice(queries.length));
  const bareMedian = median(bareTimes.slice(queries.length));
  const pageRatio = apiMedian / bareMedian;
  figures.push({
    name: `records-table page over ${N.toLocaleString("en")} records (filtered, sorted, with total count), median`,
    value: apiMedian,
    unit: "ms",
    target: "<= 50 ms; ratio <= 3",
    pass: apiMedian <= 50 && pageRatio <= 3,
    baseline: { name: "bare indexed SQL (count + page select)", value: bareMedian, unit: "ms" },
    ratio: { value: pageRatio, target: "<= 3", pass: pageRatio <= 3 },
    notes: `page select alone: median ${median(selectTimes.slice(queries.length)).toFixed(2)} ms`,
  });

  await closeSql();
  await disconnectPrisma();
  closeSqlite();
  rmSync(serverDb.dir, { recursive: true, force: true });
  return figures;
};
