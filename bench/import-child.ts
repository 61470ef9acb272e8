// Runs one CSV import in a process of its own, so its peak memory is the import's alone.
// Usage: node --import tsx bench/import-child.ts FILE.csv DATABASE.db  -> prints {"ms":…,"maxRssBytes":…,"imported":…}
import { sqlite, closeSqlite } from "../lib/db/connection";
import { disconnectPrisma } from "../lib/db/client";
import { migrate } from "../lib/db/migrate";
import { localActor } from "../lib/server/actor";
import { commitImport } from "../lib/server/imports";

const [file, dbPath] = process.argv.slice(2);
if (!file || !dbPath) throw new Error("usage: import-child.ts FILE.csv DATABASE.db");
process.env.DATABASE_URL = `file:${dbPath}`;
migrate(sqlite());
const actor = await localActor();
const rssBefore = process.memoryUsage().rss;
let peak = rssBefore;
const sampler = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 20);
const t0 = performance.now();
const cpu0 = process.cpuUsage();
const r = await commitImport({ kind: "csv", path: file, fileName: "bench.csv" }, { mapping: null, onProgress: () => (peak = Math.max(peak, process.memoryUsage().rss)) }, actor);
const ms = performance.now() - t0;
const cpu = process.cpuUsage(cpu0);
clearInterval(sampler);
if (!r.ok) throw new Error(r.error.message);
await disconnectPrisma();
closeSqlite();
process.stdout.write(`${JSON.stringify({ ms, cpuMs: (cpu.user + cpu.system) / 1000, peakRssBytes: peak, rssBeforeBytes: rssBefore, maxRssBytes: process.resourceUsage().maxRSS * 1024, imported: r.data.imported, createdSources: r.data.createdSources.length, checksMs: r.data.checks?.ms ?? 0, flagsOpened: r.data.checks?.opened ?? 0 })}\n`);
