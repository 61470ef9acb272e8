/**
 * Account management (admins only): add an account, change its role, disable or enable it, set its
 * password. Every change is one transaction with its audit event naming the admin who made it.
 */
import { countLoginUsersWithRole, createUserAccount, getUserById, listUserAccounts, updateUserAccount, type UserAccountRow } from "../db/users";
import { newUserSchema, userChangeSchema } from "../schemas/user";
import { requireRole, type Actor, type Role } from "./actor";
import { hashPassword } from "./auth";
import { fail, guard, invalid, nulRefusal, ok, type Result } from "./result";

export interface UserView {
  id: number;
  name: string;
  role: Role | string;
  disabled: boolean;
  /** False for an account that cannot log in yet (no password set). */
  canLogIn: boolean;
  activeSessions: number;
  createdAt: string;
}

const view = (u: UserAccountRow): UserView => ({ id: u.id, name: u.name, role: u.role, disabled: u.disabled, canLogIn: u.hasPassword && !u.disabled, activeSessions: u.activeSessions, createdAt: u.createdAt.toISOString() });

/** Every account, for the admin page and `users list --json`. */
export async function listAccounts(actor: Actor): Promise<Result<UserView[]>> {
  return guard(async () => {
    requireRole(actor, "admin");
    return ok((await listUserAccounts(new Date())).map(view));
  });
}

/** Adds an account ({ name, role, password? }); a taken name is a conflict. */
export async function addUser(input: unknown, actor: Actor): Promise<Result<{ id: number; name: string; role: Role }>> {
  return guard(async () => {
    requireRole(actor, "admin");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = newUserSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "The account needs attention; nothing was saved.");
    const { name, role, password } = parsed.data;
    const passwordHash = password ? await hashPassword(password) : null;
    const user = await createUserAccount({ name, role, passwordHash }, actor);
    if (!user) return fail("conflict", `There is already an account named ${name}.`, { fieldErrors: { name: ["This name is taken."] } });
    return ok({ id: user.id, name: user.name, role });
  });
}

/**
 * Changes one account ({ id, role?, disabled?, password?, reason? }). The last enabled admin who
 * can log in cannot be demoted or disabled, so a team server always has someone who can manage it.
 */
export async function changeUser(input: unknown, actor: Actor): Promise<Result<{ id: number; name: string; role: string; disabled: boolean }>> {
  return guard(async () => {
    requireRole(actor, "admin");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = userChangeSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "The change needs attention; nothing was saved.");
    const { id, role, disabled, password, reason } = parsed.data;
    const current = await getUserById(id);
    if (!current) return fail("not_found", `There is no user ${id}.`);
    const losesAdmin = current.role === "admin" && !current.disabled && ((role !== undefined && role !== "admin") || disabled === true);
    if (losesAdmin && current.hasPassword && (await countLoginUsersWithRole("admin")) <= 1) {
      return fail("conflict", `${current.name} is the last enabled admin; make another admin first.`);
    }
    const change: { role?: string; disabled?: boolean; passwordHash?: string } = {};
    if (role !== undefined) change.role = role;
    if (disabled !== undefined) change.disabled = disabled;
    if (password !== undefined) change.passwordHash = await hashPassword(password);
    const updated = await updateUserAccount(id, change, actor, reason ?? null);
    if (!updated) return fail("not_found", `There is no user ${id}.`);
    return ok(updated);
  });
}

/** Finds an account id by name (for the CLI). */
export async function findAccountByName(name: string, actor: Actor): Promise<Result<UserView>> {
  const all = await listAccounts(actor);
  if (!all.ok) return all;
  const u = all.data.find((x) => x.name === name);
  return u ? ok(u) : fail("not_found", `There is no account named ${name}.`);
}
