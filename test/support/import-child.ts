// A process that imports one CSV through lib/server and prints its progress as JSON lines, so a
// test can kill it at a chosen point. Usage: node --import tsx test/support/import-child.ts FILE.csv DATABASE.db
import { sqlite } from "../../lib/db/connection";
import { migrate } from "../../lib/db/migrate";
import { localActor } from "../../lib/server/actor";
import { commitImport } from "../../lib/server/imports";

const [file, dbPath] = process.argv.slice(2);
if (!file || !dbPath) throw new Error("usage: import-child.ts FILE.csv DATABASE.db");
process.env.DATABASE_URL = `file:${dbPath}`;
migrate(sqlite());
const actor = await localActor();
let last = -1;
const r = await commitImport(
  { kind: "csv", path: file, fileName: "faults.csv" },
  {
    mapping: null,
    deferChecks: true,
    onProgress: (p) => {
      if (p.phase !== "reading" || p.rowsWritten - last >= 500) {
        last = p.rowsWritten;
        process.stdout.write(`${JSON.stringify(p)}\n`);
      }
    },
  },
  actor,
);
process.stdout.write(`${JSON.stringify({ phase: "result", ok: r.ok, imported: r.ok ? r.data.imported : 0 })}\n`);
