// Checks on save, flags kept in step, and the review actions, against a temporary database.
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { sqlite } from "@/lib/db/connection";
import { migrate } from "@/lib/db/migrate";
import { localActor, type Actor } from "@/lib/server/actor";
import { runChecks } from "@/lib/server/checks";
import { getCheckSettings, saveCheckSettings } from "@/lib/server/check-settings";
import { listFlags, type FlagJson } from "@/lib/server/flags";
import { createRecord, getRecordPage, updateRecord } from "@/lib/server/records";
import { insertRecordsBulk } from "@/lib/server/records-bulk";
import { acceptRecord, resolveFlag, resolveFlagsBulk, setSourceQualityOverride } from "@/lib/server/review";
import { createSource } from "@/lib/server/sources";
import type { RecordInput } from "@/lib/schemas/record";
import { mixedUnitRecord, sourceInput } from "../support/fixtures";
import { useTempDatabase } from "../support/temp-db";

const tmp = useTempDatabase("review");
let actor: Actor;
let sourceId: number;
let otherSourceId: number;

async function flagsOf(recordId: number, state: "open" | "resolved" | "waived" | null = "open"): Promise<FlagJson[]> {
  const r = await listFlags({ recordId, state });
  if (!r.ok) throw new Error(r.error.message);
  return r.data;
}

async function newRecord(overrides: Partial<RecordInput> = {}, source = sourceId): Promise<number> {
  const r = await createRecord(mixedUnitRecord(source, overrides), actor);
  if (!r.ok) throw new Error(JSON.stringify(r.error));
  return r.data.id;
}

function editInput(id: number, version: number, overrides: Partial<RecordInput>) {
  return { ...mixedUnitRecord(sourceId, overrides), id, version };
}

beforeAll(async () => {
  migrate(sqlite());
  actor = await localActor();
  const s = await createSource(sourceInput(), actor);
  const o = await createSource(sourceInput({ title: "A second invented study of the same alloy", doi: "10.5555/TEST.0002" }), actor);
  if (!s.ok || !o.ok) throw new Error("sources");
  sourceId = s.data.id;
  otherSourceId = o.data.id;
});
afterAll(() => tmp.cleanup());

describe("checks on save", () => {
  test("a plausible record gets no flags and a quality score", async () => {
    const id = await newRecord({ laserPower: { value: "210", unit: "W" } });
    expect(await flagsOf(id)).toEqual([]);
    const page = await getRecordPage(id);
    expect(page.ok && page.data.record.qualityScore).toBeGreaterThan(0.5);
  });

  test("a unit slip is flagged with its one-step fix, and the fix resolves it", async () => {
    const id = await newRecord({ scanSpeed: { value: "0.9", unit: "mm/s" }, laserPower: { value: "220", unit: "W" } });
    const flags = await flagsOf(id);
    const slip = flags.find((f) => f.code === "unit_slip.scan_speed");
    expect(slip?.severity).toBe("warning");
    expect(slip?.details.suggestedFix).toMatchObject({ field: "scanSpeed", value: "0.9", unit: "m/s" });
    expect(flags.map((f) => f.code)).toContain("energy.volumetric");
    const page = await getRecordPage(id);
    const fixed = await resolveFlag({ flagId: slip!.id, version: slip!.version, recordVersion: page.ok ? page.data.record.version : 0, action: "fix" }, actor);
    expect(fixed.ok).toBe(true);
    if (fixed.ok) {
      expect(fixed.data.resolved).toBe(true);
      expect(fixed.data.resolution).toBe("fix");
    }
    const after = await getRecordPage(id);
    expect(after.ok && after.data.record.scanSpeedMmPerS).toBe(900);
    expect(after.ok && after.data.record.enteredValues.scanSpeed).toMatchObject({ text: "0.9", unit: "m/s" });
    expect(await flagsOf(id)).toEqual([]); // E_v went back into its window too: stale
    const resolved = await flagsOf(id, "resolved");
    expect(resolved.find((f) => f.code === "unit_slip.scan_speed")?.resolution).toBe("fix");
    expect(resolved.find((f) => f.code === "energy.volumetric")?.resolution).toBe("stale");
    expect(resolved.filter((f) => f.code !== "unit_slip.scan_speed").every((f) => f.resolution === "stale")).toBe(true);
    const history = after.ok ? after.data.history.map((h) => h.action) : [];
    expect(history).toContain("update");
  });

  test("editing a record away from its finding resolves the flag as stale; editing back reopens it", async () => {
    const id = await newRecord({ hatchSpacing: { value: "0.5", unit: "mm" }, laserPower: { value: "230", unit: "W" } });
    const [range] = (await flagsOf(id)).filter((f) => f.code === "range.hatch_spacing");
    expect(range).toBeDefined();
    const saved = await updateRecord(editInput(id, 1, { hatchSpacing: { value: "0.1", unit: "mm" }, laserPower: { value: "230", unit: "W" } }), actor);
    expect(saved.ok).toBe(true);
    expect((await flagsOf(id)).map((f) => f.code)).not.toContain("range.hatch_spacing");
    const again = await updateRecord(editInput(id, 2, { hatchSpacing: { value: "0.5", unit: "mm" }, laserPower: { value: "230", unit: "W" } }), actor);
    expect(again.ok).toBe(true);
    const reopened = (await flagsOf(id)).find((f) => f.code === "range.hatch_spacing");
    expect(reopened?.id).toBe(range!.id);
  });
});

