import { closeDatabases } from "../db/databases";
import { guard } from "../server/result";
import { reportError } from "./args";
import type { CliCommand, CliIo } from "./types";

const HELP = `meltledger — curation workbench for LPBF build records

Commands:
  db migrate                         apply pending database migrations
  db seed [--reset] [--if-empty]     seed the demo scenario (--reset keeps the old database file aside and starts anew)
  db backup OUT                      consistent online snapshot of the database and its stored files, with a manifest of SHA-256 hashes
                                     (PostgreSQL: pg_dump from an exported snapshot, with every table's row count and digest)
  db restore IN [--replace]          verify every hash of a backup, then put it in place (the replaced database is kept aside;
                                     PostgreSQL: an empty database, or --replace to rename the current schema aside)
  db copy --from file:./data/meltledger.db --to postgresql://USER@HOST:5432/NAME --files-to DIR [--json]
                                     move a SQLite database and its stored files to an empty PostgreSQL database (all or nothing), verified by counts and hashes
  records list --json [filters]      list records (--alloy, --source, --status, --outcome, --power/--speed/--hatch/--layer MIN-MAX, --limit N)
  sources list --json                list sources
  import FILE [--sheet NAME] [--mapping FILE.json] [--source-doi DOI | --source-id ID] [--dry-run] [--exclude-errors] [--json]
                                     import a CSV or XLSX table: every row or none (rows with errors are left out only with --exclude-errors)
  meltpool --power 200W --speed 800mm/s --spot 80um [--alloy 316L ...] [--json]
                                     melt-pool size and defect criteria for one parameter set
  check [--all | --record ID,...] [--settings-version N] [--json]
                                     run the checks in batch: flags kept in step, quality scores recomputed
  flags list --json [--record ID] [--state open|resolved|waived] [--code PREFIX] [--severity S] [--source ID]
                                     every matching flag as a JSON array (record_id, import_file, import_row, code, severity, message, details)
  flags resolve ID --action waive|fix|reject --reason TEXT [--field F --value V --unit U]
                                     act on one flag (fix takes the suggested fix unless a value is given)
  export --label binary|multiclass|density --balance none|weights|over|under|smote|gaussian --split source:0.7,0.15,0.15|folds:5 --seed N --out DIR
                                     write a training set (CSV, Parquet, DATASHEET.md, manifest.json) and save the run; --rerun NAME runs a saved one again
  coverage [--alloy 316L] [--hatch 80-120um] [--layer 30um] [--k 3] [--json]
                                     record counts over the power–speed plane, sparse cells and the coverage score
  suggest --alloy 316L --power 50-400W --speed 200-2000mm/s --hatch 100um --layer 30um [--n 12] [--seed 1] [--out FILE.csv]
                                     suggested experiments for the thinnest cells inside the process window (not safety-checked)

  users add NAME --role contributor|reviewer|admin [--password-stdin] [--json]
                                     add an account for team mode (the password is the first line of standard input)
  users list --json                  every account: role, disabled, whether it can log in
  users set NAME [--role R] [--disable | --enable] [--password-stdin]
                                     change an account (disabling it or setting its password ends its sessions)

DATABASE_URL selects the database: a SQLite file (default file:./data/meltledger.db) or a PostgreSQL
server (postgresql://USER@HOST:5432/NAME; stored files then live in MELTLEDGER_FILES_DIR, default ./data/files).
`;

const COMMANDS: Record<string, () => Promise<CliCommand>> = {
  db: async () => (await import("./commands/db")).db,
  records: async () => (await import("./commands/records")).records,
  sources: async () => (await import("./commands/sources")).sources,
  import: async () => (await import("./commands/import")).importCommand,
  meltpool: async () => (await import("./commands/meltpool")).meltpool,
  check: async () => (await import("./commands/check")).check,
  flags: async () => (await import("./commands/flags")).flags,
  export: async () => (await import("./commands/export")).exportCommand,
  coverage: async () => (await import("./commands/coverage")).coverage,
  suggest: async () => (await import("./commands/suggest")).suggest,
  users: async () => (await import("./commands/users")).users,
};

/** Dispatches a command line; returns the exit code (0 ok, 1 failure, 2 bad usage or input). */
export async function main(argv: string[], io: CliIo): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === "--help" || name === "-h" || name === "help") {
    io.stdout(HELP);
    return name ? 0 : 2;
  }
  const load = COMMANDS[name];
  if (!load) {
    io.stderr(`Unknown command "${name}".\n\n${HELP}`);
    return 2;
  }
  try {
    return await (await load())(rest, io);
  } catch (error) {
    // a failure outside a use case's guard (e.g. finding the acting account) gets the same answer as one inside
    const r = await guard<never>(() => Promise.reject(error));
    return r.ok ? 1 : reportError(io, r.error, rest.includes("--json"));
  } finally {
    // a PostgreSQL pool left open would keep the process alive until its idle connections time out
    await closeDatabases();
  }
}
