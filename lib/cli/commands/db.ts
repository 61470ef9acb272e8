import { migrateDatabase } from "../../server/maintenance";
import { seedDatabase } from "../../../seed/seed";
import { parseCli, reportError } from "../args";
import type { CliCommand } from "../types";

const USAGE = "meltledger db migrate | meltledger db seed [--reset] [--if-empty] [--json]";

/** `meltledger db migrate` and `meltledger db seed [--reset] [--if-empty]`. */
export const db: CliCommand = async (argv, io) => {
  const [sub, ...rest] = argv;
  const parsed = parseCli(rest, { reset: { type: "boolean" }, "if-empty": { type: "boolean" }, json: { type: "boolean" } }, io, USAGE);
  if (!parsed.ok) return 2;
  const json = parsed.values.json === true;
  if (sub === "migrate") {
    const r = await migrateDatabase();
    if (!r.ok) return reportError(io, r.error, json);
    io.stdout(json ? `${JSON.stringify(r.data)}\n` : `Database ${r.data.filePath}: ${r.data.applied.length} migration(s) applied, ${r.data.alreadyApplied.length} already in place.\n`);
    return 0;
  }
  if (sub === "seed") {
    const r = await seedDatabase({ reset: parsed.values.reset === true, ifEmpty: parsed.values["if-empty"] === true, onProgress: json ? undefined : (m: string) => io.stderr(`${m}\n`) });
    if (!r.ok) return reportError(io, r.error, json);
    if (json) io.stdout(`${JSON.stringify(r.data)}\n`);
    else if (r.data.skipped) io.stdout(`Database already holds data; demo scenario not seeded (use --reset to rebuild it).\n`);
    else io.stdout(`Seeded the demo scenario: ${r.data.sources} sources, ${r.data.records} records.${r.data.previousDatabase ? ` The previous database was kept at ${r.data.previousDatabase}.` : ""}\n`);
    return 0;
  }
  io.stderr(`Unknown or missing subcommand.\n\nUsage: ${USAGE}\n`);
  return 2;
};
