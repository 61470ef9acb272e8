// Proves the hand-written SQL migrations build exactly the database prisma/schema.prisma
// describes: every model a table, every scalar field a column of the right type and
// nullability, every @id/@unique/@@unique/@@index an index, every relation a foreign key.
import { readFileSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { openSqlite, type SqliteDatabase } from "@/lib/db/connection";
import { migrate, readMigrations } from "@/lib/db/migrate";
import { columnsOf, parsePrismaSchema, SQLITE_TYPE } from "../support/prisma-schema";
import { useTempDatabase } from "../support/temp-db";

const tmp = useTempDatabase("drift");
const models = parsePrismaSchema(readFileSync(path.resolve(import.meta.dirname, "../../prisma/schema.prisma"), "utf8"));
let db: SqliteDatabase;

beforeAll(() => {
  db = openSqlite(tmp.filePath);
  migrate(db);
});
afterAll(async () => {
  db.close();
  await tmp.cleanup();
});

interface ColumnInfo { name: string; type: string; notnull: number; pk: number }
interface IndexInfo { name: string; unique: number; origin: string }
interface ForeignKeyInfo { table: string; from: string; to: string }

describe("migrated database matches schema.prisma", () => {
  test("the schema reader found the models", () => {
    expect(models.length).toBeGreaterThanOrEqual(10);
  });

  test("same set of tables", () => {
    const tables = (db.prepare(`SELECT name FROM sqlite_master WHERE type='table' AND name NOT LIKE 'sqlite_%' AND name <> '_prisma_migrations'`).all() as { name: string }[]).map((t) => t.name).sort();
    expect(tables).toEqual(models.map((m) => m.name).sort());
  });

  test.each(models.map((m) => [m.name, m] as const))("%s: columns, types and nullability", (_name, model) => {
    const cols = db.prepare(`PRAGMA table_info("${model.name}")`).all() as ColumnInfo[];
    const actual = cols.map((c) => ({ name: c.name, type: c.type, nullable: c.notnull === 0 && c.pk === 0 })).sort((a, b) => a.name.localeCompare(b.name));
    const expected = columnsOf(model).map((f) => ({ name: f.name, type: SQLITE_TYPE[f.type], nullable: f.optional })).sort((a, b) => a.name.localeCompare(b.name));
    expect(actual).toEqual(expected);
  });

  test.each(models.map((m) => [m.name, m] as const))("%s: primary key", (_name, model) => {
    const cols = db.prepare(`PRAGMA table_info("${model.name}")`).all() as ColumnInfo[];
    expect(cols.filter((c) => c.pk > 0).map((c) => c.name)).toEqual(model.fields.filter((f) => f.isId).map((f) => f.name));
  });

  test.each(models.map((m) => [m.name, m] as const))("%s: indexes", (_name, model) => {
    const indexes = (db.prepare(`PRAGMA index_list("${model.name}")`).all() as IndexInfo[]).filter((i) => i.origin !== "pk");
    const actual = indexes
      .map((i) => ({ unique: i.unique === 1, columns: (db.prepare(`PRAGMA index_info("${i.name}")`).all() as { name: string }[]).map((c) => c.name) }))
      .map((i) => `${i.unique ? "unique" : "index"}(${i.columns.join(",")})`)
      .sort();
    const expected = [
      ...columnsOf(model).filter((f) => f.isUnique && !f.isId).map((f) => `unique(${f.name})`),
      ...model.indexes.map((i) => `${i.unique ? "unique" : "index"}(${i.columns.join(",")})`),
    ].sort();
    expect(actual).toEqual(expected);
  });

  test.each(models.map((m) => [m.name, m] as const))("%s: foreign keys", (_name, model) => {
    const fks = (db.prepare(`PRAGMA foreign_key_list("${model.name}")`).all() as ForeignKeyInfo[]).map((f) => `${f.from}->${f.table}.${f.to}`).sort();
    const expected = model.fields
      .filter((f) => f.relation)
      .flatMap((f) => f.relation!.fields.map((col, i) => `${col}->${f.type}.${f.relation!.references[i]}`))
      .sort();
    expect(fks).toEqual(expected);
  });
});

describe("migration runner", () => {
  test("records each migration in _prisma_migrations and is idempotent", () => {
    const names = readMigrations().map((m) => m.name);
    const rows = db.prepare(`SELECT migration_name FROM _prisma_migrations ORDER BY migration_name`).all() as { migration_name: string }[];
    expect(rows.map((r) => r.migration_name)).toEqual(names);
    const again = migrate(db);
    expect(again.applied).toEqual([]);
    expect(again.alreadyApplied).toEqual(names);
  });

  test("refuses a migration edited after it was applied", () => {
    const edited = readMigrations().map((m, i) => (i === 0 ? { ...m, checksum: "0".repeat(64) } : m));
    expect(() => migrate(db, edited)).toThrow(/changed after it was applied/);
  });

  test("WAL mode and foreign keys are on", () => {
    expect(db.pragma("journal_mode", { simple: true })).toBe("wal");
    expect(db.pragma("foreign_keys", { simple: true })).toBe(1);
  });

  test("audit events cannot be updated or deleted, records cannot be deleted", () => {
    db.prepare(`INSERT INTO AuditEvent (actorName, action, entityType, entityId) VALUES ('t', 'create', 'record', '1')`).run();
    expect(() => db.prepare(`UPDATE AuditEvent SET action = 'x'`).run()).toThrow(/append-only/);
    expect(() => db.prepare(`DELETE FROM AuditEvent`).run()).toThrow(/append-only/);
    const src = db.prepare(`INSERT INTO Source (kind, title, titleKey, updatedAt) VALUES ('report', 'T', 't', '2026-01-01T00:00:00.000Z')`).run().lastInsertRowid;
    const mat = db.prepare(`INSERT INTO Material (designation, alloyKey, fingerprint) VALUES ('316L', '316L', 'fp')`).run().lastInsertRowid;
    db.prepare(`INSERT INTO BuildRecord (sourceId, materialId, alloyKey, updatedAt) VALUES (?, ?, '316L', '2026-01-01T00:00:00.000Z')`).run(src, mat);
    expect(() => db.prepare(`DELETE FROM BuildRecord`).run()).toThrow(/never deleted/);
    expect(() => db.prepare(`DELETE FROM Source`).run()).toThrow(/never deleted/);
  });
});