describe("review actions", () => {
  test("waive needs a reason; a stale version is a conflict and changes nothing", async () => {
    const id = await newRecord({ layerThickness: { value: "0.4", unit: "mm" }, laserPower: { value: "240", unit: "W" } });
    const flag = (await flagsOf(id)).find((f) => f.code === "range.layer_thickness")!;
    const noReason = await resolveFlag({ flagId: flag.id, version: flag.version, action: "waive" }, actor);
    expect(!noReason.ok && noReason.error.code).toBe("invalid_input");
    expect(!noReason.ok && noReason.error.details?.fieldErrors?.reason?.[0]).toMatch(/reason/);
    const stale = await resolveFlag({ flagId: flag.id, version: flag.version + 5, action: "waive", reason: "thick layers are the point of the study" }, actor);
    expect(!stale.ok && stale.error.code).toBe("conflict");
    expect((await flagsOf(id)).map((f) => f.id)).toContain(flag.id);
    const unknown = await resolveFlag({ flagId: 999_999, action: "waive", reason: "no such flag" }, actor);
    expect(!unknown.ok && unknown.error.code).toBe("not_found");
    const waived = await resolveFlag({ flagId: flag.id, version: flag.version, action: "waive", reason: "thick layers are the point of the study" }, actor);
    expect(waived.ok && waived.data.state).toBe("waived");
    // the second reviewer, who loaded the same version, gets a clear conflict
    const second = await resolveFlag({ flagId: flag.id, version: flag.version, action: "waive", reason: "also fine by me" }, actor);
    expect(!second.ok && second.error.code).toBe("conflict");
    expect(!second.ok && second.error.message).toMatch(/waived/);
    // a waived finding stays waived when the checks run again
    await runChecks({ recordIds: [id] }, actor);
    expect((await flagsOf(id, "waived")).map((f) => f.id)).toEqual([flag.id]);
  });

  test("an exact duplicate is an error that blocks acceptance until merged; both records stay", async () => {
    const input = { laserPower: { value: "250", unit: "W" }, scanSpeed: { value: "1.1", unit: "m/s" } };
    const first = await newRecord(input);
    const copy = await newRecord(input);
    const dup = (await flagsOf(copy)).find((f) => f.code === "duplicate.exact");
    expect(dup?.severity).toBe("error");
    expect(dup?.related_record_id).toBe(first);
    const blocked = await acceptRecord({ recordId: copy }, actor);
    expect(!blocked.ok && blocked.error.code).toBe("conflict");
    expect(!blocked.ok && blocked.error.message).toMatch(/open error flag/);
    const merged = await resolveFlag({ flagId: dup!.id, version: dup!.version, action: "merge", reason: "same specimen keyed twice" }, actor);
    expect(merged.ok && merged.data.recordStatus).toBe("merged");
    const page = await getRecordPage(copy);
    expect(page.ok && page.data.record.mergedIntoId).toBe(first);
    expect((await getRecordPage(first)).ok).toBe(true);
    const accepted = await acceptRecord({ recordId: first }, actor);
    expect(accepted.ok).toBe(true);
  });

  test("a pair marked distinct is never raised again", async () => {
    const input = { laserPower: { value: "260", unit: "W" }, scanSpeed: { value: "1.2", unit: "m/s" } };
    const a = await newRecord(input);
    const b = await newRecord(input, otherSourceId); // republished elsewhere: near duplicate
    const near = (await flagsOf(b)).find((f) => f.code === "duplicate.near");
    expect(near?.related_record_id).toBe(a);
    const noReason = await resolveFlag({ flagId: near!.id, action: "distinct" }, actor);
    expect(noReason.ok).toBe(false);
    const distinct = await resolveFlag({ flagId: near!.id, version: near!.version, action: "distinct", reason: "two builds on different machines" }, actor);
    expect(distinct.ok).toBe(true);
    await runChecks({ all: true }, actor);
    const open = await flagsOf(b);
    expect(open.filter((f) => f.code.startsWith("duplicate."))).toEqual([]);
  });

  test("same parameters with a different outcome are a label conflict", async () => {
    const input = { laserPower: { value: "270", unit: "W" }, scanSpeed: { value: "1.3", unit: "m/s" } };
    const a = await newRecord(input);
    const b = await newRecord({ ...input, outcome: "keyhole" });
    const conflict = (await flagsOf(b)).find((f) => f.code === "duplicate.label_conflict");
    expect(conflict?.related_record_id).toBe(a);
  });

  test("reject needs a reason and closes the record's flags", async () => {
    const id = await newRecord({ laserPower: { value: "12", unit: "W" } });
    const flag = (await flagsOf(id))[0]!;
    const r = await resolveFlag({ flagId: flag.id, action: "reject", reason: "power misread from a figure" }, actor);
    expect(r.ok && r.data.recordStatus).toBe("rejected");
    expect(await flagsOf(id)).toEqual([]);
  });

  test("bulk waive: each flag on its own, a stale one reported", async () => {
    const a = await newRecord({ preheat: { value: "900", unit: "°C" }, laserPower: { value: "280", unit: "W" } });
    const b = await newRecord({ preheat: { value: "950", unit: "°C" }, laserPower: { value: "285", unit: "W" } });
    const fa = (await flagsOf(a)).find((f) => f.code === "range.preheat")!;
    const fb = (await flagsOf(b)).find((f) => f.code === "range.preheat")!;
    const r = await resolveFlagsBulk({ items: [{ flagId: fa.id, version: fa.version }, { flagId: fb.id, version: fb.version + 1 }], action: "waive", reason: "hot-bed study" }, actor);
    expect(r.ok && [r.data.done, r.data.failed]).toEqual([1, 1]);
    expect(r.ok && r.data.items[1]!.error?.code).toBe("conflict");
  });
});

