import { ensureUser } from "../db/users";
import { AppFailure } from "./result";

export const ROLES = ["contributor", "reviewer", "admin"] as const;
export type Role = (typeof ROLES)[number];

export interface Actor {
  id: number;
  name: string;
  role: Role;
}

const RANK: Record<Role, number> = { contributor: 1, reviewer: 2, admin: 3 };

/** True when `actor` holds `role` or a higher one. */
export function hasRole(actor: Actor, role: Role): boolean {
  return RANK[actor.role] >= RANK[role];
}

/** Throws a forbidden failure (caught by `guard`) unless the actor holds the role. */
export function requireRole(actor: Actor, role: Role): void {
  if (!hasRole(actor, role)) {
    throw new AppFailure({ code: "forbidden", message: `This needs the ${role} role; you are signed in as ${actor.role}.` });
  }
}

/**
 * The single local user of a workbench that listens only on loopback: an admin named "local".
 * Accounts and sessions for shared servers build on this.
 */
export async function localActor(): Promise<Actor> {
  const user = await ensureUser("local", "admin");
  return { id: user.id, name: user.name, role: user.role as Role };
}

/** The actor for CLI commands: MELTLEDGER_USER names an existing or new account, else "local". */
export async function cliActor(): Promise<Actor> {
  const name = process.env.MELTLEDGER_USER?.trim();
  if (!name) return localActor();
  const user = await ensureUser(name, "contributor");
  return { id: user.id, name: user.name, role: user.role as Role };
}
