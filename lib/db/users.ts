import { prismaReady } from "./client";
import { appendAudit, type AuditInput } from "./audit";

export interface UserRow {
  id: number;
  name: string;
  role: string;
}

/** A user as the admin page and `users list` show it: never the password hash itself. */
export interface UserAccountRow extends UserRow {
  disabled: boolean;
  hasPassword: boolean;
  createdAt: Date;
  activeSessions: number;
}

/** What login needs to check a password. */
export interface UserCredentialRow extends UserRow {
  passwordHash: string | null;
  disabled: boolean;
}

type Who = { id: number | null; name: string };

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

/** Every account with whether it can log in and how many unexpired sessions it holds. */
export async function listUserAccounts(now: Date): Promise<UserAccountRow[]> {
  const db = await prismaReady();
  const rows = await db.user.findMany({
    select: { id: true, name: true, role: true, disabled: true, passwordHash: true, createdAt: true, _count: { select: { sessions: { where: { expiresAt: { gt: now } } } } } },
    orderBy: { name: "asc" },
  });
  return rows.map((u) => ({ id: u.id, name: u.name, role: u.role, disabled: u.disabled, hasPassword: u.passwordHash !== null, createdAt: u.createdAt, activeSessions: u._count.sessions }));
}

export async function getUserCredentials(name: string): Promise<UserCredentialRow | null> {
  const db = await prismaReady();
  return db.user.findUnique({ where: { name }, select: { id: true, name: true, role: true, passwordHash: true, disabled: true } });
}

export async function getUserById(id: number): Promise<(UserRow & { disabled: boolean; hasPassword: boolean }) | null> {
  const db = await prismaReady();
  const u = await db.user.findUnique({ where: { id }, select: { id: true, name: true, role: true, disabled: true, passwordHash: true } });
  return u ? { id: u.id, name: u.name, role: u.role, disabled: u.disabled, hasPassword: u.passwordHash !== null } : null;
}

/** Creates an account and its audit event in one transaction; null when the name is taken. */
export async function createUserAccount(input: { name: string; role: string; passwordHash: string | null }, by: Who): Promise<UserRow | null> {
  const db = await prismaReady();
  return db.$transaction(async (tx) => {
    if (await tx.user.findUnique({ where: { name: input.name }, select: { id: true } })) return null;
    const user = await tx.user.create({ data: input, select: { id: true, name: true, role: true } });
    await appendAudit(tx, audit(by, "create", user.id, undefined, { name: user.name, role: user.role, password: input.passwordHash ? "set" : "none" }));
    return user;
  });
}

/**
 * Changes role, disabled flag or password hash, with its audit event, in one transaction.
 * Disabling an account or changing its password ends its sessions. Returns null when there is no such user.
 */
export async function updateUserAccount(
  id: number,
  change: { role?: string; disabled?: boolean; passwordHash?: string },
  by: Who,
  reason?: string | null,
): Promise<(UserRow & { disabled: boolean }) | null> {
  const db = await prismaReady();
  return db.$transaction(async (tx) => {
    const before = await tx.user.findUnique({ where: { id }, select: { id: true, name: true, role: true, disabled: true } });
    if (!before) return null;
    const after = await tx.user.update({ where: { id }, data: change, select: { id: true, name: true, role: true, disabled: true } });
    if (change.disabled === true || change.passwordHash !== undefined) await tx.session.deleteMany({ where: { userId: id } });
    const describe = (u: { role: string; disabled: boolean }, password?: string) => ({ role: u.role, disabled: u.disabled, ...(password ? { password } : {}) });
    await appendAudit(tx, audit(by, change.passwordHash !== undefined ? "set_password" : "update", id, describe(before), describe(after, change.passwordHash !== undefined ? "changed" : undefined), reason));
    return after;
  });
}

/** How many enabled accounts with a password hold a role (to refuse removing the last admin who can log in). */
export async function countLoginUsersWithRole(role: string): Promise<number> {
  const db = await prismaReady();
  return db.user.count({ where: { role, disabled: false, passwordHash: { not: null } } });
}

function audit(by: Who, action: string, userId: number, before: unknown, after: unknown, reason?: string | null): AuditInput {
  return { actorId: by.id, actorName: by.name, action, entityType: "user", entityId: userId, before, after, reason: reason ?? null };
}
