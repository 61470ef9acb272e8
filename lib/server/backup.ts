/**
 * Backups: a consistent online snapshot of the database (SQLite's backup API through
 * better-sqlite3's `db.backup()`, safe while the server writes), the stored files it refers to, and a
 * manifest with the SHA-256 of every file. Restore checks the manifest, every hash and the
 * snapshot's integrity before it touches anything, then keeps the replaced database aside.
 *
 * Layout of a backup folder:
 *   manifest.json
 *   meltledger.db
 *   files/<sha[0:2]>/<sha>     (content-addressed, as in the data folder)
 */
import { createHash, randomUUID } from "node:crypto";
import { createReadStream, existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync, copyFileSync } from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { z } from "zod";
import { closeSqlite, sqlite } from "../db/connection";
import { disconnectPrisma } from "../db/client";
import { resolveDatabaseLocation } from "../db/location";
import { AppFailure, fail, guard, ok, type Result } from "./result";

export const BACKUP_FORMAT = "meltledger-backup";
export const BACKUP_FORMAT_VERSION = 1;
const DB_NAME = "meltledger.db";
const SHA256_HEX = /^[0-9a-f]{64}$/;
const FILE_PATH = /^files\/([0-9a-f]{2})\/([0-9a-f]{64})$/;

const entrySchema = z.object({ path: z.string(), sha256: z.string().regex(SHA256_HEX), sizeBytes: z.number().int().nonnegative() });

const manifestSchema = z.object({
  format: z.literal(BACKUP_FORMAT),
  formatVersion: z.literal(BACKUP_FORMAT_VERSION),
  createdAt: z.string(),
  sourceDatabase: z.string(),
  database: entrySchema.extend({ path: z.literal(DB_NAME), integrity: z.literal("ok"), migrations: z.array(z.string()) }),
  files: z.array(entrySchema.refine((e) => FILE_PATH.test(e.path) && e.path.endsWith(e.sha256) && e.path.slice(6, 8) === e.sha256.slice(0, 2), { message: "a stored file's path must be files/<sha[0:2]>/<sha>" })),
  missingFiles: z.array(z.string().regex(SHA256_HEX)),
  counts: z.record(z.string(), z.number().int().nonnegative()),
});

export type BackupManifest = z.infer<typeof manifestSchema>;

export interface BackupSummary {
  out: string;
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

const COUNTED_TABLES = ["BuildRecord", "Source", "Flag", "AuditEvent", "User", "StoredFile", "SourceDocument", "ImportRun"] as const;

function countsOf(db: Database.Database): Record<string, number> {
  const out: Record<string, number> = {};
  for (const t of COUNTED_TABLES) {
    const exists = db.prepare(`SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = ?`).get(t);
    if (exists) out[t] = (db.prepare(`SELECT COUNT(*) AS n FROM "${t}"`).get() as { n: number }).n;
  }
  return out;
}

function integrityOf(db: Database.Database): string {
  const rows = db.pragma("integrity_check") as { integrity_check: string }[];
  return rows.map((r) => r.integrity_check).join("; ");
}

function migrationsOf(db: Database.Database): string[] {
  const exists = db.prepare(`SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = '_prisma_migrations'`).get();
  if (!exists) return [];
  return (db.prepare(`SELECT migration_name AS name FROM _prisma_migrations WHERE finished_at IS NOT NULL ORDER BY migration_name`).all() as { name: string }[]).map((r) => r.name);
}

function ioFailure(error: unknown, what: string): never {
  const code = (error as NodeJS.ErrnoException).code;
  const why = code === "ENOSPC" ? "the disk is full" : code === "EACCES" || code === "EPERM" || code === "EROFS" ? "it is not writable" : (error as Error).message;
  throw new AppFailure({ code: "unavailable", message: `Could not write ${what}: ${why}.` });
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
    const { filePath, dataDir } = resolveDatabaseLocation();
    if (!existsSync(filePath)) return fail("not_found", `There is no database at ${filePath}.`);
    const parent = path.dirname(target);
    if (!existsSync(parent)) return fail("not_found", `The folder ${parent} does not exist.`);
    const work = `${target}.partial-${randomUUID().slice(0, 8)}`;
    try {
      mkdirSync(work);
    } catch (e) {
      ioFailure(e, work);
    }
    try {
      const snapshot = path.join(work, DB_NAME);
      try {
        await sqlite().backup(snapshot);
      } catch (e) {
        if ((e as { code?: string }).code?.startsWith("SQLITE_") && !/FULL|CANTOPEN|READONLY|IOERR/.test((e as { code: string }).code)) throw e;
        ioFailure(e, snapshot);
      }
      const snap = new Database(snapshot, { readonly: true, fileMustExist: true });
      let integrity: string;
      let counts: Record<string, number>;
      let migrations: string[];
      let shas: string[];
      try {
        integrity = integrityOf(snap);
        counts = countsOf(snap);
        migrations = migrationsOf(snap);
        const hasFiles = snap.prepare(`SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = 'StoredFile'`).get();
        shas = hasFiles ? (snap.prepare(`SELECT sha256 FROM StoredFile ORDER BY sha256`).all() as { sha256: string }[]).map((r) => r.sha256) : [];
      } finally {
        snap.close();
      }
      if (integrity !== "ok") return fail("internal", `The snapshot failed SQLite's integrity check (${integrity}); no backup was written.`);
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
      try {
        writeFileSync(path.join(work, "manifest.json"), `${JSON.stringify(manifest, null, 2)}\n`);
        if (existsSync(target)) rmSync(target, { recursive: true });
        renameSync(work, target);
      } catch (e) {
        ioFailure(e, target);
      }
      return ok({ out: target, databaseBytes, files: files.length, fileBytes, missingFiles, counts });
    } finally {
      if (existsSync(work)) rmSync(work, { recursive: true, force: true });
    }
  });
}

