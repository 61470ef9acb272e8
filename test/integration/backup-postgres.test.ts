// `db backup` / `db restore` on PostgreSQL: pg_dump from an exported snapshot with the stored files
// and a manifest of hashes, row counts and table digests; restore refuses a database holding rows
// unless told, checks everything first, and round-trips every table (counts and digests equal).
import { execFile } from "node:child_process";
import { appendFileSync, cpSync, existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, expect, test } from "vitest";
import { tableDigests, type TableDigest } from "@/lib/db/backup-postgres";
import { disconnectPrisma } from "@/lib/db/client";
import { migratePostgres } from "@/lib/db/migrate-postgres";
import { withPostgres } from "@/lib/db/postgres";
import { closeSql } from "@/lib/db/sql";
import { localActor, type Actor } from "@/lib/server/actor";
import { login } from "@/lib/server/auth";
import { backupDatabase, restoreDatabase, verifyBackup } from "@/lib/server/backup";
import { attachPdfToSource } from "@/lib/server/files";
import { createSource } from "@/lib/server/sources";
import { addUser } from "@/lib/server/users";
import { sourceInput } from "../support/fixtures";
import { inventedPaperPdf, makePdf } from "../support/pdf";
import { describePostgres, useTempPostgres, withClient } from "../support/postgres";

const BIN = path.resolve(import.meta.dirname, "../../bin/meltledger.mjs");
const run = promisify(execFile);

