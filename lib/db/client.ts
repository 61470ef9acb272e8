import { PrismaBetterSqlite3 } from "@prisma/adapter-better-sqlite3";
import { PrismaPg } from "@prisma/adapter-pg";
import { PrismaClient } from "../generated/prisma/client";
import { PrismaClient as PostgresPrismaClient } from "../generated/prisma-pg/client";
import { resolveDatabaseTarget, type DatabaseEngine } from "./location";
import { pgPoolSizes } from "./pool-size";

export type Db = PrismaClient;

const globalForPrisma = globalThis as unknown as { meltledgerPrisma?: { key: string; engine: DatabaseEngine; client: PrismaClient; ready: Promise<void> } };

/**
 * The one Prisma client, cached on globalThis so hot reload in development does not open a
 * connection per edit. DATABASE_URL's scheme picks the driver adapter: a file (SQLite, the
 * embedded default) goes through better-sqlite3, postgres:// or postgresql:// through pg.
 * Await `prismaReady()` before first use: on SQLite it switches foreign keys on for the adapter's
 * connection (SQLite's default is off).
 */
export function prisma(): PrismaClient {
  return entry().client;
}

export function prismaReady(): Promise<PrismaClient> {
  const e = entry();
  return e.ready.then(() => e.client);
}

/** The engine the cached client talks to (for the few queries that must differ by dialect). */
export function prismaEngine(): DatabaseEngine {
  return entry().engine;
}

function entry() {
  const target = resolveDatabaseTarget();
  const key = target.engine === "sqlite" ? target.filePath : target.url;
  const cached = globalForPrisma.meltledgerPrisma;
  if (cached && cached.key === key) return cached;
  let created: NonNullable<typeof globalForPrisma.meltledgerPrisma>;
  if (target.engine === "sqlite") {
    const adapter = new PrismaBetterSqlite3({ url: `file:${target.filePath}`, timeout: 10_000 });
    const client = new PrismaClient({ adapter });
    const ready = client.$executeRawUnsafe("PRAGMA foreign_keys = ON").then(() => undefined);
    created = { key, engine: "sqlite", client, ready };
  } else {
    // Both clients come from schemas with the same models and fields (schema-drift-postgres.test.ts).
    // They differ in dialect options only, where the SQLite client offers a subset of PostgreSQL's
    // (transaction isolation levels, case-insensitive filters), so code typed against the SQLite
    // client is valid on this one: the cast narrows, it does not invent an API.
    const client = new PostgresPrismaClient({ adapter: new PrismaPg({ connectionString: target.url, max: pgPoolSizes().prisma }) }) as unknown as PrismaClient;
    created = { key, engine: "postgresql", client, ready: Promise.resolve() };
  }
  globalForPrisma.meltledgerPrisma = created;
  return created;
}

export async function disconnectPrisma(): Promise<void> {
  const cached = globalForPrisma.meltledgerPrisma;
  globalForPrisma.meltledgerPrisma = undefined;
  if (cached) await cached.client.$disconnect();
}
