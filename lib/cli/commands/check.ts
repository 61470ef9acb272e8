import { cliActor } from "../../server/actor";
import { runChecks } from "../../server/checks";
import { parseCli, reportError } from "../args";
import type { CliCommand } from "../types";

const USAGE = "meltledger check [--all | --record ID[,ID...]] [--settings-version N] [--json]";

/** `meltledger check`: runs the checks in batch and keeps the flags in step. */
export const check: CliCommand = async (argv, io) => {
  const parsed = parseCli(argv, { all: { type: "boolean" }, record: { type: "string" }, "settings-version": { type: "string" }, json: { type: "boolean" } }, io, USAGE);
  if (!parsed.ok) return 2;
  const v = parsed.values;
  const json = v.json === true;
  const recordText = typeof v.record === "string" ? v.record : undefined;
  const recordIds = recordText ? recordText.split(",").map((x) => x.trim()) : [];
  if (parsed.positionals.length) {
    io.stderr(`Unexpected argument "${parsed.positionals[0]}".\n\nUsage: ${USAGE}\n`);
    return 2;
  }
  if (recordIds.some((x) => !/^\d+$/.test(x) || Number(x) < 1)) {
    io.stderr(`--record takes record ids separated by commas, e.g. --record 12,15.\n`);
    return 2;
  }
  // Without --record, every record is checked: `check` and `check --all` do the same.
  const all = v.all === true || recordIds.length === 0;
  const r = await runChecks({ all, recordIds: all ? [] : recordIds, settingsVersion: v["settings-version"] }, await cliActor());
  if (!r.ok) return reportError(io, r.error, json);
  const s = r.data;
  if (json) {
    io.stdout(`${JSON.stringify({ settings_version: s.settingsVersion, records: s.records, opened: s.opened, reopened: s.reopened, refreshed: s.refreshed, stale: s.stale, open_by_code: s.openByCode, quality_updated: s.qualityUpdated, back_to_review: s.backToReview, ms: s.ms })}\n`);
  } else {
    io.stdout(`Checked ${s.records} record(s) under settings version ${s.settingsVersion} in ${(s.ms / 1000).toFixed(1)} s: ${s.opened} new flag(s), ${s.reopened} reopened, ${s.refreshed} refreshed, ${s.stale} resolved as stale.\n`);
    const codes = Object.entries(s.openByCode).sort((a, b) => b[1] - a[1]);
    for (const [code, n] of codes) io.stdout(`  ${String(n).padStart(6)}  ${code}\n`);
    if (s.backToReview.length) io.stdout(`${s.backToReview.length} accepted record(s) went back to review (an error flag opened).\n`);
  }
  return 0;
};
