import { completeCheckSettings, CHECK_SETTING_DEFS, defaultCheckSettings, type CheckSettings } from "../domain/check-settings";
import type { SettingDef } from "../domain/setting-def";
import { RULE_CATALOGUE, type RuleInfo } from "../domain/checks/index";
import { appendAuditEvent } from "../db/audit";
import { sql, type SqlDatabase, type SqlExecutor } from "../db/sql";
import { getSettingsVersion, insertSettingsVersion, latestSettingsVersion, listSettingsVersions, type SettingsVersionRow } from "../db/settings";
import { checkSettingsInputSchema } from "../schemas/check-settings";
import { requireRole, type Actor } from "./actor";
import { fail, guard, invalid, nulRefusal, ok, type Result } from "./result";

/** The settings key under which check thresholds and quality weights are versioned. */
export const CHECK_SETTINGS_KEY = "checks";

export interface SettingsVersionInfo {
  version: number;
  values: CheckSettings;
  createdAt: string;
  createdByName: string | null;
}

export const isoNow = (now: Date = new Date()) => now.toISOString().replace("Z", "+00:00");

function infoOf(row: SettingsVersionRow): SettingsVersionInfo {
  return { version: row.id, values: completeCheckSettings((row.value ?? {}) as Record<string, unknown>), createdAt: row.createdAt, createdByName: row.createdByName };
}

/**
 * The newest settings version; the defaults are stored as the first version when none exists, so
 * every flag can name the version it was raised under. `db` is the database or an open
 * transaction (the defaults are then written in it).
 */
export async function currentCheckSettings(db: SqlExecutor = sql()): Promise<SettingsVersionInfo> {
  const row = await latestSettingsVersion(db, CHECK_SETTINGS_KEY);
  if (row) return infoOf(row);
  const store = async (tx: SqlExecutor) => {
    if (!(await latestSettingsVersion(tx, CHECK_SETTINGS_KEY))) await insertSettingsVersion(tx, CHECK_SETTINGS_KEY, defaultCheckSettings(), null, isoNow());
    return (await latestSettingsVersion(tx, CHECK_SETTINGS_KEY))!;
  };
  return infoOf("transaction" in db ? await (db as SqlDatabase).transaction(store) : await store(db));
}

/** A stored version by id, or null when there is none of that id. */
export async function checkSettingsVersion(id: number, db: SqlExecutor = sql()): Promise<SettingsVersionInfo | null> {
  const row = await getSettingsVersion(db, CHECK_SETTINGS_KEY, id);
  return row ? infoOf(row) : null;
}

export interface CheckSettingsPage {
  current: SettingsVersionInfo;
  /** Every rule of the catalogue, in page order. */
  rules: readonly RuleInfo[];
  defs: readonly SettingDef[];
  versions: { version: number; createdAt: string; createdByName: string | null; changed: string[] }[];
}

/** The current settings with their definitions and the version history (what changed in each). */
export async function getCheckSettings(): Promise<Result<CheckSettingsPage>> {
  return guard(async () => {
    const db = sql();
    const current = await currentCheckSettings(db);
    const rows = await listSettingsVersions(db, CHECK_SETTINGS_KEY, 50);
    const versions = rows.map((r, i) => {
      const values = completeCheckSettings((r.value ?? {}) as Record<string, unknown>);
      const previous = rows[i + 1] ? completeCheckSettings((rows[i + 1]!.value ?? {}) as Record<string, unknown>) : defaultCheckSettings();
      const changed = CHECK_SETTING_DEFS.filter((d) => values[d.key] !== previous[d.key]).map((d) => `${d.key}: ${previous[d.key]} → ${values[d.key]}`);
      return { version: r.id, createdAt: r.createdAt, createdByName: r.createdByName, changed };
    });
    return ok({ current, rules: RULE_CATALOGUE, defs: CHECK_SETTING_DEFS, versions });
  });
}

/**
 * Saves a new settings version (admins only: admins manage settings). The editor names the version they started from;
 * if another version was saved meanwhile, nothing is saved and a conflict says which.
 */
export async function saveCheckSettings(input: unknown, actor: Actor): Promise<Result<{ version: number }>> {
  return guard(async () => {
    requireRole(actor, "admin");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = checkSettingsInputSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "Some settings need attention; nothing was saved.");
    return sql().transaction(async (tx): Promise<Result<{ version: number }>> => {
      const current = await currentCheckSettings(tx);
      if (parsed.data.basedOnVersion !== null && parsed.data.basedOnVersion !== current.version) {
        return fail("conflict", `Settings version ${current.version} was saved after you opened version ${parsed.data.basedOnVersion}; nothing was saved. Reload to see it, then apply your changes again.`, { currentVersion: current.version });
      }
      const values = { ...current.values, ...parsed.data.values };
      const changed = CHECK_SETTING_DEFS.filter((d) => values[d.key] !== current.values[d.key]).map((d) => d.key);
      if (!changed.length) return fail("invalid_input", "No setting differs from the current version; nothing was saved.");
      const at = isoNow();
      const version = await insertSettingsVersion(tx, CHECK_SETTINGS_KEY, values, actor.id, at);
      await appendAuditEvent(tx, {
        actorId: actor.id, actorName: actor.name, action: "update", entityType: "settings", entityId: `${CHECK_SETTINGS_KEY}:${version}`,
        before: Object.fromEntries(changed.map((k) => [k, current.values[k]])), after: Object.fromEntries(changed.map((k) => [k, values[k]])), reason: parsed.data.reason, at,
      });
      return ok({ version });
    });
  });
}
