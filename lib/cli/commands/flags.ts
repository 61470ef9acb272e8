import { cliActor } from "../../server/actor";
import { listFlags } from "../../server/flags";
import { resolveFlag } from "../../server/review";
import { parseCli, reportError } from "../args";
import type { CliCommand } from "../types";

const USAGE_LIST = "meltledger flags list --json [--record ID] [--state open|resolved|waived] [--code PREFIX] [--severity error|warning|info] [--source ID]";
const USAGE_RESOLVE = "meltledger flags resolve ID --action waive|fix|reject --reason TEXT [--value V --unit U --field F] [--json]";
const USAGE = `${USAGE_LIST}\n       ${USAGE_RESOLVE}`;

async function list(argv: string[], io: Parameters<CliCommand>[1]): Promise<number> {
  const parsed = parseCli(
    argv,
    { json: { type: "boolean" }, record: { type: "string" }, state: { type: "string" }, code: { type: "string" }, severity: { type: "string" }, source: { type: "string" } },
    io,
    USAGE_LIST,
  );
  if (!parsed.ok) return 2;
  const v = parsed.values as Record<string, string | boolean | undefined>;
  const json = v.json === true;
  const r = await listFlags({ recordId: v.record, state: v.state, codePrefix: v.code, severity: v.severity, sourceId: v.source });
  if (!r.ok) return reportError(io, r.error, json);
  if (json) io.stdout(`${JSON.stringify(r.data)}\n`);
  else {
    io.stdout(`${r.data.length} flag(s)\n`);
    for (const f of r.data) io.stdout(`#${f.id}\trecord ${f.record_id ?? "-"}\t${f.severity}\t${f.state}\t${f.code}\t${f.message}\n`);
  }
  return 0;
}

async function resolve(argv: string[], io: Parameters<CliCommand>[1]): Promise<number> {
  const parsed = parseCli(
    argv,
    { action: { type: "string" }, reason: { type: "string" }, value: { type: "string" }, unit: { type: "string" }, field: { type: "string" }, version: { type: "string" }, json: { type: "boolean" } },
    io,
    USAGE_RESOLVE,
  );
  if (!parsed.ok) return 2;
  const v = parsed.values as Record<string, string | boolean | undefined>;
  const json = v.json === true;
  const [id, extra] = parsed.positionals;
  if (!id || extra !== undefined || !/^\d+$/.test(id)) {
    io.stderr(`Give one flag id.\n\nUsage: ${USAGE_RESOLVE}\n`);
    return 2;
  }
  if (v.action !== "waive" && v.action !== "fix" && v.action !== "reject") {
    io.stderr(`--action is waive, fix or reject${v.action ? `, not "${String(v.action)}"` : ""}.\n\nUsage: ${USAGE_RESOLVE}\n`);
    return 2;
  }
  let fix: { field: unknown; value: unknown; unit: unknown } | null = null;
  if (v.value !== undefined || v.unit !== undefined || v.field !== undefined) {
    if (v.action !== "fix") {
      io.stderr(`--value, --unit and --field go with --action fix.\n`);
      return 2;
    }
    fix = { field: v.field, value: v.value, unit: v.unit ?? "" };
  }
  const r = await resolveFlag({ flagId: id, version: v.version, action: v.action, reason: v.reason, fix }, await cliActor());
  if (!r.ok) return reportError(io, r.error, json);
  const d = r.data;
  if (json) io.stdout(`${JSON.stringify({ id: d.flagId, action: d.action, state: d.state, resolution: d.resolution, resolved: d.resolved, record_id: d.recordId, record_status: d.recordStatus, record_version: d.recordVersion })}\n`);
  else {
    io.stdout(`Flag ${d.flagId}: ${d.state}${d.resolution ? ` (${d.resolution})` : ""}; record ${d.recordId} is ${d.recordStatus}.\n`);
    if (!d.resolved) io.stdout(`The value was saved, but the finding is still there: the flag stays open.\n`);
  }
  return 0;
}

/** `meltledger flags list|resolve`: scripted triage of the review queue. */
export const flags: CliCommand = async (argv, io) => {
  const [sub, ...rest] = argv;
  if (sub === "list") return list(rest, io);
  if (sub === "resolve") return resolve(rest, io);
  io.stderr(`Unknown or missing subcommand.\n\nUsage: ${USAGE}\n`);
  return 2;
};
