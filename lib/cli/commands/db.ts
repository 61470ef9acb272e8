import type { ParseArgsConfig } from "node:util";
import { backupDatabase, restoreDatabase } from "../../server/backup";
import { copyDatabase } from "../../server/db-copy";
import { migrateDatabase } from "../../server/maintenance";
import { seedDatabase } from "../../../seed/seed";
import { parseCli, reportError } from "../args";
import type { CliCommand } from "../types";

const USAGE =
  "meltledger db migrate | meltledger db seed [--reset] [--if-empty] [--json] | meltledger db backup OUT [--json] | meltledger db restore IN [--replace] [--json] | meltledger db copy --from file:./data/meltledger.db --to postgresql://USER@HOST:5432/NAME --files-to DIR [--json]";

/** `meltledger db migrate`, `db seed [--reset] [--if-empty]`, `db backup OUT`, `db restore IN` and `db copy --from --to --files-to`. */
export const db: CliCommand = async (argv, io) => {
  const [sub, ...rest] = argv;
  const options: NonNullable<ParseArgsConfig["options"]> = sub === "copy" ? { from: { type: "string" }, to: { type: "string" }, "files-to": { type: "string" }, json: { type: "boolean" } } : { reset: { type: "boolean" }, "if-empty": { type: "boolean" }, replace: { type: "boolean" }, json: { type: "boolean" } };
  const parsed = parseCli(rest, options, io, USAGE);
  if (!parsed.ok) return 2;
  const json = parsed.values.json === true;
  if (sub === "migrate") {
    const r = await migrateDatabase();
    if (!r.ok) return reportError(io, r.error, json);
    io.stdout(json ? `${JSON.stringify(r.data)}\n` : `Database ${r.data.filePath}${r.data.engine === "postgresql" ? " (PostgreSQL)" : ""}: ${r.data.applied.length} migration(s) applied, ${r.data.alreadyApplied.length} already in place.\n`);
    return 0;
  }
  if (sub === "copy") {
    if (parsed.positionals.length > 0) {
      io.stderr(`Unexpected argument '${parsed.positionals[0]}'.\n\nUsage: ${USAGE}\n`);
      return 2;
    }
    const str = (v: unknown) => (typeof v === "string" ? v : "");
    const r = await copyDatabase({ from: str(parsed.values.from), to: str(parsed.values.to), filesTo: str(parsed.values["files-to"]) }, { onProgress: json ? undefined : (m) => io.stderr(`${m}\n`) });
    if (!r.ok) return reportError(io, r.error, json);
    if (json) io.stdout(`${JSON.stringify(r.data)}\n`);
    else {
      io.stdout(`Copied ${r.data.from} to ${r.data.to}: ${r.data.totalRows.toLocaleString("en")} rows in ${r.data.tables.length} tables, ${r.data.files.count} stored file(s) in ${r.data.filesTo} (${r.data.files.copied} copied, ${r.data.files.alreadyPresent} already there).\n`);
      io.stdout(`Verified: row counts and a SHA-256 per table equal on both sides, every stored file's SHA-256 equal to its name.\n`);
      for (const t of r.data.tables) io.stdout(`  ${t.table.padEnd(22)} ${String(t.rows).padStart(8)}  ${t.sha256}\n`);
    }
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
  if (sub === "backup" || sub === "restore") {
    const where = parsed.positionals[0];
    if (!where || parsed.positionals.length > 1) {
      io.stderr(`Give one folder: the backup to write (backup) or to read (restore).\n\nUsage: ${USAGE}\n`);
      return 2;
    }
    if (sub === "backup") {
      const r = await backupDatabase(where);
      if (!r.ok) return reportError(io, r.error, json);
      if (json) io.stdout(`${JSON.stringify(r.data)}\n`);
      else io.stdout(`Backup written to ${r.data.out}: ${r.data.engine === "postgresql" ? "PostgreSQL dump" : "database"} ${r.data.databaseBytes.toLocaleString("en")} bytes, ${r.data.files} stored file(s)${r.data.missingFiles.length ? `; ${r.data.missingFiles.length} stored file(s) named by the database were missing or damaged and are listed in manifest.json` : ""}.\n`);
      return 0;
    }
    const r = await restoreDatabase(where, { replace: parsed.values.replace === true });
    if (!r.ok) return reportError(io, r.error, json);
    if (json) io.stdout(`${JSON.stringify(r.data)}\n`);
    else io.stdout(`Restored ${r.data.database} from ${r.data.restoredFrom} (every hash checked${r.data.engine === "postgresql" ? ", every table's row count and digest equal to the manifest's" : ""}); ${r.data.filesCopied} stored file(s) copied, ${r.data.filesAlreadyPresent} already there.${r.data.previousDatabase ? ` The replaced database was kept ${r.data.engine === "postgresql" ? "as the schema" : "at"} ${r.data.previousDatabase}.` : ""}\n`);
    return 0;
  }
  io.stderr(`Unknown or missing subcommand.\n\nUsage: ${USAGE}\n`);
  return 2;
};
