/**
 * Backups: a consistent online snapshot of the database, the stored files it refers to, and a
 * manifest with the SHA-256 of every file. Restore checks the manifest, every hash and the
 * snapshot's integrity before it touches anything, then keeps the replaced database aside.
 *
 * SQLite: the snapshot is made with SQLite's online backup API, safe while the server writes, and
 * the manifest's counts read from the snapshot (lib/db/backup-sqlite.ts). PostgreSQL: pg_dump's
 * custom format from an exported snapshot, with every table's row count and digest read from the
 * same snapshot (lib/db/backup-postgres.ts); restore runs pg_restore in one transaction into a
 * fresh schema and checks every count and digest. This module only orchestrates: folders, stored
 * files, the manifest and the answers; each engine's own work is one lib/db call per step.
 *
 * Layout of a backup folder:
 *   manifest.json
 *   meltledger.db  or  meltledger.pgdump
 *   files/<sha[0:2]>/<sha>     (content-addressed, as in the data folder)
 */
import { createHash, randomUUID } from "node:crypto";
import { createReadStream, existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync, copyFileSync } from "node:fs";
import path from "node:path";
import { z } from "zod";
import { checkArchive, dumpPostgres, PgToolError, restorePostgres, schemaContents, tableDigests } from "../db/backup-postgres";
import { moveSqliteFile, snapshotSqlite, SnapshotWriteError, sqliteFileIntegrity } from "../db/backup-sqlite";
import { closeDatabases } from "../db/databases";
import { resolveDatabaseTarget } from "../db/location";
import { withPostgres } from "../db/postgres";
import { AppFailure, fail, guard, ok, type Result } from "./result";

export const BACKUP_FORMAT = "meltledger-backup";
export const BACKUP_FORMAT_VERSION = 1;
const DB_NAME = "meltledger.db";
const PG_DUMP_NAME = "meltledger.pgdump";
const SHA256_HEX = /^[0-9a-f]{64}$/;
const FILE_PATH = /^files\/([0-9a-f]{2})\/([0-9a-f]{64})$/;

const entrySchema = z.object({ path: z.string(), sha256: z.string().regex(SHA256_HEX), sizeBytes: z.number().int().nonnegative() });

const digestSchema = z.object({ table: z.string(), rows: z.number().int().nonnegative(), sha256: z.string().regex(SHA256_HEX) });

const manifestSchema = z.object({
  format: z.literal(BACKUP_FORMAT),
  formatVersion: z.literal(BACKUP_FORMAT_VERSION),
  createdAt: z.string(),
  sourceDatabase: z.string(),
  database: z.union([
    // a SQLite snapshot (manifests without an engine are SQLite's)
    entrySchema.extend({ engine: z.literal("sqlite").optional(), path: z.literal(DB_NAME), integrity: z.literal("ok"), migrations: z.array(z.string()) }),
    // a PostgreSQL dump: pg_dump's custom format, with every table's count and digest at the snapshot
    entrySchema.extend({
      engine: z.literal("postgresql"),
      path: z.literal(PG_DUMP_NAME),
      dumpFormat: z.literal("pg_dump custom"),
      serverVersion: z.string(),
      pgDumpVersion: z.string(),
      migrations: z.array(z.string()),
      tables: z.array(digestSchema),
    }),
  ]),
  files: z.array(entrySchema.refine((e) => FILE_PATH.test(e.path) && e.path.endsWith(e.sha256) && e.path.slice(6, 8) === e.sha256.slice(0, 2), { message: "a stored file's path must be files/<sha[0:2]>/<sha>" })),
  missingFiles: z.array(z.string().regex(SHA256_HEX)),
  counts: z.record(z.string(), z.number().int().nonnegative()),
});

export type BackupManifest = z.infer<typeof manifestSchema>;

export interface BackupSummary {
  out: string;
  engine: "sqlite" | "postgresql";
  databaseBytes: number;
  files: number;
  fileBytes: number;
  /** Stored files the database names but the data folder lacks (reported, not fatal). */
  missingFiles: string[];
  counts: Record<string, number>;
}

async function sha256Of(file: string): Promise<string> {
  const hash = createHash("sha256");
  for await (const chunk of createReadStream(file)) hash.update(chunk as Buffer);
  return hash.digest("hex");
}

