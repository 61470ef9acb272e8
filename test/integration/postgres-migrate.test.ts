// Proves the hand-written PostgreSQL migrations build exactly the database
// prisma/postgres/schema.prisma describes (tables, columns with types and nullability, primary
// keys, indexes, foreign keys), that the runner records its history like Prisma Migrate, that the
// triggers keep audit events append-only and records, sources and flags undeletable, and that the
// Prisma client DATABASE_URL selects is the PostgreSQL one.
import { readFileSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, expect, test } from "vitest";
import { disconnectPrisma, prisma, prismaEngine, prismaReady } from "@/lib/db/client";
import { closeSqlite, sqlite } from "@/lib/db/connection";
import { EngineNotSupportedError } from "@/lib/db/location";
import { migratePostgres, readPostgresMigrations } from "@/lib/db/migrate-postgres";
import { migrateDatabase } from "@/lib/server/maintenance";
import { columnsOf, parsePrismaSchema, POSTGRES_TYPE } from "../support/prisma-schema";
import { describePostgres, useTempPostgres, withClient } from "../support/postgres";

const models = parsePrismaSchema(readFileSync(path.resolve(import.meta.dirname, "../../prisma/postgres/schema.prisma"), "utf8"));

describePostgres("PostgreSQL migrations", () => {
  const server = useTempPostgres("migrate");
  let url = "";
  const query = async <T,>(sql: string, params: unknown[] = []) => withClient(url, async (c) => (await c.query(sql, params)).rows as T[]);
  const previousUrl = process.env.DATABASE_URL;

  beforeAll(async () => {
    url = await server.createDatabase();
    await withClient(url, (c) => migratePostgres(c));
  });
  afterAll(async () => {
    await disconnectPrisma();
    closeSqlite();
    process.env.DATABASE_URL = previousUrl;
  });

  test("the schema reader found the models", () => {
    expect(models.length).toBeGreaterThanOrEqual(10);
  });

  test("same set of tables", async () => {
    const rows = await query<{ table_name: string }>(`SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' AND table_name <> '_prisma_migrations'`);
    expect(rows.map((r) => r.table_name).sort()).toEqual(models.map((m) => m.name).sort());
  });

  test.each(models.map((m) => [m.name, m] as const))("%s: columns, types and nullability", async (_name, model) => {
    const cols = await query<{ column_name: string; data_type: string; is_nullable: string; datetime_precision: number | null }>(
      `SELECT column_name, data_type, is_nullable, datetime_precision FROM information_schema.columns WHERE table_schema = 'public' AND table_name = $1`,
      [model.name],
    );
    const actual = cols.map((c) => ({ name: c.column_name, type: c.data_type === "timestamp without time zone" ? `${c.data_type}(${c.datetime_precision})` : c.data_type, nullable: c.is_nullable === "YES" })).sort((a, b) => a.name.localeCompare(b.name));
    // Prisma keeps DateTime as TIMESTAMP(3) on PostgreSQL: milliseconds, as JavaScript's Date
    const expected = columnsOf(model).map((f) => ({ name: f.name, type: f.type === "DateTime" ? `${POSTGRES_TYPE[f.type]}(3)` : POSTGRES_TYPE[f.type], nullable: f.optional })).sort((a, b) => a.name.localeCompare(b.name));
    expect(actual).toEqual(expected);
  });

  test.each(models.map((m) => [m.name, m] as const))("%s: primary key, and a sequence behind an autoincrement id", async (_name, model) => {
    const pk = await query<{ attname: string; default: string | null }>(
      `SELECT a.attname, pg_get_expr(d.adbin, d.adrelid) AS default FROM pg_index i JOIN pg_attribute a ON a.attrelid = i.indrelid AND a.attnum = ANY(i.indkey)
       LEFT JOIN pg_attrdef d ON d.adrelid = a.attrelid AND d.adnum = a.attnum WHERE i.indrelid = $1::regclass AND i.indisprimary`,
      [`"${model.name}"`],
    );
    const idFields = model.fields.filter((f) => f.isId);
    expect(pk.map((r) => r.attname)).toEqual(idFields.map((f) => f.name));
    for (const f of idFields) expect(pk.find((r) => r.attname === f.name)!.default?.startsWith("nextval(") ?? false).toBe(f.autoincrement);
  });

  test.each(models.map((m) => [m.name, m] as const))("%s: indexes", async (_name, model) => {
    const rows = await query<{ unique: boolean; columns: string[] }>(
      `SELECT i.indisunique AS unique, ARRAY(SELECT a.attname FROM unnest(i.indkey) WITH ORDINALITY AS k(attnum, n) JOIN pg_attribute a ON a.attrelid = i.indrelid AND a.attnum = k.attnum ORDER BY k.n)::text[] AS columns
       FROM pg_index i WHERE i.indrelid = $1::regclass AND NOT i.indisprimary`,
      [`"${model.name}"`],
    );
    const actual = rows.map((i) => `${i.unique ? "unique" : "index"}(${i.columns.join(",")})`).sort();
    const expected = [
      ...columnsOf(model).filter((f) => f.isUnique && !f.isId).map((f) => `unique(${f.name})`),
      ...model.indexes.map((i) => `${i.unique ? "unique" : "index"}(${i.columns.join(",")})`),
    ].sort();
    expect(actual).toEqual(expected);
  });

  test.each(models.map((m) => [m.name, m] as const))("%s: foreign keys", async (_name, model) => {
    const rows = await query<{ fk: string }>(
      `SELECT a.attname || '->' || (c.confrelid::regclass)::text || '.' || af.attname AS fk FROM pg_constraint c
       JOIN pg_attribute a ON a.attrelid = c.conrelid AND a.attnum = c.conkey[1]
       JOIN pg_attribute af ON af.attrelid = c.confrelid AND af.attnum = c.confkey[1]
       WHERE c.contype = 'f' AND c.conrelid = $1::regclass`,
      [`"${model.name}"`],
    );
    const actual = rows.map((r) => r.fk.replace(/"/g, "")).sort();
    const expected = model.fields
      .filter((f) => f.relation)
      .flatMap((f) => f.relation!.fields.map((col, i) => `${col}->${f.type}.${f.relation!.references[i]}`))
      .sort();
    expect(actual).toEqual(expected);
  });

  test("records each migration in _prisma_migrations and is idempotent", async () => {
    const names = readPostgresMigrations().map((m) => m.name);
    const rows = await query<{ migration_name: string; checksum: string; applied_steps_count: number }>(`SELECT migration_name, checksum, applied_steps_count FROM _prisma_migrations ORDER BY migration_name`);
    expect(rows.map((r) => r.migration_name)).toEqual(names);
    expect(rows.map((r) => r.checksum)).toEqual(readPostgresMigrations().map((m) => m.checksum));
    const again = await withClient(url, (c) => migratePostgres(c));
    expect(again).toEqual({ applied: [], alreadyApplied: names });
  });

  test("refuses a migration edited after it was applied", async () => {
    const edited = readPostgresMigrations().map((m, i) => (i === 0 ? { ...m, checksum: "0".repeat(64) } : m));
    await expect(withClient(url, (c) => migratePostgres(c, edited))).rejects.toThrow(/changed after it was applied/);
  });

  test("a failing migration leaves nothing behind and is not recorded", async () => {
    const broken = [...readPostgresMigrations(), { name: "29991231000000_broken", sql: `CREATE TABLE "Half" (id INTEGER); SELECT no_such_function();`, checksum: "1".repeat(64) }];
    await expect(withClient(url, (c) => migratePostgres(c, broken))).rejects.toThrow(/29991231000000_broken failed and was rolled back/);
    expect(await query(`SELECT 1 FROM information_schema.tables WHERE table_name = 'Half'`)).toEqual([]);
    expect(await query(`SELECT 1 FROM _prisma_migrations WHERE migration_name = '29991231000000_broken'`)).toEqual([]);
  });

  test("audit events cannot be updated, deleted or truncated", async () => {
    await withClient(url, async (c) => {
      await c.query(`INSERT INTO "AuditEvent" ("actorName", action, "entityType", "entityId") VALUES ('t', 'create', 'record', '1')`);
      await expect(c.query(`UPDATE "AuditEvent" SET action = 'x'`)).rejects.toThrow(/append-only/);
      await expect(c.query(`DELETE FROM "AuditEvent"`)).rejects.toThrow(/append-only/);
      await expect(c.query(`TRUNCATE "AuditEvent"`)).rejects.toThrow(/append-only/);
      expect((await c.query(`SELECT action FROM "AuditEvent"`)).rows).toEqual([{ action: "create" }]);
    });
  });

  test("records, sources and flags cannot be deleted; a record can still be edited", async () => {
    await withClient(url, async (c) => {
      const src = (await c.query(`INSERT INTO "Source" (kind, title, "titleKey", "updatedAt") VALUES ('report', 'T', 't', now()) RETURNING id`)).rows[0].id;
      const mat = (await c.query(`INSERT INTO "Material" (designation, "alloyKey", fingerprint) VALUES ('316L', '316L', 'fp') RETURNING id`)).rows[0].id;
      const rec = (await c.query(`INSERT INTO "BuildRecord" ("sourceId", "materialId", "alloyKey", "updatedAt") VALUES ($1, $2, '316L', now()) RETURNING id`, [src, mat])).rows[0].id;
      await c.query(`INSERT INTO "Flag" ("recordId", "ruleCode", severity, message, fingerprint) VALUES ($1, 'R1', 'info', 'm', 'f1')`, [rec]);
      await expect(c.query(`DELETE FROM "BuildRecord"`)).rejects.toThrow(/never deleted/);
      await expect(c.query(`DELETE FROM "Source"`)).rejects.toThrow(/never deleted/);
      await expect(c.query(`DELETE FROM "Flag"`)).rejects.toThrow(/never deleted/);
      await expect(c.query(`TRUNCATE "BuildRecord" CASCADE`)).rejects.toThrow(/never deleted/);
      await c.query(`UPDATE "BuildRecord" SET status = 'rejected' WHERE id = $1`, [rec]);
      expect((await c.query(`SELECT status FROM "BuildRecord" WHERE id = $1`, [rec])).rows).toEqual([{ status: "rejected" }]);
    });
  });

  test("with a PostgreSQL DATABASE_URL the Prisma client runs over pg, and the SQLite-only connection refuses with a clear message", async () => {
    await disconnectPrisma();
    process.env.DATABASE_URL = url;
    expect(prismaEngine()).toBe("postgresql");
    const db = await prismaReady();
    const user = await db.user.create({ data: { name: "pg-check", role: "reviewer" } });
    expect(await prisma().user.findUnique({ where: { id: user.id } })).toMatchObject({ name: "pg-check", role: "reviewer", disabled: false });
    expect((await query<{ name: string }>(`SELECT name FROM "User" WHERE id = $1`, [user.id]))[0]?.name).toBe("pg-check");
    // the append-only trigger answers through Prisma as well
    const event = await db.auditEvent.create({ data: { actorName: "t", action: "create", entityType: "user", entityId: String(user.id) } });
    await expect(db.auditEvent.update({ where: { id: event.id }, data: { action: "x" } })).rejects.toThrow(/append-only/);
    expect(() => sqlite()).toThrow(EngineNotSupportedError);
    expect(() => sqlite()).toThrow(/this operation works on a SQLite file only/);
  });

  test("`db migrate` on a PostgreSQL DATABASE_URL runs the PostgreSQL migrations", async () => {
    process.env.DATABASE_URL = url;
    const r = await migrateDatabase();
    expect(r).toEqual({ ok: true, data: { filePath: url, engine: "postgresql", applied: [], alreadyApplied: readPostgresMigrations().map((m) => m.name) } });
  });
});
