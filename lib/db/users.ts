import { prismaReady } from "./client";

export interface UserRow {
  id: number;
  name: string;
  role: string;
}

/** Finds a user by name or creates it with the given role. */
export async function ensureUser(name: string, role: string): Promise<UserRow> {
  const db = await prismaReady();
  const found = await db.user.findUnique({ where: { name }, select: { id: true, name: true, role: true } });
  if (found) return found;
  return db.user.upsert({ where: { name }, create: { name, role }, update: {}, select: { id: true, name: true, role: true } });
}

export async function listUsers(): Promise<UserRow[]> {
  const db = await prismaReady();
  return db.user.findMany({ select: { id: true, name: true, role: true }, orderBy: { name: "asc" } });
}