function ioFailure(error: unknown, what: string): never {
  const code = (error as NodeJS.ErrnoException).code;
  const why = code === "ENOSPC" ? "the disk is full" : code === "EACCES" || code === "EPERM" || code === "EROFS" ? "it is not writable" : (error as Error).message;
  throw new AppFailure({ code: "unavailable", message: `Could not write ${what}: ${why}.` });
}

/** Copies the stored files named by `shas` from the data folder into the backup, each checked against its name. */
async function copyStoredFiles(shas: readonly string[], dataDir: string, work: string): Promise<{ files: BackupManifest["files"]; missingFiles: string[]; fileBytes: number }> {
  const files: BackupManifest["files"] = [];
  const missingFiles: string[] = [];
  let fileBytes = 0;
  for (const sha of shas) {
    if (!SHA256_HEX.test(sha)) continue;
    const from = path.join(dataDir, sha.slice(0, 2), sha);
    if (!existsSync(from)) {
      missingFiles.push(sha);
      continue;
    }
    const rel = `files/${sha.slice(0, 2)}/${sha}`;
    const to = path.join(work, rel);
    try {
      mkdirSync(path.dirname(to), { recursive: true });
      copyFileSync(from, to);
    } catch (e) {
      ioFailure(e, to);
    }
    const actual = await sha256Of(to);
    // a stored file is named by its hash; one that no longer matches is damaged and is not copied as if whole
    if (actual !== sha) {
      rmSync(to);
      missingFiles.push(sha);
      continue;
    }
    const size = statSync(to).size;
    fileBytes += size;
    files.push({ path: rel, sha256: sha, sizeBytes: size });
  }
  return { files, missingFiles, fileBytes };
}

/** Writes the manifest and renames the finished folder into place. */
function finishBackup(work: string, target: string, manifest: BackupManifest): void {
  try {
    writeFileSync(path.join(work, "manifest.json"), `${JSON.stringify(manifest, null, 2)}\n`);
    if (existsSync(target)) rmSync(target, { recursive: true });
    renameSync(work, target);
  } catch (e) {
    ioFailure(e, target);
  }
}

/** A PgToolError as the use case's answer: a missing tool is `unavailable` with how to install it. */
function pgToolFailure(error: unknown): never {
  if (error instanceof PgToolError) throw new AppFailure({ code: error.kind === "missing" ? "unavailable" : "internal", message: error.message });
  throw error;
}

type PostgresTarget = Extract<ReturnType<typeof resolveDatabaseTarget>, { engine: "postgresql" }>;

async function backupPostgres(where: PostgresTarget, work: string, target: string): Promise<Result<BackupSummary>> {
  const dump = path.join(work, PG_DUMP_NAME);
  const facts = await withPostgres(where.url, (client) => dumpPostgres(client, where.url, dump)).catch(pgToolFailure);
  try {
    await checkArchive(dump);
  } catch (error) {
    pgToolFailure(error);
  }
  const { files, missingFiles, fileBytes } = await copyStoredFiles(facts.storedFiles, where.dataDir, work);
  const databaseBytes = statSync(dump).size;
  const counts = Object.fromEntries(facts.tables.map((t) => [t.table, t.rows]));
  const manifest: BackupManifest = {
    format: BACKUP_FORMAT,
    formatVersion: BACKUP_FORMAT_VERSION,
    createdAt: new Date().toISOString(),
    sourceDatabase: where.redactedUrl,
    database: {
      engine: "postgresql",
      path: PG_DUMP_NAME,
      sha256: await sha256Of(dump),
      sizeBytes: databaseBytes,
      dumpFormat: "pg_dump custom",
      serverVersion: facts.serverVersion,
      pgDumpVersion: facts.pgDumpVersion,
      migrations: facts.migrations,
      tables: facts.tables,
    },
    files,
    missingFiles,
    counts,
  };
  finishBackup(work, target, manifest);
  return ok({ out: target, engine: "postgresql", databaseBytes, files: files.length, fileBytes, missingFiles, counts });
}

/**
 * Writes a backup into the folder `out` (which must not exist yet, or be empty). The copy is made
 * in `out.partial-*` beside it and renamed when complete, so a folder named `out` is always whole.
 */
