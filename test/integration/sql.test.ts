// lib/db/sql.ts on both engines with the same tests: reads, writes, value forms, transactions that
// roll back, and — on PostgreSQL, where writers really run side by side — concurrent transactions
// that must not lose an update. What a statement wrote is read back with the engine's own driver
// (better-sqlite3, pg), not only through the interface under test.
import Database from "better-sqlite3";
import { expect, test } from "vitest";
import { MAX_TRANSACTION_ATTEMPTS, sql, SqlUsageError, translateSql, type SqlDatabase } from "@/lib/db/sql";
import { describeEachEngine, type EngineDatabase } from "../support/engines";
import { withClient } from "../support/postgres";

/** One query on the engine's own driver, outside the interface. */
async function direct<T>(at: EngineDatabase, text: string): Promise<T[]> {
  if (at.engine === "sqlite") {
    const db = new Database(at.url.replace(/^file:/, ""), { readonly: true });
    try {
      return db.prepare(text).all() as T[];
    } finally {
      db.close();
    }
  }
  return withClient(at.url, async (c) => (await c.query(text)).rows as T[]);
}

const NOW = "2026-12-01T10:15:30.250Z";

async function addSource(db: SqlDatabase, title: string, year: number | null): Promise<number> {
  const { lastInsertId } = await db.run(`INSERT INTO "Source" ("kind", "title", "titleKey", "year", "machineStated", "updatedAt") VALUES (?, ?, ?, ?, ?, ?) RETURNING "id"`, [
    "article", title, title.toLowerCase(), year, true, new Date(NOW),
  ]);
  return lastInsertId!;
}

