// Coverage figures: the coverage view over 100k records through the server use case (with the
// JSON the route sends) against the bare indexed SQL that fetches the same points, and a set of 50
// suggested experiments against the same bare query for the alloy. With BENCH_POSTGRES_URL (a
// PostgreSQL server the bench may create and drop a database on), the same records are copied
// there (`db copy`) and the coverage view is timed on PostgreSQL too, its reports compared with SQLite's.
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { closeSqlite, sqlite } from "../lib/db/connection";
import { disconnectPrisma } from "../lib/db/client";
import { COVERAGE_COLUMNS, coverageWhere } from "../lib/db/coverage";
import { migrate } from "../lib/db/migrate";
import { withPostgres } from "../lib/db/postgres";
import { closeSql } from "../lib/db/sql";
import { RECORD_FILTER_INDEX } from "../lib/db/records";
import { coverageQuerySchema } from "../lib/schemas/coverage";
import { localActor } from "../lib/server/actor";
import { clearCoverageCache, coverageJson, getCoverage } from "../lib/server/coverage";
import { copyDatabase } from "../lib/server/db-copy";
import { insertRecordsBulk } from "../lib/server/records-bulk";
import { createSource } from "../lib/server/sources";
import { createSuggestionSet } from "../lib/server/suggestions";
import { benchRecordInputs } from "./records-fixture";
import { withScratchPostgresDatabase } from "./postgres-scratch";
import type { BenchFigure, BenchSuite } from "./types";

const N = Number(process.env.BENCH_RECORDS ?? 100_000);

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

export const coverageBench: BenchSuite = async () => {
  await disconnectPrisma();
  closeSqlite();
  const dir = mkdtempSync(path.join(os.tmpdir(), "meltledger-bench-coverage-"));
  process.env.DATABASE_URL = `file:${path.join(dir, "bench.db")}`;
  const figures: BenchFigure[] = [];
  try {
    const db = sqlite();
    migrate(db);
    const actor = await localActor();
    const sourceIds: number[] = [];
    for (let i = 0; i < 10; i++) {
      const s = await createSource({ kind: "report", title: `Coverage benchmark source ${i}`, year: 2021, doi: `10.5555/bench.coverage.${i}` }, actor);
      if (!s.ok) throw new Error(s.error.message);
      sourceIds.push(s.data.id);
    }
    const inserted = await insertRecordsBulk(benchRecordInputs(N, sourceIds), actor, { deferChecks: true });
    if (!inserted.ok) throw new Error(inserted.error.message);
    db.exec("ANALYZE");

    // --- Coverage view ------------------------------------------------------------------------
    const queries = [
      { alloy: "316L" },
      { alloy: "IN718", hatch: "80-120um", layer: "30um" },
      { alloy: "Ti-6Al-4V", status: "needs_review", spot: "60-100um", k: "5", powerScale: "log" },
      {},
    ];
    const bare = (input: (typeof queries)[number]) => {
      const q = coverageQuerySchema.parse(input);
      const where = coverageWhere({ alloyKey: q.alloy, statuses: q.status, hatchSpacingUm: q.hatch, layerThicknessUm: q.layer, spotDiameterUm: q.spot });
      return { sql: `SELECT ${COVERAGE_COLUMNS} FROM BuildRecord INDEXED BY ${RECORD_FILTER_INDEX} ${where.sql}`, params: where.params };
    };
    const apiTimes: number[] = [];
    const coldTimes: number[] = [];
    const bareTimes: number[] = [];
    let points = 0;
    for (let round = 0; round < 12; round++) {
      for (const input of queries) {
        // Every third round draws each window anew, as a first visit to a plane does.
        const cold = round % 3 === 2;
        if (cold) clearCoverageCache();
        const ta = performance.now();
        const r = await getCoverage(input);
        if (!r.ok) throw new Error(r.error.message);
        JSON.stringify(r.data);
        const ms = performance.now() - ta;
        (cold ? coldTimes : apiTimes).push(ms);
        points = Math.max(points, r.data.nRecords);
        const { sql, params } = bare(input);
        const tb = performance.now();
        db.prepare(sql).raw(true).all(...params);
        bareTimes.push(performance.now() - tb);
      }
    }
    // The first round warms the statement cache, the window cache and the JIT.
    const apiMedian = median(apiTimes.slice(queries.length));
    const coldMedian = median(coldTimes);
    const bareMedian = median(bareTimes.slice(queries.length));
    // the reports of the last round, for the comparison with PostgreSQL
    const sqliteReports: string[] = [];
    for (const input of queries) {
      const r = await getCoverage(input);
      if (!r.ok) throw new Error(r.error.message);
      sqliteReports.push(JSON.stringify(coverageJson(r.data)));
    }
    figures.push({
      name: `coverage view over ${N.toLocaleString("en")} records through the server (grid, window, score, histograms, JSON), median of 4 selections`,
      value: apiMedian,
      unit: "ms",
      target: "<= 300 ms",
      pass: apiMedian <= 300,
      baseline: { name: "bare indexed SQL fetching the same points", value: bareMedian, unit: "ms" },
      ratio: { value: apiMedian / bareMedian },
      notes: `largest selection ${points.toLocaleString("en")} records; with the window drawn anew (no kept window): median ${coldMedian.toFixed(0)} ms`,
    });
    figures.push({
      name: "coverage view, window drawn anew each time (first visit to a plane), median",
      value: coldMedian,
      unit: "ms",
      target: "<= 300 ms",
      pass: coldMedian <= 300,
      baseline: { name: "bare indexed SQL fetching the same points", value: bareMedian, unit: "ms" },
      ratio: { value: coldMedian / bareMedian },
    });

    // --- 50 suggestions ------------------------------------------------------------------------
    const request = { alloy: "316L", n: 50, power: "50-400W", speed: "200-2000mm/s", hatch: "80, 100, 120um", layer: "30, 40um", k: 3 };
    const suggestTimes: number[] = [];
    let made = 0;
    for (let seed = 1; seed <= 5; seed++) {
      const t = performance.now();
      const r = await createSuggestionSet({ ...request, seed }, actor);
      suggestTimes.push(performance.now() - t);
      if (!r.ok) throw new Error(r.error.message);
      made = r.data.suggestions.length;
    }
    const { sql, params } = bare({ alloy: "316L" });
    const tb = performance.now();
    const rows = db.prepare(sql).raw(true).all(...params).length;
    const bareAlloy = performance.now() - tb;
    const suggestMedian = median(suggestTimes);
    figures.push({
      name: `50 suggested experiments (316L, ${rows.toLocaleString("en")} records, 3 hatch × 2 layer values), stored, median of 5 seeds`,
      value: suggestMedian / 1000,
      unit: "s",
      target: "<= 2 s",
      pass: suggestMedian <= 2000 && made === 50,
      baseline: { name: "bare indexed SQL fetching the alloy's points", value: bareAlloy / 1000, unit: "s" },
      ratio: { value: suggestMedian / bareAlloy },
      notes: `${made} suggestions in the last set`,
    });
    const pgServer = process.env.BENCH_POSTGRES_URL?.trim();
    if (pgServer) figures.push(await postgresFigure(pgServer, dir, queries, sqliteReports, apiMedian));
  } finally {
    await disconnectPrisma();
    await closeSql();
    closeSqlite();
    rmSync(dir, { recursive: true, force: true });
  }
  return figures;
};