export async function backupDatabase(out: string): Promise<Result<BackupSummary>> {
  return guard(async () => {
    if (typeof out !== "string" || out.trim() === "") return fail("invalid_input", "Give the folder to write the backup to.");
    const target = path.resolve(out);
    if (existsSync(target) && (!statSync(target).isDirectory() || readdirSync(target).length > 0)) {
      return fail("conflict", `${target} already exists and is not an empty folder; give a new folder for the backup.`);
    }
    const where = resolveDatabaseTarget();
    if (where.engine === "sqlite" && !existsSync(where.filePath)) return fail("not_found", `There is no database at ${where.filePath}.`);
    const parent = path.dirname(target);
    if (!existsSync(parent)) return fail("not_found", `The folder ${parent} does not exist.`);
    const work = `${target}.partial-${randomUUID().slice(0, 8)}`;
    try {
      mkdirSync(work);
    } catch (e) {
      ioFailure(e, work);
    }
    try {
      if (where.engine === "postgresql") return await backupPostgres(where, work, target);
      const { filePath, dataDir } = where;
      const snapshot = path.join(work, DB_NAME);
      const { integrity, counts, migrations, storedFiles } = await snapshotSqlite(snapshot).catch((e: unknown) => {
        if (e instanceof SnapshotWriteError) ioFailure(e.cause, snapshot);
        throw e;
      });
      if (integrity !== "ok") return fail("internal", `The snapshot failed SQLite's integrity check (${integrity}); no backup was written.`);
      const { files, missingFiles, fileBytes } = await copyStoredFiles(storedFiles, dataDir, work);
      const databaseBytes = statSync(snapshot).size;
      const manifest: BackupManifest = {
        format: BACKUP_FORMAT,
        formatVersion: BACKUP_FORMAT_VERSION,
        createdAt: new Date().toISOString(),
        sourceDatabase: filePath,
        database: { path: DB_NAME, sha256: await sha256Of(snapshot), sizeBytes: databaseBytes, integrity: "ok", migrations },
        files,
        missingFiles,
        counts,
      };
      finishBackup(work, target, manifest);
      return ok({ out: target, engine: "sqlite", databaseBytes, files: files.length, fileBytes, missingFiles, counts });
    } finally {
      if (existsSync(work)) rmSync(work, { recursive: true, force: true });
    }
  });
}

export interface RestoreSummary {
  restoredFrom: string;
  engine: "sqlite" | "postgresql";
  /** The SQLite file, or the PostgreSQL URL with its password hidden. */
  database: string;
  /**
   * Where the database that was replaced now is (never deleted), or null when there was none:
   * the SQLite file under data/previous/, or the PostgreSQL schema it was renamed to.
   */
  previousDatabase: string | null;
  filesCopied: number;
  filesAlreadyPresent: number;
  counts: Record<string, number>;
}

/** Reads and checks a backup folder: manifest shape, every hash and size, the snapshot's integrity. Changes nothing. */
export async function verifyBackup(dir: string): Promise<Result<BackupManifest>> {
  return guard(async () => {
    const root = path.resolve(dir);
    const manifestPath = path.join(root, "manifest.json");
    if (!existsSync(manifestPath)) return fail("not_found", `${root} has no manifest.json; it is not a Meltledger backup.`);
    let raw: unknown;
    try {
      raw = JSON.parse(readFileSync(manifestPath, "utf8"));
    } catch (e) {
      return fail("invalid_input", `manifest.json is not valid JSON: ${(e as Error).message}`);
    }
    const parsed = manifestSchema.safeParse(raw);
    if (!parsed.success) return fail("invalid_input", `manifest.json is not a Meltledger backup manifest: ${parsed.error.issues.slice(0, 3).map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}`);
    const manifest = parsed.data;
    const problems: string[] = [];
    for (const entry of [manifest.database, ...manifest.files]) {
      const file = path.join(root, entry.path);
      // the patterns above already keep paths inside the folder; this holds even if they change
      if (path.relative(root, file).startsWith("..") || path.isAbsolute(path.relative(root, file))) {
        problems.push(`${entry.path}: outside the backup folder`);
        continue;
      }
      if (!existsSync(file)) {
        problems.push(`${entry.path}: missing`);
        continue;
      }
      const size = statSync(file).size;
      if (size !== entry.sizeBytes) problems.push(`${entry.path}: ${size} bytes, the manifest says ${entry.sizeBytes}`);
      else if ((await sha256Of(file)) !== entry.sha256) problems.push(`${entry.path}: SHA-256 differs from the manifest`);
    }
    if (problems.length) return fail("invalid_input", `The backup does not match its manifest; nothing was restored. ${problems.slice(0, 5).join("; ")}${problems.length > 5 ? ` and ${problems.length - 5} more` : ""}.`, { problems });
    if (manifest.database.engine === "postgresql") {
      try {
        await checkArchive(path.join(root, PG_DUMP_NAME));
      } catch (error) {
        if (error instanceof PgToolError && error.kind === "failed") return fail("invalid_input", `The backup's dump cannot be read by pg_restore (${error.message}); nothing was restored.`);
        pgToolFailure(error);
      }
      return ok(manifest);
    }
    const integrity = sqliteFileIntegrity(path.join(root, DB_NAME));
    if (integrity !== "ok") return fail("invalid_input", `The backup's database fails SQLite's integrity check (${integrity}); nothing was restored.`);
    return ok(manifest);
  });
}

