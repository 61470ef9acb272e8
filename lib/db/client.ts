import { PrismaBetterSqlite3 } from "@prisma/adapter-better-sqlite3";
import { PrismaClient } from "../generated/prisma/client";
import { resolveDatabaseLocation } from "./location";

export type Db = PrismaClient;

const globalForPrisma = globalThis as unknown as { meltledgerPrisma?: { url: string; client: PrismaClient; ready: Promise<void> } };

/**
 * The one Prisma client, over the better-sqlite3 adapter, cached on globalThis so hot reload in
 * development does not open a connection per edit. Await `prismaReady()` before first use: it
 * switches foreign keys on for the adapter's connection (SQLite's default is off).
 */
export function prisma(): PrismaClient {
  return entry().client;
}

export function prismaReady(): Promise<PrismaClient> {
  const e = entry();
  return e.ready.then(() => e.client);
}

function entry() {
  const { filePath } = resolveDatabaseLocation();
  const cached = globalForPrisma.meltledgerPrisma;
  if (cached && cached.url === filePath) return cached;
  const adapter = new PrismaBetterSqlite3({ url: `file:${filePath}`, timeout: 10_000 });
  const client = new PrismaClient({ adapter });
  const ready = client.$executeRawUnsafe("PRAGMA foreign_keys = ON").then(() => undefined);
  const created = { url: filePath, client, ready };
  globalForPrisma.meltledgerPrisma = created;
  return created;
}

export async function disconnectPrisma(): Promise<void> {
  const cached = globalForPrisma.meltledgerPrisma;
  globalForPrisma.meltledgerPrisma = undefined;
  if (cached) await cached.client.$disconnect();
}
