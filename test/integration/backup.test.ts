// `db backup` / `db restore`: an online snapshot with its stored files and a manifest of hashes;
// restore checks everything before it replaces anything.
import { execFile } from "node:child_process";
import { appendFileSync, existsSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import Database from "better-sqlite3";
import { sqlite } from "@/lib/db/connection";
import { migrate } from "@/lib/db/migrate";
import { localActor, type Actor } from "@/lib/server/actor";
import { backupDatabase, restoreDatabase, verifyBackup } from "@/lib/server/backup";
import { attachPdfToSource } from "@/lib/server/files";
import { createRecord } from "@/lib/server/records";
import { insertRecordsBulk } from "@/lib/server/records-bulk";
import { createSource } from "@/lib/server/sources";
import { mixedUnitRecord, sourceInput } from "../support/fixtures";
import { inventedPaperPdf, makePdf } from "../support/pdf";
import { useTempDatabase } from "../support/temp-db";

const tmp = useTempDatabase("backup");
const BIN = path.resolve(import.meta.dirname, "../../bin/meltledger.mjs");
const run = promisify(execFile);
let actor: Actor;
let sourceId: number;
const count = (table: string) => (sqlite().prepare(`SELECT COUNT(*) AS n FROM ${table}`).get() as { n: number }).n;
const out = (name: string) => path.join(tmp.dir, name);

beforeAll(async () => {
  migrate(sqlite());
  actor = await localActor();
  const s = await createSource(sourceInput({ doi: "10.5555/backup.1" }), actor);
  if (!s.ok) throw new Error(s.error.message);
  sourceId = s.data.id;
  for (let i = 0; i < 5; i++) if (!(await createRecord(mixedUnitRecord(sourceId, { locationPage: i + 1 }), actor)).ok) throw new Error("record");
  const a = await attachPdfToSource(sourceId, [inventedPaperPdf().pdf], "paper.pdf", actor);
  const b = await attachPdfToSource(sourceId, [makePdf([{ texts: [{ x: 72, y: 700, text: "Second invented paper" }] }])], "second.pdf", actor);
  if (!a.ok || !b.ok) throw new Error("pdf");
});
afterAll(() => tmp.cleanup());

describe("db backup", () => {
  test("writes the database, every stored file and a manifest whose hashes match", async () => {
    const r = await backupDatabase(out("b1"));
    if (!r.ok) throw new Error(r.error.message);
    expect(r.data).toMatchObject({ files: 2, missingFiles: [] });
    expect(r.data.counts.BuildRecord).toBe(5);
    const manifest = JSON.parse(readFileSync(path.join(out("b1"), "manifest.json"), "utf8"));
    expect(manifest.database.integrity).toBe("ok");
    expect(manifest.files).toHaveLength(2);
    const v = await verifyBackup(out("b1"));
    expect(v.ok).toBe(true);
    const snap = new Database(path.join(out("b1"), "meltledger.db"), { readonly: true });
    expect((snap.prepare(`SELECT COUNT(*) AS n FROM BuildRecord`).get() as { n: number }).n).toBe(5);
    snap.close();
  });

  test("refuses a folder that already holds something", async () => {
    const r = await backupDatabase(out("b1"));
    expect(!r.ok && r.error.code).toBe("conflict");
  });

  test("is consistent while another connection writes (the snapshot holds whole transactions only)", async () => {
    // a second connection commits batches of 100 audit events, one batch per event-loop turn, while the backup runs
    const writer = new Database(tmp.filePath);
    writer.pragma("busy_timeout = 10000");
    const insert = writer.prepare(`INSERT INTO AuditEvent (actorName, action, entityType, entityId, at) VALUES ('local', 'test', 'record', ?, '2026-01-01T00:00:00.000+00:00')`);
    const batch = writer.transaction((k: number) => {
      for (let i = 0; i < 100; i++) insert.run(`${k}-${i}`);
    });
    const before = count("AuditEvent");
    let batches = 0;
    let stop = false;
    const loop = (async () => {
      while (!stop && batches < 500) {
        batch(batches++);
        await new Promise((r) => setImmediate(r));
      }
    })();
    const r = await backupDatabase(out("b-online"));
    stop = true;
    await loop;
    writer.close();
    if (!r.ok) throw new Error(r.error.message);
    expect(batches).toBeGreaterThan(0);
    const inSnapshot = r.data.counts.AuditEvent! - before;
    expect(inSnapshot % 100).toBe(0);
    expect(inSnapshot / 100).toBeLessThanOrEqual(batches);
    expect((await verifyBackup(out("b-online"))).ok).toBe(true);
  });
});

describe("db restore", () => {
  test("puts the backup back, keeps the replaced database aside and refills missing stored files", async () => {
    const b = await backupDatabase(out("b2"));
    if (!b.ok) throw new Error(b.error.message);
    const inBackup = count("BuildRecord");
    await insertRecordsBulk([mixedUnitRecord(sourceId, { locationPage: 999 })], actor);
    expect(count("BuildRecord")).toBe(inBackup + 1);
    const r = await restoreDatabase(out("b2"));
    if (!r.ok) throw new Error(r.error.message);
    expect(count("BuildRecord")).toBe(inBackup);
    expect(r.data.previousDatabase && existsSync(r.data.previousDatabase)).toBeTruthy();
    const kept = new Database(r.data.previousDatabase!, { readonly: true });
    expect((kept.prepare(`SELECT COUNT(*) AS n FROM BuildRecord`).get() as { n: number }).n).toBe(inBackup + 1);
    kept.close();
    expect(r.data.filesAlreadyPresent).toBe(2);
  });

  test.each([
    ["a stored file changed by one byte", (dir: string) => {
      const m = JSON.parse(readFileSync(path.join(dir, "manifest.json"), "utf8"));
      appendFileSync(path.join(dir, m.files[0].path), "x");
    }, /bytes|SHA-256/],
    ["the database file changed", (dir: string) => {
      const db = path.join(dir, "meltledger.db");
      const bytes = readFileSync(db);
      bytes[bytes.length - 10] = bytes[bytes.length - 10]! ^ 0xff;
      writeFileSync(db, bytes);
    }, /SHA-256/],
    ["a manifest path escaping the folder", (dir: string) => {
      const m = JSON.parse(readFileSync(path.join(dir, "manifest.json"), "utf8"));
      m.files[0].path = `../../${m.files[0].sha256}`;
      writeFileSync(path.join(dir, "manifest.json"), JSON.stringify(m));
    }, /manifest/],
    ["a missing manifest", (dir: string) => writeFileSync(path.join(dir, "manifest.json"), "{ not json"), /not valid JSON/],
  ])("refuses a backup with %s and changes nothing", async (name, damage, message) => {
    const dir = out(`bad-${name.replace(/\W+/g, "-")}`);
    const b = await backupDatabase(dir);
    if (!b.ok) throw new Error(b.error.message);
    damage(dir);
    const before = count("BuildRecord");
    await insertRecordsBulk([mixedUnitRecord(sourceId, { locationPage: 500 })], actor);
    const previous = readdirSync(path.join(tmp.dir, "previous")).length;
    const r = await restoreDatabase(dir);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error.message).toMatch(message);
    expect(count("BuildRecord")).toBe(before + 1);
    expect(readdirSync(path.join(tmp.dir, "previous")).length).toBe(previous);
  });

  test("the CLI runs both and exits 2 on a damaged backup", async () => {
    const env = { ...process.env, DATABASE_URL: `file:${tmp.filePath}` };
    const b = await run(process.execPath, [BIN, "db", "backup", out("cli"), "--json"], { env });
    expect(JSON.parse(b.stdout).files).toBe(2);
    const r = await run(process.execPath, [BIN, "db", "restore", out("cli")], { env });
    expect(r.stdout).toMatch(/every hash checked/);
    const m = JSON.parse(readFileSync(path.join(out("cli"), "manifest.json"), "utf8"));
    appendFileSync(path.join(out("cli"), m.files[1].path), "tampered");
    const bad = await run(process.execPath, [BIN, "db", "restore", out("cli")], { env }).then(() => ({ code: 0, stderr: "" }), (e: { code: number; stderr: string }) => e);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/does not match its manifest/);
  }, 60_000);
});
