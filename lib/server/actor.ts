import { ensureUser } from "../db/users";
import { ROLE_NAMES } from "../schemas/user";
import { serverMode } from "./mode";
import { AppFailure } from "./result";

export const ROLES = ROLE_NAMES;
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
 * For local mode, the CLI and tests. Inside a server in team mode it refuses (throws), so a route
 * that still calls it fails closed instead of acting as an admin: routes get their actor from the
 * request (lib/server/auth.ts `authenticate`, through app/_lib/actor.ts).
 */
export async function localActor(): Promise<Actor> {
  const mode = serverMode();
  if (mode.mode === "team" && mode.server !== "none") {
    throw new AppFailure({ code: "unauthenticated", message: "This server runs in team mode: log in (the local user exists only in local mode)." });
  }
  const user = await ensureUser("local", "admin");
  return { id: user.id, name: user.name, role: user.role as Role };
}

/** The actor for CLI commands: MELTLEDGER_USER names an existing or new account, else "local". */
export async function cliActor(): Promise<Actor> {
  const name = process.env.MELTLEDGER_USER?.trim();
  if (!name) {
    const user = await ensureUser("local", "admin");
    return { id: user.id, name: user.name, role: user.role as Role };
  }
  const user = await ensureUser(name, "contributor");
  return { id: user.id, name: user.name, role: user.role as Role };
}
