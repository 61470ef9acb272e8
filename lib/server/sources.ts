import { z } from "zod";
import { normalizeDoi, titleKey } from "../domain/doi";
import { prismaReady } from "../db/client";
import { appendAudit, listAuditFor, type AuditEventRow } from "../db/audit";
import { findSourceByDoi, findSourcesByTitleKey, getSource, getSourceTx, insertSource, listSources as listSourceRows, updateSourceIfVersion, type SourceData, type SourceListRow, type SourceRow } from "../db/sources";
import { sourceInputSchema, sourceUpdateSchema, type SourceValues } from "../schemas/source";
import { requireRole, type Actor } from "./actor";
import { AppFailure, fail, guard, invalid, nulRefusal, ok, type Result } from "./result";
import { isRowId } from "../schemas/ids";

function toData(v: SourceValues): { ok: true; data: SourceData } | { ok: false; field: string; message: string } {
  let doi: string | null = null;
  if (v.doi) {
    doi = normalizeDoi(v.doi);
    if (!doi) return { ok: false, field: "doi", message: "That is not a DOI: it should look like 10.5555/abc123 (a resolver address in front is fine)." };
  }
  return {
    ok: true,
    data: {
      kind: v.kind, title: v.title, titleKey: titleKey(v.title), authors: v.authors, year: v.year, venue: v.venue, doi, url: v.url,
      notes: v.notes, densityMethod: v.densityMethod, outcomeEvidence: v.outcomeEvidence, machineStated: v.machineStated,
      spotSizeDefinition: v.spotSizeDefinition, powderReported: v.powderReported, atmosphereReported: v.atmosphereReported,
    },
  };
}

const createOptions = z.object({ allowSameTitle: z.boolean().default(false) }).default({ allowSameTitle: false });

/**
 * Creates a source. The same DOI is refused with the existing source offered instead; the same
 * normalized title and year is refused unless the caller confirms it is a different work.
 */
export async function createSource(input: unknown, actor: Actor, options?: { allowSameTitle?: boolean }): Promise<Result<{ id: number; version: number }>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = sourceInputSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error);
    const opts = createOptions.parse(options);
    const data = toData(parsed.data);
    if (!data.ok) return fail("invalid_input", "Some fields need attention.", { fieldErrors: { [data.field]: [data.message] } });
    if (data.data.doi) {
      const existing = await findSourceByDoi(data.data.doi);
      if (existing) {
        return fail("conflict", `A source with DOI ${data.data.doi} already exists (source ${existing.id}, "${existing.title}"). Use it instead of a copy.`, { existingSourceId: existing.id, fieldErrors: { doi: ["This DOI is already in the collection."] } });
      }
    }
    if (!opts.allowSameTitle) {
      const same = await findSourcesByTitleKey(data.data.titleKey, data.data.year);
      if (same.length) {
        const s = same[0]!;
        return fail("conflict", `A source with the same title and year already exists (source ${s.id}). Use it, or confirm that this is a different work.`, { existingSourceId: s.id, fieldErrors: { title: ["Same title and year as an existing source."] } });
      }
    }
    const db = await prismaReady();
    const created = await db.$transaction(async (tx) => {
      const s = await insertSource(tx, data.data, actor.id);
      await appendAudit(tx, { actorId: actor.id, actorName: actor.name, action: "create", entityType: "source", entityId: s.id, after: s });
      return s;
    });
    return ok({ id: created.id, version: created.version });
  });
}

export async function updateSource(input: unknown, actor: Actor): Promise<Result<{ id: number; version: number }>> {
  return guard(async () => {
    requireRole(actor, "contributor");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = sourceUpdateSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error);
    const { id, version, ...values } = parsed.data;
    const data = toData(values);
    if (!data.ok) return fail("invalid_input", "Some fields need attention.", { fieldErrors: { [data.field]: [data.message] } });
    if (data.data.doi) {
      const existing = await findSourceByDoi(data.data.doi);
      if (existing && existing.id !== id) {
        return fail("conflict", `DOI ${data.data.doi} belongs to source ${existing.id} already.`, { existingSourceId: existing.id, fieldErrors: { doi: ["This DOI is already in the collection."] } });
      }
    }
    const db = await prismaReady();
    const saved = await db.$transaction(async (tx) => {
      const before = await getSourceTx(tx, id);
      if (!before) throw new AppFailure({ code: "not_found", message: `Source ${id} does not exist.` });
      const after = await updateSourceIfVersion(tx, id, version, data.data, actor.id);
      if (!after) {
        throw new AppFailure({ code: "conflict", message: `Someone saved this source after you opened it (now version ${before.version}). Your changes were not saved; reload and apply them again.`, details: { currentVersion: before.version } });
      }
      await appendAudit(tx, { actorId: actor.id, actorName: actor.name, action: "update", entityType: "source", entityId: id, before, after });
      return after;
    });
    return ok({ id: saved.id, version: saved.version });
  });
}

export async function listSources(): Promise<Result<SourceListRow[]>> {
  return guard(async () => ok(await listSourceRows()));
}

export interface SourcePage {
  source: SourceRow;
  history: AuditEventRow[];
}

export async function getSourcePage(id: number): Promise<Result<SourcePage>> {
  return guard(async () => {
    if (!isRowId(id)) return fail("not_found", "No such source.");
    const source = await getSource(id);
    if (!source) return fail("not_found", `Source ${id} does not exist.`);
    return ok({ source, history: await listAuditFor("source", id) });
  });
}