describePostgres("db backup and db restore on PostgreSQL", () => {
  const server = useTempPostgres("backup");
  const urlBefore = process.env.DATABASE_URL;
  const filesBefore = process.env.MELTLEDGER_FILES_DIR;
  let dir = "";
  let sourceUrl = "";
  let actor: Actor;
  let original: TableDigest[] = [];
  const out = (name: string) => path.join(dir, name);
  const digestsOf = (url: string) => withPostgres(url, (c) => tableDigests(c));

  /** Points DATABASE_URL and MELTLEDGER_FILES_DIR at another database, closing this process's pools first. */
  async function use(url: string, files: string) {
    await closeSql();
    await disconnectPrisma();
    process.env.DATABASE_URL = url;
    process.env.MELTLEDGER_FILES_DIR = files;
  }

  beforeAll(async () => {
    dir = mkdtempSync(path.join(os.tmpdir(), "meltledger-pg-backup-"));
    sourceUrl = await server.createDatabase();
    await withPostgres(sourceUrl, (c) => migratePostgres(c));
    await use(sourceUrl, out("files-a"));
    actor = await localActor();
    // rows in most tables through the server layer: accounts, a session, sources, stored PDFs, audit events
    expect((await addUser({ name: "Backup Reviewer", role: "reviewer", password: "a-long-test-password" }, actor)).ok).toBe(true);
    process.env.MELTLEDGER_MODE = "team";
    expect((await login({ name: "Backup Reviewer", password: "a-long-test-password" }, { method: "POST", host: "127.0.0.1", origin: null, forwardedFor: null, forwardedProto: null, sessionToken: null })).ok).toBe(true);
    delete process.env.MELTLEDGER_MODE;
    for (let i = 0; i < 3; i++) {
      const s = await createSource(sourceInput({ doi: `10.5555/pg-backup.${i}`, title: `Invented backup paper ${i}` }), actor);
      if (!s.ok) throw new Error(s.error.message);
      if (i === 0) {
        const a = await attachPdfToSource(s.data.id, [inventedPaperPdf().pdf], "paper.pdf", actor);
        const b = await attachPdfToSource(s.data.id, [makePdf([{ texts: [{ x: 72, y: 700, text: "Second invented paper" }] }])], "second.pdf", actor);
        if (!a.ok || !b.ok) throw new Error("pdf");
      }
    }
    original = await digestsOf(sourceUrl);
  }, 60_000);

  afterAll(async () => {
    await closeSql();
    await disconnectPrisma();
    if (urlBefore === undefined) delete process.env.DATABASE_URL;
    else process.env.DATABASE_URL = urlBefore;
    if (filesBefore === undefined) delete process.env.MELTLEDGER_FILES_DIR;
    else process.env.MELTLEDGER_FILES_DIR = filesBefore;
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  test("backup writes a pg_dump archive, every stored file and a manifest of hashes, counts and table digests", async () => {
    const r = await backupDatabase(out("b1"));
    if (!r.ok) throw new Error(r.error.message);
    expect(r.data).toMatchObject({ engine: "postgresql", files: 2, missingFiles: [] });
    expect(r.data.counts).toMatchObject({ Source: 3, StoredFile: 2, SourceDocument: 2, Session: 1 });
    const manifest = JSON.parse(readFileSync(path.join(out("b1"), "manifest.json"), "utf8"));
    expect(manifest.database).toMatchObject({ engine: "postgresql", path: "meltledger.pgdump", dumpFormat: "pg_dump custom" });
    expect(manifest.sourceDatabase).not.toMatch(/:[^:@/]+@/);
    // the digests are those of the database at the snapshot (nothing wrote meanwhile)
    expect(manifest.database.tables).toEqual(original);
    expect(manifest.database.migrations.length).toBeGreaterThan(0);
    // the archive starts with pg_dump's custom-format signature
    expect(readFileSync(path.join(out("b1"), "meltledger.pgdump")).subarray(0, 5).toString("latin1")).toBe("PGDMP");
    expect((await verifyBackup(out("b1"))).ok).toBe(true);
  }, 60_000);

  test("restore into an empty database gives every table with the same rows (counts and digests) and the stored files", async () => {
    const target = await server.createDatabase();
    await use(target, out("files-b"));
    const r = await restoreDatabase(out("b1"));
    if (!r.ok) throw new Error(r.error.message);
    expect(r.data).toMatchObject({ engine: "postgresql", previousDatabase: null, filesCopied: 2, filesAlreadyPresent: 0 });
    const restored = await digestsOf(target);
    expect(restored).toEqual(original);
    expect(restored.find((t) => t.table === "Source")!.rows).toBe(3);
    const manifest = JSON.parse(readFileSync(path.join(out("b1"), "manifest.json"), "utf8")) as { files: { sha256: string }[] };
    for (const f of manifest.files) expect(existsSync(path.join(out("files-b"), f.sha256.slice(0, 2), f.sha256))).toBe(true);
    // the restored database is a working one: sequences continue after the restored ids
    const s = await createSource(sourceInput({ doi: "10.5555/pg-backup.after" }), await localActor());
    expect(s.ok && s.data.id).toBeGreaterThan(3);
  }, 60_000);

  test("a database that holds rows is refused unless told; with --replace its schema is kept aside and the backup restored", async () => {
    await use(sourceUrl, out("files-a"));
    // the source database holds rows: refused, nothing changed
    const refused = await restoreDatabase(out("b1"));
    expect(!refused.ok && refused.error.code).toBe("conflict");
    expect(!refused.ok && refused.error.message).toMatch(/already holds data.*--replace/);
    expect(await digestsOf(sourceUrl)).toEqual(original);
    // a change after the backup, then a restore over it with replace
    expect((await createSource(sourceInput({ doi: "10.5555/pg-backup.later" }), actor)).ok).toBe(true);
    await closeSql();
    await disconnectPrisma();
    const r = await restoreDatabase(out("b1"), { replace: true });
    if (!r.ok) throw new Error(r.error.message);
    expect(r.data.previousDatabase).toMatch(/^meltledger_before_restore_\d+$/);
    expect(await digestsOf(sourceUrl)).toEqual(original);
    // the replaced data is kept, never dropped
    const kept = await withClient(sourceUrl, async (c) => (await c.query<{ n: string }>(`SELECT COUNT(*) AS n FROM "${r.data.previousDatabase}"."Source"`)).rows[0]!.n);
    expect(Number(kept)).toBe(4);
  }, 60_000);

  test("a damaged archive, or a SQLite backup on a PostgreSQL URL, is refused and nothing changes", async () => {
    cpSync(out("b1"), out("b-bad"), { recursive: true });
    appendFileSync(path.join(out("b-bad"), "meltledger.pgdump"), "x");
    const target = await server.createDatabase();
    await withPostgres(target, (c) => migratePostgres(c));
    await use(target, out("files-c"));
    const before = await digestsOf(target);
    const bad = await restoreDatabase(out("b-bad"));
    expect(!bad.ok && bad.error.code).toBe("invalid_input");
    expect(!bad.ok && bad.error.message).toMatch(/meltledger\.pgdump.*(bytes|SHA-256)/);
    expect(await digestsOf(target)).toEqual(before);
    // a manifest saying SQLite
    cpSync(out("b1"), out("b-sqlite"), { recursive: true });
    const m = JSON.parse(readFileSync(path.join(out("b-sqlite"), "manifest.json"), "utf8"));
    const { writeFileSync } = await import("node:fs");
    writeFileSync(path.join(out("b-sqlite"), "meltledger.db"), "");
    writeFileSync(path.join(out("b-sqlite"), "manifest.json"), JSON.stringify({ ...m, database: { path: "meltledger.db", sha256: "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855", sizeBytes: 0, integrity: "ok", migrations: [] } }));
    const wrongEngine = await restoreDatabase(out("b-sqlite"));
    expect(wrongEngine.ok).toBe(false);
    expect(await digestsOf(target)).toEqual(before);
  }, 60_000);

  test("without pg_dump on PATH the backup says so and how to install it, and writes nothing", async () => {
    await use(sourceUrl, out("files-a"));
    const pathBefore = process.env.PATH;
    process.env.PATH = path.join(dir, "no-tools-here");
    try {
      const r = await backupDatabase(out("b-none"));
      expect(!r.ok && r.error.code).toBe("unavailable");
      expect(!r.ok && r.error.message).toMatch(/pg_dump is not installed.*apt-get install postgresql-client/);
    } finally {
      process.env.PATH = pathBefore;
    }
    expect(existsSync(out("b-none"))).toBe(false);
  });

  test("the CLI backs up and restores a PostgreSQL database; a damaged backup exits 2", async () => {
    const env = { ...process.env, DATABASE_URL: sourceUrl, MELTLEDGER_FILES_DIR: out("files-a") };
    const b = await run(process.execPath, [BIN, "db", "backup", out("b-cli"), "--json"], { env });
    expect(JSON.parse(b.stdout)).toMatchObject({ engine: "postgresql", files: 2 });
    const target = await server.createDatabase();
    const r = await run(process.execPath, [BIN, "db", "restore", out("b-cli"), "--json"], { env: { ...env, DATABASE_URL: target, MELTLEDGER_FILES_DIR: out("files-d") } });
    expect(JSON.parse(r.stdout)).toMatchObject({ engine: "postgresql", filesCopied: 2 });
    expect(await digestsOf(target)).toEqual(await digestsOf(sourceUrl));
    const again = await run(process.execPath, [BIN, "db", "restore", out("b-cli")], { env: { ...env, DATABASE_URL: target } }).catch((e: { code: number; stderr: string }) => e);
    expect((again as { code: number }).code).toBe(2);
    expect((again as { stderr: string }).stderr).toMatch(/already holds data/);
  }, 120_000);
});
