import { listSources } from "../../server/sources";
import { parseCli, reportError } from "../args";
import type { CliCommand } from "../types";

const USAGE = "meltledger sources list --json";

/** `meltledger sources list`: every source as a JSON array. */
export const sources: CliCommand = async (argv, io) => {
  const [sub, ...rest] = argv;
  if (sub !== "list") {
    io.stderr(`Unknown or missing subcommand.\n\nUsage: ${USAGE}\n`);
    return 2;
  }
  const parsed = parseCli(rest, { json: { type: "boolean" } }, io, USAGE);
  if (!parsed.ok) return 2;
  const json = parsed.values.json === true;
  const r = await listSources();
  if (!r.ok) return reportError(io, r.error, json);
  const rows = r.data.map((s) => ({
    id: s.id, kind: s.kind, title: s.title, authors: s.authors, year: s.year, venue: s.venue, doi: s.doi, url: s.url,
    density_method: s.densityMethod, outcome_evidence: s.outcomeEvidence, machine_stated: s.machineStated,
    spot_size_definition: s.spotSizeDefinition, powder_reported: s.powderReported, atmosphere_reported: s.atmosphereReported,
    record_count: s.recordCount, version: s.version,
  }));
  if (json) io.stdout(`${JSON.stringify(rows)}\n`);
  else for (const s of rows) io.stdout(`#${s.id}\t${s.year ?? "----"}\t${s.doi ?? "(no DOI)"}\t${s.record_count} records\t${s.title}\n`);
  return 0;
};
