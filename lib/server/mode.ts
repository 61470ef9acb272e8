/**
 * Local or team mode, decided once per process from MELTLEDGER_MODE and the address the server
 * binds. No imports: the actor, the auth check and the proxy all read it.
 */

export type ServerMode = "local" | "team";

export interface ModeDecision {
  mode: ServerMode;
  /** The address the server binds, when known (from `next start -H HOST` or MELTLEDGER_BIND_HOST). */
  bindHost: string | null;
  /** One sentence saying why, for logs and the login page. */
  reason: string;
  /** What kind of process decided: a production server, a development server, or none (CLI, tests). */
  server: "production" | "development" | "none";
}

const LOOPBACK_NAMES = new Set(["localhost", "localhost.", "::1", "0:0:0:0:0:0:0:1"]);

/**
 * True for a loopback host name or address: localhost, 127.0.0.0/8, ::1 (with or without brackets
 * and port), ::ffff:127.x.
 * @example isLoopbackHost("127.0.0.1:3000") // true
 * @example isLoopbackHost("0.0.0.0") // false
 */
export function isLoopbackHost(host: string | null | undefined): boolean {
  if (!host) return false;
  let h = host.trim().toLowerCase();
  if (h.startsWith("[")) h = h.slice(1, h.indexOf("]") === -1 ? undefined : h.indexOf("]"));
  else if (/^[^:]+:\d+$/.test(h)) h = h.slice(0, h.lastIndexOf(":"));
  if (h.startsWith("::ffff:")) h = h.slice("::ffff:".length);
  if (LOOPBACK_NAMES.has(h)) return true;
  const v4 = /^127\.(\d{1,3})\.(\d{1,3})\.(\d{1,3})$/.exec(h);
  return v4 !== null && v4.slice(1).every((o) => Number(o) <= 255);
}

/** The value of `-H HOST`, `--hostname HOST` or `--hostname=HOST` in a command line, else null. */
export function bindHostFromArgv(argv: readonly string[]): string | null {
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if ((a === "-H" || a === "--hostname") && argv[i + 1]) return argv[i + 1]!;
    if (a.startsWith("--hostname=")) return a.slice("--hostname=".length);
  }
  return null;
}

/**
 * Decides the mode from MELTLEDGER_MODE and the bind address.
 * - MELTLEDGER_MODE=team: login required.
 * - MELTLEDGER_MODE=local: no login, unless the server is known to bind a non-loopback address
 *   (then team, so a mistake fails closed).
 * - unset: local when the bind address is loopback; a production server with no -H binds every
 *   interface (Next's default 0.0.0.0), so team; a process that serves nothing (CLI, tests) or a
 *   development server without a known address is local.
 * Any other MELTLEDGER_MODE value is team.
 * @example decideServerMode({ bindHost: "127.0.0.1", server: "production" }).mode // "local"
 */
export function decideServerMode(input: { modeEnv?: string; bindHost: string | null; server: "production" | "development" | "none" }): ModeDecision {
  const { bindHost } = input;
  const wanted = input.modeEnv?.trim().toLowerCase();
  const at = bindHost ? ` (bound to ${bindHost})` : "";
  if (wanted === "team") return { mode: "team", bindHost, server: input.server, reason: `MELTLEDGER_MODE=team${at}: login required.` };
  if (wanted === "local") {
    if (bindHost && !isLoopbackHost(bindHost)) return { mode: "team", bindHost, server: input.server, reason: `MELTLEDGER_MODE=local refused: the server binds ${bindHost}, which is not loopback, so login is required.` };
    return { mode: "local", bindHost, server: input.server, reason: `MELTLEDGER_MODE=local${at}: one local user, no login, loopback requests only.` };
  }
  if (wanted) return { mode: "team", bindHost, server: input.server, reason: `MELTLEDGER_MODE=${input.modeEnv} is neither local nor team: login required.` };
  if (bindHost) {
    return isLoopbackHost(bindHost)
      ? { mode: "local", bindHost, server: input.server, reason: `The server binds ${bindHost} (loopback): one local user, no login.` }
      : { mode: "team", bindHost, server: input.server, reason: `The server binds ${bindHost}, which other machines can reach: login required.` };
  }
  if (input.server === "production") return { mode: "team", bindHost, server: input.server, reason: "The server binds every interface (no -H given): login required." };
  return { mode: "local", bindHost, server: input.server, reason: input.server === "development" ? "Development server: one local user, loopback requests only." : "Not a server process: local user." };
}

let cachedMode: { key: string; decision: ModeDecision } | null = null;

/** The mode of this process (re-read when MELTLEDGER_MODE or MELTLEDGER_BIND_HOST changes, e.g. in tests). */
export function serverMode(): ModeDecision {
  const modeEnv = process.env.MELTLEDGER_MODE;
  const bindHost = bindHostFromArgv(process.argv) ?? (process.env.MELTLEDGER_BIND_HOST?.trim() || null);
  // NEXT_RUNTIME is set inside Next's server bundles; __NEXT_DEV_SERVER in the `next dev` worker
  const inNext = Boolean(process.env.NEXT_RUNTIME) || process.argv.some((a) => /[\\/]next[\\/]dist[\\/]bin[\\/]next$|[\\/]\.bin[\\/]next$/.test(a));
  const server = !inNext ? "none" : process.env.__NEXT_DEV_SERVER === "1" || process.env.NODE_ENV === "development" ? "development" : "production";
  const key = `${modeEnv}|${bindHost}|${server}`;
  if (cachedMode?.key !== key) {
    cachedMode = { key, decision: decideServerMode({ modeEnv, bindHost, server }) };
    if (server !== "none") console.info(`[meltledger] ${cachedMode.decision.reason}`);
  }
  return cachedMode.decision;
}
