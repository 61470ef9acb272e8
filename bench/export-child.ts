// Runs one training-set export in a process of its own, as the pandas baseline runs in its own:
// neither side carries the heap of the set-up that wrote the records.
// Usage: node --import tsx bench/export-child.ts DATABASE.db|postgresql://… REQUEST.json  -> prints the export summary as JSON
import { readFileSync } from "node:fs";
import { closeSqlite } from "../lib/db/connection";
import { disconnectPrisma } from "../lib/db/client";
import { closeSql } from "../lib/db/sql";
import { localActor } from "../lib/server/actor";
import { createExport } from "../lib/server/exports";

const [dbPath, requestFile] = process.argv.slice(2);
if (!dbPath || !requestFile) throw new Error("usage: export-child.ts DATABASE.db|postgresql://… REQUEST.json");
process.env.DATABASE_URL = /^postgres(ql)?:\/\//.test(dbPath) ? dbPath : `file:${dbPath}`;
const actor = await localActor();
const r = await createExport(JSON.parse(readFileSync(requestFile, "utf8")), actor);
if (!r.ok) throw new Error(r.error.message);
await disconnectPrisma();
await closeSql();
closeSqlite();
process.stdout.write(`${JSON.stringify({ ms: r.data.ms, timings: r.data.timings, counts: r.data.counts, folder: r.data.folder, files: r.data.files.map((f) => ({ name: f.name, sha256: f.sha256 })) })}\n`);