describe("settings and quality", () => {
  test("a new settings version is used by the next run and recorded on the flags", async () => {
    const page = await getCheckSettings();
    if (!page.ok) throw new Error(page.error.message);
    const id = await newRecord({ laserPower: { value: "640", unit: "W" } });
    expect((await flagsOf(id)).map((f) => f.code)).not.toContain("range.laser_power");
    const stale = await saveCheckSettings({ values: { "range.laserPower.max": "500" }, basedOnVersion: page.data.current.version + 1, reason: "narrower window" }, actor);
    expect(!stale.ok && stale.error.code).toBe("conflict");
    const saved = await saveCheckSettings({ values: { "range.laserPower.max": "500" }, basedOnVersion: page.data.current.version, reason: "narrower window for this machine park" }, actor);
    expect(saved.ok).toBe(true);
    const run = await runChecks({ all: true }, actor);
    expect(run.ok && run.data.settingsVersion).toBe(saved.ok ? saved.data.version : -1);
    const flag = (await flagsOf(id)).find((f) => f.code === "range.laser_power");
    expect(flag?.settings_version).toBe(saved.ok ? saved.data.version : -1);
    // re-running under the earlier version reproduces the earlier verdict
    const rerun = await runChecks({ recordIds: [id], settingsVersion: page.data.current.version }, actor);
    expect(rerun.ok).toBe(true);
    expect((await flagsOf(id)).map((f) => f.code)).not.toContain("range.laser_power");
    await runChecks({ all: true }, actor);
  });

  test("a source quality override needs a reason and changes its records' quality", async () => {
    const id = await newRecord({ laserPower: { value: "215", unit: "W" } });
    const before = await getRecordPage(id);
    const q0 = before.ok ? before.data.record.qualityScore! : 0;
    const src = sqlite().prepare(`SELECT version FROM Source WHERE id = ?`).get(sourceId) as { version: number };
    const noReason = await setSourceQualityOverride({ sourceId, version: src.version, score: 0.2 }, actor);
    expect(!noReason.ok && noReason.error.code).toBe("invalid_input");
    const r = await setSourceQualityOverride({ sourceId, version: src.version, score: 0.2, reason: "values read off a low-resolution figure" }, actor);
    expect(r.ok).toBe(true);
    const after = await getRecordPage(id);
    expect(after.ok && after.data.record.qualityScore).toBeLessThan(q0);
    expect(after.ok && after.data.record.qualityScore).toBeLessThanOrEqual(0.2);
  });

  test("bulk inserts are checked after they commit", async () => {
    const rows = [mixedUnitRecord(sourceId, { laserPower: { value: "290", unit: "W" } }), mixedUnitRecord(sourceId, { laserPower: { value: "290", unit: "W" } })];
    const r = await insertRecordsBulk(rows, actor, { importFile: "batch.csv" });
    if (!r.ok) throw new Error(r.error.message);
    const flags = await flagsOf(r.data.ids[1]!);
    expect(flags.map((f) => [f.code, f.import_file, f.import_row])).toEqual([["duplicate.exact", "batch.csv", 2]]);
  });

  test("bulk writes store the quality score a check run computes (so the run rewrites none)", async () => {
    const rows = [
      mixedUnitRecord(sourceId, { laserPower: { value: "210", unit: "W" } }),
      mixedUnitRecord(sourceId, { laserPower: { value: "220", unit: "W" }, spotDiameter: { value: "", unit: "" } }),
      mixedUnitRecord(sourceId, { laserPower: { value: "230", unit: "W" }, provenance: { spotDiameter: "assumed", hatchSpacing: "derived" } }),
      mixedUnitRecord(sourceId, { laserPower: { value: "240", unit: "W" }, outcome: "unknown", relativeDensity: { value: "", unit: "" } }),
    ];
    const r = await insertRecordsBulk(rows, actor, { deferChecks: true });
    if (!r.ok) throw new Error(r.error.message);
    const read = () => (sqlite().prepare(`SELECT qualityScore FROM BuildRecord WHERE id IN (${r.data.ids.join(",")}) ORDER BY id`).pluck().all() as (number | null)[]);
    const atWrite = read();
    expect(atWrite.every((q) => typeof q === "number" && q > 0)).toBe(true);
    expect(new Set(atWrite).size).toBeGreaterThan(1); // the rows differ in completeness
    const run = await runChecks({ recordIds: r.data.ids }, actor);
    if (!run.ok) throw new Error(run.error.message);
    expect(run.data.qualityUpdated).toBe(0);
    expect(read()).toEqual(atWrite);
  });

  test("a large batch (consecutive ids, read as one range) is checked in full: every record scored, its repeat flagged", async () => {
    const rows = Array.from({ length: 800 }, (_, i) => mixedUnitRecord(sourceId, { laserPower: { value: String(100 + i * 0.25), unit: "W" } }));
    rows.push(mixedUnitRecord(sourceId, { laserPower: { value: "150", unit: "W" } })); // repeats row 201
    const r = await insertRecordsBulk(rows, actor, { importFile: "large.csv" });
    if (!r.ok) throw new Error(r.error.message);
    const unscored = sqlite().prepare(`SELECT COUNT(*) AS n FROM BuildRecord WHERE id BETWEEN ? AND ? AND qualityScore IS NULL`).get(r.data.ids[0], r.data.ids[800]) as { n: number };
    expect(unscored.n).toBe(0);
    const flags = await flagsOf(r.data.ids[800]!);
    expect(flags.filter((f) => f.code === "duplicate.exact").map((f) => [f.import_file, f.import_row])).toEqual([["large.csv", 801]]);
  });
});
