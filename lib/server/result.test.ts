import { describe, expect, test } from "vitest";
import { guard, postgresFailure, sqliteCodeOf, storageFailure } from "./result";

const sqliteError = (code: string) => Object.assign(new Error("sqlite"), { code });
// the shapes the Prisma driver adapter throws: a DriverAdapterError, and a known request error around one
const adapterError = (code: string) => Object.assign(new Error("adapter"), { cause: { originalCode: code, kind: "sqlite" } });
const prismaError = (code: string) => Object.assign(new Error("prisma"), { code: "P2039", meta: { driverAdapterError: { cause: { originalCode: code } } } });

describe("storage errors", () => {
  test.each([
    [sqliteError("SQLITE_FULL"), "full"],
    [adapterError("SQLITE_FULL"), "full"],
    [prismaError("SQLITE_FULL"), "full"],
    [Object.assign(new Error("fs"), { code: "ENOSPC" }), "full"],
    [sqliteError("SQLITE_READONLY"), "read_only"],
    [sqliteError("SQLITE_READONLY_DBMOVED"), "read_only"],
    [adapterError("SQLITE_READONLY"), "read_only"],
    [Object.assign(new Error("fs"), { code: "EROFS" }), "read_only"],
    [prismaError("SQLITE_CANTOPEN"), "cannot_open"],
    [sqliteError("SQLITE_IOERR_WRITE"), "io_error"],
  ])("%s is unavailable (%s), never internal", async (error, storage) => {
    const r = await guard(async () => {
      throw error;
    });
    expect(!r.ok && r.error).toMatchObject({ code: "unavailable", details: { storage } });
  });

  test.each([[sqliteError("SQLITE_BUSY")], [adapterError("SQLITE_BUSY")], [Object.assign(new Error("tx"), { code: "P2034" })]])("busy %s is unavailable", (error) => {
    expect(storageFailure(error)?.error.code).toBe("unavailable");
  });

  test.each([[new Error("plain")], [sqliteError("SQLITE_CONSTRAINT")], [Object.assign(new Error("fs"), { code: "ENOENT" })], [null], ["text"]])("%s is not a storage failure", (error) => {
    expect(storageFailure(error)).toBeNull();
  });

  test("sqliteCodeOf prefers the wrapped SQLite code over Prisma's own", () => {
    expect(sqliteCodeOf(prismaError("SQLITE_FULL"))).toBe("SQLITE_FULL");
  });
});

describe("PostgreSQL errors", () => {
  const pgError = (code: string) => Object.assign(new Error(`pg ${code}`), { code });
  test.each([["ECONNREFUSED"], ["28P01"], ["3D000"], ["40001"], ["40P01"]])("%s is unavailable, never internal", async (code) => {
    const r = await guard(async () => {
      throw pgError(code);
    });
    expect(!r.ok && r.error).toMatchObject({ code: "unavailable", details: { engine: "postgresql" } });
  });

  test("a constraint violation (23505) is not mistaken for an unavailable server", () => {
    expect(postgresFailure(pgError("23505"))).toBeNull();
  });

  // the shapes Prisma's pg adapter throws when the server is down: a DriverAdapterError, and a known request error around one
  const adapterDown = () => Object.assign(new Error("DatabaseNotReachable"), { name: "DriverAdapterError", cause: { kind: "DatabaseNotReachable", host: "db.example", port: 5432 } });
  const prismaDown = () =>
    Object.assign(new Error("\nInvalid `db.source.findMany()` invocation in\n/srv/lib/db/sources.ts:82:32\n\n  79 …\nCan't reach database server at db.example:5432"), {
      code: "P1001",
      meta: { modelName: "Source", driverAdapterError: { cause: { kind: "DatabaseNotReachable", host: "db.example", port: 5432 } } },
    });
  test.each([
    ["the adapter's error", adapterDown, "DatabaseNotReachable"],
    ["Prisma's request error around it", prismaDown, "Can't reach database server at db.example:5432"],
  ])("%s is unavailable with a one-line reason, never internal", async (_, make, reason) => {
    const r = await guard(async () => {
      throw make();
    });
    expect(!r.ok && r.error).toEqual({ code: "unavailable", message: `The PostgreSQL server cannot be reached or refused the connection (${reason}); nothing was changed. Try again when it is back.`, details: { engine: "postgresql" } });
  });

  test("an adapter error of another kind (a unique constraint) is not an unavailable server", () => {
    expect(postgresFailure(Object.assign(new Error("adapter"), { cause: { kind: "UniqueConstraintViolation" } }))).toBeNull();
    expect(postgresFailure(Object.assign(new Error("prisma"), { code: "P2002", meta: { driverAdapterError: { cause: { kind: "UniqueConstraintViolation" } } } }))).toBeNull();
  });
});
