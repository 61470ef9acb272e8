// The SQLite half of backups (lib/db/backup-sqlite.ts): the snapshot and the facts read from it,
// SQLite's integrity check of a damaged file, and moving a database file with its write-ahead log.
// Expected counts are read back through a connection of the test's own (better-sqlite3), not the module.
import { copyFileSync, existsSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { moveSqliteFile, snapshotSqlite, SnapshotWriteError, SQLITE_COUNTED_TABLES, sqliteFileIntegrity, sqliteSnapshotFacts } from "@/lib/db/backup-sqlite";
import { sqlite } from "@/lib/db/connection";
import { migrate, readMigrations } from "@/lib/db/migrate";
import { useTempDatabase } from "../support/temp-db";

const tmp = useTempDatabase("backup-sqlite");
const SHAS = ["a".repeat(64), "0".repeat(64), "5".repeat(64)];
const at = "2026-01-01T00:00:00.000+00:00";

beforeAll(() => {
  migrate(sqlite());
  const db = new Database(tmp.filePath);
  try {
    db.transaction(() => {
      for (const sha of SHAS) db.prepare(`INSERT INTO StoredFile (sha256, sizeBytes, mimeType, createdAt) VALUES (?, 1, 'application/pdf', ?)`).run(sha, at);
      for (let i = 0; i < 7; i++) db.prepare(`INSERT INTO AuditEvent (actorName, action, entityType, entityId, at) VALUES ('local', 'test', 'record', ?, ?)`).run(String(i), at);
    })();
  } finally {
    db.close();
  }
});
afterAll(() => tmp.cleanup());

const countIn = (file: string, table: string) => {
  const db = new Database(file, { readonly: true });
  try {
    return (db.prepare(`SELECT COUNT(*) AS n FROM "${table}"`).get() as { n: number }).n;
  } finally {
    db.close();
  }
};

describe("snapshotSqlite", () => {
  test("writes a whole copy and reads the manifest's facts from it: integrity, every counted table, migrations, stored files in order", async () => {
    const file = path.join(tmp.dir, "snap.db");
    const facts = await snapshotSqlite(file);
    expect(facts.integrity).toBe("ok");
    expect(Object.keys(facts.counts).sort()).toEqual([...SQLITE_COUNTED_TABLES].sort());
    for (const t of SQLITE_COUNTED_TABLES) expect(facts.counts[t]).toBe(countIn(tmp.filePath, t));
    expect(facts.counts.AuditEvent).toBe(7);
    expect(facts.migrations).toEqual(readMigrations().map((m) => m.name));
    expect(facts.storedFiles).toEqual([...SHAS].sort());
  });

  test("a snapshot into a folder that does not exist is a SnapshotWriteError carrying the driver's error", async () => {
    const error = await snapshotSqlite(path.join(tmp.dir, "no-such-folder", "snap.db")).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(SnapshotWriteError);
    expect(((error as SnapshotWriteError).cause as Error).message).toMatch(/directory does not exist/);
    expect(existsSync(path.join(tmp.dir, "no-such-folder"))).toBe(false);
  });
});

describe("sqliteSnapshotFacts and sqliteFileIntegrity", () => {
  test("a file without Meltledger's tables has no counts, no migrations and no stored files", () => {
    const file = path.join(tmp.dir, "bare.db");
    new Database(file).exec("CREATE TABLE other (x INTEGER)").close();
    expect(sqliteSnapshotFacts(file)).toEqual({ integrity: "ok", counts: {}, migrations: [], storedFiles: [] });
  });

  test("a damaged page is reported by SQLite's integrity check, not taken as whole", () => {
    const file = path.join(tmp.dir, "damaged.db");
    const db = new Database(file);
    db.exec("CREATE TABLE t (id INTEGER PRIMARY KEY, v TEXT); CREATE INDEX t_v ON t (v)");
    const insert = db.prepare("INSERT INTO t (v) VALUES (?)");
    db.transaction(() => {
      for (let i = 0; i < 3000; i++) insert.run(`value ${i} ${"x".repeat(50)}`);
    })();
    db.close();
    expect(sqliteFileIntegrity(file)).toBe("ok");
    const bytes = readFileSync(file);
    // SQLite's default page size is 4096 bytes (sqlite.org, "PRAGMA page_size"): overwrite part of page 6
    bytes.fill(0x55, 4096 * 5 + 100, 4096 * 5 + 600);
    writeFileSync(file, bytes);
    const integrity = sqliteFileIntegrity(file);
    expect(integrity).not.toBe("ok");
    expect(integrity).toMatch(/page 6/);
  });

  test("a missing file is an error, not an empty database", () => {
    expect(() => sqliteFileIntegrity(path.join(tmp.dir, "missing.db"))).toThrow();
    expect(existsSync(path.join(tmp.dir, "missing.db"))).toBe(false);
  });
});

describe("moveSqliteFile", () => {
  test("moves the write-ahead log along: transactions still in the log stay with the file", () => {
    const live = path.join(tmp.dir, "live.db");
    const db = new Database(live);
    db.pragma("journal_mode = WAL");
    db.pragma("wal_autocheckpoint = 0"); // keep the rows in the log
    db.exec("CREATE TABLE t (v INTEGER)");
    db.prepare("INSERT INTO t (v) VALUES (1), (2), (3)").run();
    // the files as they are on disk while the connection is open: the rows are in -wal only
    const copy = path.join(tmp.dir, "copy.db");
    for (const s of ["", "-wal", "-shm"]) copyFileSync(live + s, copy + s);
    db.close();
    const bare = path.join(tmp.dir, "bare-main.db");
    copyFileSync(copy, bare);
    expect(() => countIn(bare, "t")).toThrow(/no such table/); // without its log the file lacks them

    const moved = path.join(tmp.dir, "moved.db");
    moveSqliteFile(copy, moved);
    for (const s of ["", "-wal", "-shm"]) expect(existsSync(copy + s)).toBe(false);
    expect(existsSync(`${moved}-wal`)).toBe(true);
    expect(countIn(moved, "t")).toBe(3);
  });

  test("a file without a log is moved alone", () => {
    const from = path.join(tmp.dir, "plain.db");
    new Database(from).exec("CREATE TABLE t (v INTEGER); INSERT INTO t VALUES (1)").close();
    const to = path.join(tmp.dir, "plain-moved.db");
    moveSqliteFile(from, to);
    expect(existsSync(from)).toBe(false);
    expect(existsSync(`${to}-wal`)).toBe(false);
    expect(countIn(to, "t")).toBe(1);
  });
});