/** The coverage view of the same selections on a PostgreSQL copy of the bench database. */
async function postgresFigure(serverUrl: string, dir: string, queries: readonly unknown[], sqliteReports: string[], sqliteMedian: number): Promise<BenchFigure> {
  const sqliteUrl = process.env.DATABASE_URL;
  return withScratchPostgresDatabase(serverUrl, async (url) => {
    try {
      await disconnectPrisma();
      closeSqlite();
      const copied = await copyDatabase({ from: `file:${path.join(dir, "bench.db")}`, to: url, filesTo: path.join(dir, "pg-files") });
      if (!copied.ok) throw new Error(copied.error.message);
      process.env.DATABASE_URL = url;
      await withPostgres(url, (c) => c.query("ANALYZE"));
      const times: number[] = [];
      const differ = new Set<number>();
      for (let round = 0; round < 6; round++) {
        for (const [i, input] of queries.entries()) {
          const t = performance.now();
          const r = await getCoverage(input);
          if (!r.ok) throw new Error(r.error.message);
          const json = JSON.stringify(coverageJson(r.data));
          times.push(performance.now() - t);
          if (json !== sqliteReports[i]) differ.add(i);
        }
      }
      const pgMedian = median(times.slice(queries.length));
      return {
        name: "the coverage view on PostgreSQL (records copied with db copy), window kept, median of 4 selections",
        value: pgMedian,
        unit: "ms",
        target: "the same reports as SQLite; <= 300 ms",
        pass: differ.size === 0 && pgMedian <= 300,
        baseline: { name: "the same on SQLite above", value: sqliteMedian, unit: "ms" },
        ratio: { value: pgMedian / sqliteMedian },
        notes: differ.size ? `reports that differ from SQLite's: selections ${[...differ].join(", ")}` : "every report the same as on SQLite",
      };
    } finally {
      await closeSql();
      await disconnectPrisma();
      process.env.DATABASE_URL = sqliteUrl;
    }
  });
}
