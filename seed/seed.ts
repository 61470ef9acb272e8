// Writes the demo scenario through the server layer, so the demo data passes the same
// validation, normalization and audit as anything a user enters.
import { ensureUser } from "../lib/db/users";
import type { Actor, Role } from "../lib/server/actor";
import { isDatabaseEmpty, migrateDatabase, setDatabaseAside } from "../lib/server/maintenance";
import { insertRecordsBulk } from "../lib/server/records-bulk";
import { fail, guard, ok, type Result } from "../lib/server/result";
import { createSource } from "../lib/server/sources";
import type { RecordInput } from "../lib/schemas/record";
import { generateScenario, type ScenarioRecord } from "./scenario";

/** The seed of the shipped demo scenario: the same data on every machine. */
export const DEMO_SEED = 20_261_201;
/** Day zero of the scenario's invented history. */
export const DEMO_START = new Date("2026-03-02T08:00:00Z");

export interface SeedSummary {
  skipped: boolean;
  sources: number;
  records: number;
  previousDatabase: string | null;
}

/** Maps a generated record to the record form's input shape. */
export function scenarioRecordInput(r: ScenarioRecord, sourceId: number): RecordInput {
  return {
    sourceId,
    locationPage: r.locationPage,
    locationLabel: r.locationLabel,
    alloy: r.alloy,
    machine: r.machine,
    laserPower: r.laserPower,
    scanSpeed: r.scanSpeed,
    hatchSpacing: r.hatchSpacing,
    layerThickness: r.layerThickness,
    spotDiameter: r.spotDiameter,
    spotDefinition: r.spotDefinition,
    preheat: r.preheat,
    atmosphere: r.atmosphere,
    scanStrategy: r.scanStrategy,
    powderD10: r.powderD10,
    powderD50: r.powderD50,
    powderD90: r.powderD90,
    outcome: r.outcome,
    outcomeText: r.outcomeText,
    relativeDensity: r.relativeDensity,
    provenance: r.provenance,
    status: "needs_review",
  };
}

export async function writeDemoScenario(
  options: { seed?: number; recordCount?: number; onProgress?: (message: string) => void } = {},
): Promise<Result<{ sources: number; records: number }>> {
  return guard(async () => {
    const scenario = generateScenario(options.seed ?? DEMO_SEED, options.recordCount ? { recordCount: options.recordCount } : undefined);
    const users = new Map<string, Actor>();
    for (const u of scenario.users) {
      const row = await ensureUser(u.name, u.role);
      users.set(u.name, { id: row.id, name: row.name, role: row.role as Role });
    }
    const admin = [...users.values()].find((u) => u.role === "admin") ?? [...users.values()][0];
    if (!admin) return fail("internal", "The demo scenario has no users.");
    options.onProgress?.(`Seeding ${scenario.sources.length} sources…`);
    const sourceIds = new Map<string, number>();
    for (const s of scenario.sources) {
      const { key, ...input } = s;
      const r = await createSource(input, admin);
      if (!r.ok) return fail("internal", `Demo source ${key} was refused: ${r.error.message}`, r.error.details);
      sourceIds.set(key, r.data.id);
    }
    options.onProgress?.(`Seeding ${scenario.records.length} records…`);
    const inputs = scenario.records.map((r) => scenarioRecordInput(r, sourceIds.get(r.sourceKey)!));
    const r = await insertRecordsBulk(inputs, admin, {
      auditAction: "seed",
      rowMeta: (i) => {
        const rec = scenario.records[i]!;
        const actor = users.get(rec.createdBy) ?? admin;
        return { actorId: actor.id, at: new Date(DEMO_START.getTime() + rec.dayOffset * 86_400_000) };
      },
    });
    if (!r.ok) return fail("internal", `The demo records were refused: ${r.error.message}`, r.error.details);
    return ok({ sources: sourceIds.size, records: r.data.ids.length });
  });
}

/**
 * Seeds the demo scenario into the database DATABASE_URL names (a SQLite file or a PostgreSQL
 * database), migrating it first. With `reset`, the current SQLite file is moved aside (kept, never
 * deleted) and a new one is migrated and seeded; on PostgreSQL a reset is refused (nothing is
 * deleted there either: seed a new, empty database instead). With `ifEmpty`, a database that
 * already holds sources or records is left alone.
 */
export async function seedDatabase(
  options: { reset?: boolean; ifEmpty?: boolean; onProgress?: (message: string) => void } = {},
): Promise<Result<SeedSummary>> {
  return guard<SeedSummary>(async () => {
    const previousDatabase = options.reset ? await setDatabaseAside() : null;
    const migrated = await migrateDatabase();
    if (!migrated.ok) return migrated;
    if (!(await isDatabaseEmpty())) {
      if (options.ifEmpty) return ok({ skipped: true, sources: 0, records: 0, previousDatabase });
      return fail("conflict", "The database already holds data. Use --reset to set it aside and seed a fresh demo, or --if-empty to skip.");
    }
    const written = await writeDemoScenario({ onProgress: options.onProgress });
    if (!written.ok) return written;
    return ok({ skipped: false, ...written.data, previousDatabase });
  });
}