describeEachEngine("engine-neutral SQL", (current) => {
  test("an insert with RETURNING id reports the new id and one change; without RETURNING no id", async () => {
    const db = sql();
    const first = await addSource(db, "Invented study of melt tracks", 2021);
    const second = await addSource(db, "Invented study of keyholes", null);
    expect(second).toBe(first + 1);
    const rows = await direct<{ id: number; title: string }>(current(), `SELECT "id", "title" FROM "Source" ORDER BY "id"`);
    expect(rows.map((r) => Number(r.id))).toEqual([first, second]);
    const plain = await db.run(`UPDATE "Source" SET "notes" = ? WHERE "id" = ?`, ["checked", first]);
    expect(plain).toEqual({ changes: 1, lastInsertId: null });
  });

  test("values read back in the same form on both engines: numbers, booleans, UTC timestamps, NULL", async () => {
    const db = sql();
    const row = await db.get<{ n: number; year: number | null; machineStated: boolean; updatedAt: string; venue: string | null }>(
      `SELECT COUNT(*) OVER () AS n, "year", "machineStated", "updatedAt", "venue" FROM "Source" WHERE "title" = ?`,
      ["Invented study of melt tracks"],
    );
    expect(row).toEqual({ n: 1, year: 2021, machineStated: true, updatedAt: NOW, venue: null });
    // the timestamp as the engine stores it, read without the interface: the same instant
    const stored = await direct<{ updatedAt: unknown }>(current(), `SELECT "updatedAt" FROM "Source" WHERE "year" = 2021`);
    const raw = stored[0]!.updatedAt;
    expect(new Date(raw instanceof Date ? raw.getTime() - raw.getTimezoneOffset() * 60_000 : String(raw)).toISOString()).toBe(NOW);
  });

  test("rows as arrays hold the same values, converted alike, in the SELECT list's order, also inside a transaction", async () => {
    const db = sql();
    const query = `SELECT "title", COUNT(*) OVER () AS n, "year", "machineStated", "updatedAt", "venue" FROM "Source" ORDER BY "id"`;
    const objects = await db.all<Record<string, unknown>>(query);
    const arrays = await db.values<unknown[]>(query);
    expect(arrays).toEqual(objects.map((o) => [o.title, o.n, o.year, o.machineStated, o.updatedAt, o.venue]));
    expect(arrays[0]).toEqual(["Invented study of melt tracks", 2, 2021, true, NOW, null]);
    // the same statement text read as objects again: the array form did not stick to it
    expect(await db.all(query)).toEqual(objects);
    expect(await db.transaction((tx) => tx.values<unknown[]>(query, []), { readOnly: true })).toEqual(arrays);
    expect(await db.transaction((tx) => tx.values<unknown[]>(query))).toEqual(arrays);
  });

  test("COUNT is a number, a missing row is undefined, a boolean parameter matches a BOOLEAN column", async () => {
    const db = sql();
    expect(await db.get<{ n: number }>(`SELECT COUNT(*) AS n FROM "Source" WHERE "machineStated" = ?`, [true])).toEqual({ n: 2 });
    expect(await db.get(`SELECT "id" FROM "Source" WHERE "id" = ?`, [-1])).toBeUndefined();
    expect(await db.all(`SELECT "id" FROM "Source" WHERE "machineStated" = FALSE`)).toEqual([]);
  });

  test("ILIKE matches regardless of case on both; a ? inside a string literal is not a parameter", async () => {
    const db = sql();
    const rows = await db.all<{ title: string; mark: string }>(`SELECT "title", 'why?' AS mark FROM "Source" WHERE "title" ILIKE ? ORDER BY "id"`, ["%KEYHOLE%"]);
    expect(rows).toEqual([{ title: "Invented study of keyholes", mark: "why?" }]);
  });

  test("a timestamp parameter compares with stored timestamps as an instant", async () => {
    const db = sql();
    const later = await db.all(`SELECT "id" FROM "Source" WHERE "updatedAt" > ?`, [new Date(Date.parse(NOW) + 1)]);
    const earlier = await db.all(`SELECT "id" FROM "Source" WHERE "updatedAt" > ?`, [new Date(Date.parse(NOW) - 1)]);
    expect([later.length, earlier.length]).toEqual([0, 2]);
  });

  test("a transaction commits what its body wrote when the body resolves", async () => {
    const db = sql();
    const id = await db.transaction(async (tx) => {
      const s = await tx.run(`INSERT INTO "Source" ("kind", "title", "titleKey", "updatedAt") VALUES ('article', 'Committed', 'committed', ?) RETURNING "id"`, [new Date(NOW)]);
      await tx.run(`UPDATE "Source" SET "version" = "version" + 1 WHERE "id" = ?`, [s.lastInsertId]);
      return s.lastInsertId;
    });
    expect(await direct(current(), `SELECT "title", "version" FROM "Source" WHERE "id" = ${id}`)).toEqual([{ title: "Committed", version: 2 }]);
  });

  test("a transaction whose body throws writes nothing and passes the error on", async () => {
    const db = sql();
    const before = await direct<{ n: unknown }>(current(), `SELECT COUNT(*) AS n FROM "Source"`);
    const failure = new Error("stop here");
    await expect(
      db.transaction(async (tx) => {
        await tx.run(`INSERT INTO "Source" ("kind", "title", "titleKey", "updatedAt") VALUES ('article', 'Rolled back', 'rolled back', ?)`, [new Date(NOW)]);
        await tx.run(`UPDATE "Source" SET "notes" = 'changed' WHERE "year" = 2021`);
        throw failure;
      }),
    ).rejects.toBe(failure);
    expect(await direct<{ n: unknown }>(current(), `SELECT COUNT(*) AS n FROM "Source"`)).toEqual(before);
    expect(await direct(current(), `SELECT "notes" FROM "Source" WHERE "year" = 2021`)).toEqual([{ notes: "checked" }]);
  });

  test("a statement the database refuses inside a transaction rolls back the earlier statements", async () => {
    const db = sql();
    await expect(
      db.transaction(async (tx) => {
        await tx.run(`UPDATE "Source" SET "notes" = 'half done' WHERE "year" = 2021`);
        await tx.run(`INSERT INTO "Source" ("kind", "title", "titleKey", "updatedAt") VALUES ('article', NULL, 'x', ?)`, [new Date(NOW)]);
      }),
    ).rejects.toThrow();
    expect(await direct(current(), `SELECT "notes" FROM "Source" WHERE "year" = 2021`)).toEqual([{ notes: "checked" }]);
  });

  test("a transaction refused at COMMIT writes nothing and leaves the database usable", async () => {
    const db = sql();
    const before = await direct<{ n: unknown }>(current(), `SELECT COUNT(*) AS n FROM "Material"`);
    await expect(
      db.transaction(async (tx) => {
        // SQLite checks foreign keys at COMMIT with this pragma; PostgreSQL's are not deferrable and refuse the insert at once
        if (tx.engine === "sqlite") await tx.run(`PRAGMA defer_foreign_keys = ON`);
        await tx.run(`INSERT INTO "Material" ("designation", "alloyKey", "fingerprint") VALUES ('orphan', 'x', 'orphan')`);
        await tx.run(`INSERT INTO "BuildRecord" ("sourceId", "materialId", "alloyKey", "updatedAt") VALUES (?, ?, 'x', ?)`, [999_999, 999_999, new Date(NOW)]);
      }),
    ).rejects.toThrow(/foreign key/i);
    expect(await direct<{ n: unknown }>(current(), `SELECT COUNT(*) AS n FROM "Material"`)).toEqual(before);
    expect(await db.transaction((tx) => tx.get<{ n: number }>(`SELECT COUNT(*) AS n FROM "Source"`))).toEqual({ n: 3 });
  });

  test("a read-only transaction refuses a write, on both engines", async () => {
    const db = sql();
    await expect(db.transaction((tx) => tx.run(`UPDATE "Source" SET "notes" = 'no' WHERE "year" = 2021`), { readOnly: true })).rejects.toThrow(/read-only/);
    expect(await db.transaction((tx) => tx.get<{ n: number }>(`SELECT COUNT(*) AS n FROM "Source"`), { readOnly: true })).toEqual({ n: 3 });
    expect(await direct(current(), `SELECT "notes" FROM "Source" WHERE "year" = 2021`)).toEqual([{ notes: "checked" }]);
  });

  test("the database itself, or a nested transaction, used inside a transaction body is refused, not a deadlock", async () => {
    const db = sql();
    await expect(db.transaction(() => db.get(`SELECT 1 AS one`))).rejects.toThrow(SqlUsageError);
    await expect(db.transaction(() => db.transaction(async () => 1))).rejects.toThrow(SqlUsageError);
    expect(await db.get(`SELECT 1 AS one`)).toEqual({ one: 1 });
  });

  test("optimistic locking: of concurrent edits from the same version exactly one is written", async () => {
    const db = sql();
    const id = await addSource(db, "Contested source", 2019);
    const editors = 8;
    const results = await Promise.all(
      Array.from({ length: editors }, (_, i) =>
        db.transaction(async (tx) => {
          const seen = await tx.get<{ version: number }>(`SELECT "version" FROM "Source" WHERE "id" = ?`, [id]);
          await new Promise((resolve) => setTimeout(resolve, 5));
          return (await tx.run(`UPDATE "Source" SET "notes" = ?, "version" = "version" + 1 WHERE "id" = ? AND "version" = ?`, [`editor ${i}`, id, seen!.version >= 1 ? 1 : -1])).changes;
        }),
      ),
    );
    expect(results.filter((n) => n === 1)).toHaveLength(1);
    expect(results.filter((n) => n === 0)).toHaveLength(editors - 1);
    const [row] = await direct<{ version: number; notes: string }>(current(), `SELECT "version", "notes" FROM "Source" WHERE "id" = ${id}`);
    expect(row!.version).toBe(2);
    expect(row!.notes).toBe(`editor ${results.indexOf(1)}`);
  });

  test("read-modify-write in concurrent transactions loses no increment", async () => {
    const db = sql();
    const id = await addSource(db, "Counter source", 2018);
    const writers = MAX_TRANSACTION_ATTEMPTS;
    await Promise.all(
      Array.from({ length: writers }, () =>
        db.transaction(async (tx) => {
          const { year } = (await tx.get<{ year: number }>(`SELECT "year" FROM "Source" WHERE "id" = ?`, [id]))!;
          await new Promise((resolve) => setTimeout(resolve, 2));
          await tx.run(`UPDATE "Source" SET "year" = ? WHERE "id" = ?`, [year + 1, id]);
        }),
      ),
    );
    expect(await direct(current(), `SELECT "year" FROM "Source" WHERE "id" = ${id}`)).toEqual([{ year: 2018 + writers }]);
  });

  test("queries issued while a transaction is open wait for it and see only what it committed", async () => {
    const db = sql();
    let release!: () => void;
    const held = new Promise<void>((resolve) => (release = resolve));
    const tx = db.transaction(async (t) => {
      await t.run(`UPDATE "Source" SET "notes" = 'inside' WHERE "year" = 2021`);
      await held;
      throw new Error("abandon");
    });
    await new Promise((resolve) => setTimeout(resolve, 10));
    const outside = db.get<{ notes: string }>(`SELECT "notes" FROM "Source" WHERE "year" = 2021`);
    release();
    await expect(tx).rejects.toThrow("abandon");
    expect(await outside).toEqual({ notes: "checked" });
  });
});

