/**
 * Read model of a source's quality for the source page: the score in words, the override if any,
 * and what it means for the source's records.
 */
import { scoreSource, type SourceQuality } from "../domain/source-quality";
import { loadSourceAttributes, sourceQualityStats } from "../db/check-inputs";
import { sql } from "../db/sql";
import { currentCheckSettings } from "./check-settings";
import { fail, guard, ok, type Result } from "./result";
import { isRowId } from "../schemas/ids";

export interface SourceQualityView extends SourceQuality {
  sourceId: number;
  version: number;
  overrideReason: string | null;
  overriddenBy: string | null;
  records: number;
  meanRecordQuality: number | null;
  settingsVersion: number;
}

export async function getSourceQuality(sourceId: number): Promise<Result<SourceQualityView>> {
  return guard(async () => {
    if (!isRowId(sourceId)) return fail("not_found", "No such source.");
    const db = sql();
    const source = (await loadSourceAttributes(db, [sourceId])).get(sourceId);
    if (!source) return fail("not_found", `Source ${sourceId} does not exist.`);
    const settings = await currentCheckSettings(db);
    const quality = scoreSource(source, settings.values);
    const stats = await sourceQualityStats(db, sourceId);
    return ok({
      ...quality,
      sourceId,
      version: source.version,
      overrideReason: source.qualityOverrideReason,
      overriddenBy: stats.overriddenBy,
      records: stats.records,
      meanRecordQuality: stats.meanQuality,
      settingsVersion: settings.version,
    });
  });
}
