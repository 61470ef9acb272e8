import { cliActor } from "../../server/actor";
import { addUser, changeUser, findAccountByName, listAccounts } from "../../server/users";
import { parseCli, reportError } from "../args";
import type { CliCommand, CliIo } from "../types";

const USAGE = `meltledger users add NAME --role contributor|reviewer|admin [--password-stdin] [--json]
       meltledger users list --json
       meltledger users set NAME [--role R] [--disable | --enable] [--password-stdin] [--reason TEXT] [--json]`;

/** The password from standard input: its first line, without the line ending. */
async function passwordFrom(io: CliIo): Promise<string | null> {
  if (!io.stdin) return null;
  const text = await io.stdin();
  return text.split(/\r?\n/)[0] ?? "";
}

/** `meltledger users add|list|set`: accounts for team mode (run by whoever holds the server's files). */
export const users: CliCommand = async (argv, io) => {
  const [sub, ...rest] = argv;
  const parsed = parseCli(
    rest,
    { role: { type: "string" }, "password-stdin": { type: "boolean" }, json: { type: "boolean" }, disable: { type: "boolean" }, enable: { type: "boolean" }, reason: { type: "string" } },
    io,
    USAGE,
  );
  if (!parsed.ok) return 2;
  const v = parsed.values;
  const json = v.json === true;
  const actor = await cliActor();
  if (sub === "list") {
    const r = await listAccounts(actor);
    if (!r.ok) return reportError(io, r.error, json);
    const rows = r.data.map((u) => ({ id: u.id, name: u.name, role: u.role, disabled: u.disabled, can_log_in: u.canLogIn, active_sessions: u.activeSessions, created_at: u.createdAt }));
    if (json) io.stdout(`${JSON.stringify(rows)}\n`);
    else for (const u of rows) io.stdout(`#${u.id}\t${u.name}\t${u.role}${u.disabled ? "\tdisabled" : ""}${u.can_log_in ? "" : "\t(cannot log in)"}\n`);
    return 0;
  }
  const name = parsed.positionals[0];
  if ((sub === "add" || sub === "set") && (!name || parsed.positionals.length > 1)) {
    io.stderr(`Give exactly one user name (quote a name with spaces).\n\nUsage: ${USAGE}\n`);
    return 2;
  }
  const password = v["password-stdin"] === true ? await passwordFrom(io) : undefined;
  if (password === null) {
    io.stderr("--password-stdin needs a password on standard input.\n");
    return 2;
  }
  if (sub === "add") {
    if (typeof v.role !== "string") {
      io.stderr(`Give the role with --role contributor, reviewer or admin.\n\nUsage: ${USAGE}\n`);
      return 2;
    }
    const r = await addUser({ name, role: v.role, ...(password !== undefined ? { password } : {}) }, actor);
    if (!r.ok) return reportError(io, r.error, json);
    if (json) io.stdout(`${JSON.stringify(r.data)}\n`);
    else io.stdout(`Added ${r.data.name} (${r.data.role}, id ${r.data.id}).${password === undefined ? " It has no password yet: set one with `meltledger users set NAME --password-stdin` before it can log in." : ""}\n`);
    return 0;
  }
  if (sub === "set") {
    if (v.disable === true && v.enable === true) {
      io.stderr("Give --disable or --enable, not both.\n");
      return 2;
    }
    const found = await findAccountByName(name!, actor);
    if (!found.ok) return reportError(io, found.error, json);
    const change = {
      id: found.data.id,
      ...(typeof v.role === "string" ? { role: v.role } : {}),
      ...(v.disable === true ? { disabled: true } : v.enable === true ? { disabled: false } : {}),
      ...(password !== undefined ? { password } : {}),
      ...(typeof v.reason === "string" ? { reason: v.reason } : {}),
    };
    const r = await changeUser(change, actor);
    if (!r.ok) return reportError(io, r.error, json);
    if (json) io.stdout(`${JSON.stringify(r.data)}\n`);
    else io.stdout(`${r.data.name}: ${r.data.role}${r.data.disabled ? ", disabled" : ""}${password !== undefined ? ", password set" : ""}.\n`);
    return 0;
  }
  io.stderr(`Unknown or missing subcommand.\n\nUsage: ${USAGE}\n`);
  return 2;
};
