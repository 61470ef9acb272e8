/**
 * Read model of a source's quality for the source page: the score in words, the override if any,
 * and what it means for the source's records.
 */
import { scoreSource, type SourceQuality } from "../domain/source-quality";
import { loadSourceAttributes } from "../db/check-inputs";
import { sqlite } from "../db/connection";
import { currentCheckSettingsSync } from "./check-settings";
import { fail, guard, ok, type Result } from "./result";

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
    if (!Number.isInteger(sourceId) || sourceId <= 0) return fail("not_found", "No such source.");
    const db = sqlite();
    const source = loadSourceAttributes(db, [sourceId]).get(sourceId);
    if (!source) return fail("not_found", `Source ${sourceId} does not exist.`);
    const settings = currentCheckSettingsSync(db);
    const quality = scoreSource(source, settings.values);
    const stats = db.prepare(`SELECT COUNT(*) AS n, AVG(qualityScore) AS mean FROM BuildRecord WHERE sourceId = ?`).get(sourceId) as { n: number; mean: number | null };
    const by = db.prepare(`SELECT u.name AS name FROM Source s LEFT JOIN User u ON u.id = s.qualityOverrideById WHERE s.id = ?`).get(sourceId) as { name: string | null } | undefined;
    return ok({
      ...quality,
      sourceId,
      version: source.version,
      overrideReason: source.qualityOverrideReason,
      overriddenBy: by?.name ?? null,
      records: stats.n,
      meanRecordQuality: stats.mean,
      settingsVersion: settings.version,
    });
  });
}