export interface RestoreOptions {
  /**
   * PostgreSQL: restore over a database that already holds rows. Its schema is renamed aside
   * (`meltledger_before_restore_<time>`, kept, never dropped) and the backup restored in a new one.
   * Without it such a target is refused. (A SQLite file is always kept aside under data/previous/.)
   */
  replace?: boolean;
}

/** Stored files of the backup that the data folder lacks are copied in (files already there are kept: they are named by their content). */
async function restoreStoredFiles(root: string, manifest: BackupManifest, dataDir: string): Promise<{ filesCopied: number; filesAlreadyPresent: number }> {
  let filesCopied = 0;
  let filesAlreadyPresent = 0;
  for (const f of manifest.files) {
    const dest = path.join(dataDir, f.sha256.slice(0, 2), f.sha256);
    if (existsSync(dest) && (await sha256Of(dest)) === f.sha256) {
      filesAlreadyPresent++;
      continue;
    }
    try {
      mkdirSync(path.dirname(dest), { recursive: true });
      const tmp = `${dest}.restore-${randomUUID().slice(0, 8)}`;
      copyFileSync(path.join(root, f.path), tmp);
      renameSync(tmp, dest);
    } catch (e) {
      ioFailure(e, dest);
    }
    filesCopied++;
  }
  return { filesCopied, filesAlreadyPresent };
}

async function restorePostgresBackup(root: string, manifest: BackupManifest, where: PostgresTarget, options: RestoreOptions): Promise<Result<RestoreSummary>> {
  const db = manifest.database;
  if (db.engine !== "postgresql") throw new Error("restorePostgresBackup: not a PostgreSQL backup");
  // nothing of this process may hold the schema that is renamed
  await closeDatabases();
  const stamp = new Date().toISOString().replace(/[-:.TZ]/g, "").slice(0, 17);
  const restored = await withPostgres(where.url, async (client) => {
    const before = await schemaContents(client);
    const held = Object.entries(before.rows);
    if (held.length > 0 && !options.replace) {
      return fail("conflict", `The database ${where.redactedUrl} already holds data (${held.slice(0, 4).map(([t, n]) => `${t}: ${n} rows`).join(", ")}${held.length > 4 ? ", …" : ""}); nothing was restored. Restore into a new, empty database, or give --replace to keep the current schema aside (renamed, never dropped) and restore in its place.`, { rows: before.rows });
    }
    const kept = await restorePostgres(client, where.url, path.join(root, PG_DUMP_NAME), `meltledger_before_restore_${stamp}`).catch(pgToolFailure);
    const after = await tableDigests(client);
    const wrong = db.tables.filter((t) => {
      const got = after.find((a) => a.table === t.table);
      return !got || got.rows !== t.rows || got.sha256 !== t.sha256;
    });
    if (wrong.length > 0) {
      return fail("internal", `The restored database does not match the backup's manifest (${wrong.map((t) => t.table).join(", ")}: row count or digest differs). The restored schema is in place; the previous one${kept ? ` is kept as ${kept}` : " was empty"}.`, { tables: wrong.map((t) => t.table), previousSchema: kept });
    }
    return ok(kept);
  });
  if (!restored.ok) return restored;
  const { filesCopied, filesAlreadyPresent } = await restoreStoredFiles(root, manifest, where.dataDir);
  return ok({ restoredFrom: root, engine: "postgresql", database: where.redactedUrl, previousDatabase: restored.data, filesCopied, filesAlreadyPresent, counts: manifest.counts });
}