export interface RestoreSummary {
  restoredFrom: string;
  database: string;
  /** Where the database that was replaced now is (never deleted), or null when there was none. */
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
    const snap = new Database(path.join(root, DB_NAME), { readonly: true, fileMustExist: true });
    try {
      const integrity = integrityOf(snap);
      if (integrity !== "ok") return fail("invalid_input", `The backup's database fails SQLite's integrity check (${integrity}); nothing was restored.`);
    } finally {
      snap.close();
    }
    return ok(manifest);
  });
}

/**
 * Restores a backup over the database DATABASE_URL names: verifies everything first (nothing is
 * touched if a single hash is off), moves the current database (and its WAL files) aside under
 * data/previous/, puts the snapshot in place (copied beside it, then renamed) and copies the stored
 * files the data folder lacks. Stop the server before restoring: it would keep the old file open.
 */
export async function restoreDatabase(dir: string): Promise<Result<RestoreSummary>> {
  return guard(async () => {
    const checked = await verifyBackup(dir);
    if (!checked.ok) return checked;
    const manifest = checked.data;
    const root = path.resolve(dir);
    const { filePath, dataDir } = resolveDatabaseLocation();
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
    await disconnectPrisma();
    closeSqlite();
    let previousDatabase: string | null = null;
    try {
      if (existsSync(filePath)) {
        const keep = path.join(folder, "previous");
        mkdirSync(keep, { recursive: true });
        const stamp = new Date().toISOString().replace(/[:.]/g, "-");
        previousDatabase = path.join(keep, `${path.basename(filePath, ".db")}-before-restore-${stamp}.db`);
        renameSync(filePath, previousDatabase);
        for (const suffix of ["-wal", "-shm"]) if (existsSync(filePath + suffix)) renameSync(filePath + suffix, previousDatabase + suffix);
      }
      renameSync(staged, filePath);
    } catch (e) {
      // put the old file back if it was moved and the new one is not in place
      if (previousDatabase && !existsSync(filePath) && existsSync(previousDatabase)) renameSync(previousDatabase, filePath);
      if (existsSync(staged)) rmSync(staged, { force: true });
      ioFailure(e, filePath);
    }
    return ok({ restoredFrom: root, database: filePath, previousDatabase, filesCopied, filesAlreadyPresent, counts: manifest.counts });
  });
}
