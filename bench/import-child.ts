// Runs one CSV import in a process of its own, so its peak memory is the import's alone.
// Usage: node --import tsx bench/import-child.ts FILE.csv DATABASE.db|postgresql://…  -> prints {"ms":…,"maxRssBytes":…,"imported":…}
// A postgresql:// URL names an empty database on a PostgreSQL server: it is migrated first.
import { sqlite, closeSqlite } from "../lib/db/connection";
import { disconnectPrisma } from "../lib/db/client";
import { migrate } from "../lib/db/migrate";
import { migratePostgres } from "../lib/db/migrate-postgres";
import { withPostgres } from "../lib/db/postgres";
import { closeSql } from "../lib/db/sql";
import { localActor } from "../lib/server/actor";
import { commitImport } from "../lib/server/imports";

const [file, database] = process.argv.slice(2);
if (!file || !database) throw new Error("usage: import-child.ts FILE.csv DATABASE.db|postgresql://…");
const postgres = /^postgres(ql)?:\/\//.test(database);
process.env.DATABASE_URL = postgres ? database : `file:${database}`;
if (postgres) await withPostgres(database, (client) => migratePostgres(client));
else migrate(sqlite());
const actor = await localActor();
const rssBefore = process.memoryUsage().rss;
let peak = rssBefore;
let writingStartedAt: number | null = null;
const sampler = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 20);
const t0 = performance.now();
const cpu0 = process.cpuUsage();
const r = await commitImport(
  { kind: "csv", path: file, fileName: "bench.csv" },
  {
    mapping: null,
    onProgress: (p) => {
      peak = Math.max(peak, process.memoryUsage().rss);
      if (p.phase === "writing") writingStartedAt ??= performance.now();
    },
  },
  actor,
);
const ms = performance.now() - t0;
const cpu = process.cpuUsage(cpu0);
clearInterval(sampler);
if (!r.ok) throw new Error(r.error.message);
await disconnectPrisma();
await closeSql();
if (!postgres) closeSqlite();
process.stdout.write(
  `${JSON.stringify({
    ms, cpuMs: (cpu.user + cpu.system) / 1000, readMs: (writingStartedAt ?? t0) - t0, peakRssBytes: peak, rssBeforeBytes: rssBefore, maxRssBytes: process.resourceUsage().maxRSS * 1024,
    imported: r.data.imported, createdSources: r.data.createdSources.length, checksMs: r.data.checks?.ms ?? 0, flagsOpened: r.data.checks?.opened ?? 0, checksRan: r.data.checks !== null,
  })}\n`,
);