/**
 * Restores a backup over the database DATABASE_URL names: verifies everything first (nothing is
 * touched if a single hash is off). SQLite: moves the current database (and its WAL files) aside
 * under data/previous/, puts the snapshot in place (copied beside it, then renamed). PostgreSQL:
 * refuses a database that holds rows unless `replace`, restores with pg_restore in one transaction
 * into a fresh schema (the old one renamed aside) and checks every table's count and digest
 * against the manifest. Then copies the stored files the data folder lacks. Stop the server
 * before restoring: it would keep the old database open.
 */
export async function restoreDatabase(dir: string, options: RestoreOptions = {}): Promise<Result<RestoreSummary>> {
  return guard(async () => {
    const checked = await verifyBackup(dir);
    if (!checked.ok) return checked;
    const manifest = checked.data;
    const root = path.resolve(dir);
    const where = resolveDatabaseTarget();
    const from = manifest.database.engine ?? "sqlite";
    if (from !== where.engine) {
      return fail(
        "invalid_input",
        from === "sqlite"
          ? "This is a backup of a SQLite database and DATABASE_URL names a PostgreSQL server; nothing was restored. Restore it into a SQLite file (DATABASE_URL=file:…), then move that with `meltledger db copy`."
          : "This is a backup of a PostgreSQL database and DATABASE_URL names a SQLite file; nothing was restored. Restore it into an empty PostgreSQL database (DATABASE_URL=postgresql://…).",
      );
    }
    if (where.engine === "postgresql") return restorePostgresBackup(root, manifest, where, options);
    const { filePath, dataDir } = where;
    const folder = path.dirname(filePath);
    try {
      mkdirSync(folder, { recursive: true });
    } catch (e) {
      ioFailure(e, folder);
    }
    // 1. stage everything next to its destination, so the switch is a rename
    const staged = path.join(folder, `.restore-${randomUUID().slice(0, 8)}.db`);
    let filesCopied = 0;
    let filesAlreadyPresent = 0;
    try {
      copyFileSync(path.join(root, DB_NAME), staged);
      if ((await sha256Of(staged)) !== manifest.database.sha256) return fail("unavailable", "The database copy did not read back as written; nothing was restored.");
      for (const f of manifest.files) {
        const dest = path.join(dataDir, f.sha256.slice(0, 2), f.sha256);
        if (existsSync(dest) && (await sha256Of(dest)) === f.sha256) {
          filesAlreadyPresent++;
          continue;
        }
        mkdirSync(path.dirname(dest), { recursive: true });
        const tmp = `${dest}.restore-${randomUUID().slice(0, 8)}`;
        copyFileSync(path.join(root, f.path), tmp);
        renameSync(tmp, dest);
        filesCopied++;
      }
    } catch (e) {
      if (existsSync(staged)) rmSync(staged, { force: true });
      ioFailure(e, folder);
    }
    // 2. the switch: the current database goes aside (never deleted), the snapshot takes its name
    await closeDatabases();
    let previousDatabase: string | null = null;
    try {
      if (existsSync(filePath)) {
        const keep = path.join(folder, "previous");
        mkdirSync(keep, { recursive: true });
        const stamp = new Date().toISOString().replace(/[:.]/g, "-");
        previousDatabase = path.join(keep, `${path.basename(filePath, ".db")}-before-restore-${stamp}.db`);
        moveSqliteFile(filePath, previousDatabase);
      }
      renameSync(staged, filePath);
    } catch (e) {
      // put the old file (and its log) back if it was moved and the new one is not in place
      if (previousDatabase && !existsSync(filePath) && existsSync(previousDatabase)) moveSqliteFile(previousDatabase, filePath);
      if (existsSync(staged)) rmSync(staged, { force: true });
      ioFailure(e, filePath);
    }
    return ok({ restoredFrom: root, engine: "sqlite", database: filePath, previousDatabase, filesCopied, filesAlreadyPresent, counts: manifest.counts });
  });
}