test("SQLite: a write made on the raw connection while a read-only transaction is open is neither seen by it nor undone by its rollback", async () => {
  // The bulk paths write synchronously on the raw connection, which may fall between the awaits of
  // a read-only transaction's body; the snapshot must stay apart from it.
  const { mkdtempSync, rmSync } = await import("node:fs");
  const os = await import("node:os");
  const path = await import("node:path");
  const { closeSqlite, sqlite } = await import("@/lib/db/connection");
  const { migrate } = await import("@/lib/db/migrate");
  const { closeSql } = await import("@/lib/db/sql");
  const dir = mkdtempSync(path.join(os.tmpdir(), "meltledger-snapshot-"));
  const previous = process.env.DATABASE_URL;
  process.env.DATABASE_URL = `file:${path.join(dir, "meltledger.db")}`;
  try {
    migrate(sqlite());
    const db = sql();
    await addSource(db, "Snapshot source", 1999);
    const count = `SELECT COUNT(*) AS n FROM "Source" WHERE "year" = 1999`;
    let seenInside = -1;
    const reading = db.transaction(async (t) => {
      const before = (await t.get<{ n: number }>(count))!.n;
      sqlite().transaction(() => {
        sqlite().prepare(`INSERT INTO "Source" ("kind", "title", "titleKey", "year", "updatedAt") VALUES ('article', 'Written meanwhile', 'written meanwhile', 1999, '2026-12-01T10:15:30.250+00:00')`).run();
      })();
      seenInside = (await t.get<{ n: number }>(count))!.n - before;
      throw new Error("the reader gives up");
    }, { readOnly: true });
    await expect(reading).rejects.toThrow("the reader gives up");
    expect(seenInside).toBe(0); // one snapshot
    expect((sqlite().prepare(count).get() as { n: number }).n).toBe(2); // the write stands
  } finally {
    await closeSql();
    closeSqlite();
    process.env.DATABASE_URL = previous;
    rmSync(dir, { recursive: true, force: true });
  }
});

test.each([
  ["SELECT * FROM \"T\" WHERE a = ? AND b = ?", "postgresql", "SELECT * FROM \"T\" WHERE a = $1 AND b = $2"],
  ["SELECT '?', \"we?rd\" FROM t WHERE a = ?", "postgresql", "SELECT '?', \"we?rd\" FROM t WHERE a = $1"],
  ["SELECT 'it''s ?' WHERE x ILIKE ?", "sqlite", "SELECT 'it''s ?' WHERE x LIKE ?"],
  ["SELECT x FROM t WHERE x ILIKE ? AND 'ILIKE' = ? AND xilike = 1", "sqlite", "SELECT x FROM t WHERE x LIKE ? AND 'ILIKE' = ? AND xilike = 1"],
  ["SELECT x WHERE x ILIKE ?", "postgresql", "SELECT x WHERE x ILIKE $1"],
] as const)("translateSql(%j, %s)", (input, engine, expected) => {
  expect(translateSql(input, engine)).toBe(expected);
});

test("translateSql refuses an unterminated literal rather than guessing", () => {
  expect(() => translateSql("SELECT 'open", "postgresql")).toThrow(SqlUsageError);
});
