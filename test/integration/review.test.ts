// Checks on save, flags kept in step, and the review actions, on both engines with the same test.
// Records are written through the server layer (createRecord, updateRecord: Prisma on either engine)
// and read back through sql(); only the tests of the bulk writer run on SQLite alone (see there).
import { beforeAll, describe, expect, test, type TestContext } from "vitest";
import { listAuditFor } from "@/lib/db/audit";
import { sql } from "@/lib/db/sql";
import { localActor, type Actor } from "@/lib/server/actor";
import { qualityScorerFor, runChecks, runChecksIn, runChecksNow } from "@/lib/server/checks";
import { getCheckSettings, saveCheckSettings } from "@/lib/server/check-settings";
import { listFlags, type FlagJson } from "@/lib/server/flags";
import { prepareRecord } from "@/lib/server/record-write";
import { createRecord, updateRecord } from "@/lib/server/records";
import { insertRecordsBulk } from "@/lib/server/records-bulk";
import { acceptRecord, resolveFlag, resolveFlagsBulk, setSourceQualityOverride } from "@/lib/server/review";
import { getReviewQueue } from "@/lib/server/review-queue";
import { getSourceQuality } from "@/lib/server/source-quality";
import { createSource } from "@/lib/server/sources";
import { recordInputSchema, type RecordInput } from "@/lib/schemas/record";
import { mixedUnitRecord, sourceInput } from "../support/fixtures";
import { describeEachEngine } from "../support/engines";

interface StoredRecord {
  id: number;
  version: number;
  status: string;
  scanSpeedMmPerS: number | null;
  enteredValues: string;
  mergedIntoId: number | null;
  qualityScore: number | null;
}

async function stored(id: number): Promise<StoredRecord> {
  const r = await sql().get<StoredRecord>(
    `SELECT "id", "version", "status", "scanSpeedMmPerS" AS "scanSpeedMmPerS", "enteredValues" AS "enteredValues", "mergedIntoId" AS "mergedIntoId", "qualityScore" AS "qualityScore" FROM "BuildRecord" WHERE "id" = ?`,
    [id],
  );
  if (!r) throw new Error(`no record ${id}`);
  return r;
}

async function flagsOf(recordId: number, state: "open" | "resolved" | "waived" | null = "open"): Promise<FlagJson[]> {
  const r = await listFlags({ recordId, state });
  if (!r.ok) throw new Error(r.error.message);
  return r.data;
}

describeEachEngine("checks and review", (current) => {
  let actor: Actor;
  let sourceId: number;
  let otherSourceId: number;

  async function newRecord(overrides: Partial<RecordInput> = {}, source = sourceId): Promise<number> {
    const r = await createRecord(mixedUnitRecord(source, overrides), actor);
    if (!r.ok) throw new Error(JSON.stringify(r.error));
    return r.data.id;
  }

  const editInput = (id: number, version: number, overrides: Partial<RecordInput>) => ({ ...mixedUnitRecord(sourceId, overrides), id, version });

  /**
   * The bulk writer (records-bulk.ts) still runs on the raw SQLite connection: until it moves to
   * sql.ts its tests run on SQLite only, and are reported skipped on PostgreSQL.
   */
  const sqliteOnly = (ctx: TestContext) => {
    if (current().engine !== "sqlite") ctx.skip();
  };

  beforeAll(async () => {
    actor = await localActor();
    const s = await createSource(sourceInput(), actor);
    const o = await createSource(sourceInput({ title: "A second invented study of the same alloy", doi: "10.5555/TEST.0002" }), actor);
    if (!s.ok || !o.ok) throw new Error("sources");
    sourceId = s.data.id;
    otherSourceId = o.data.id;
  });

  describe("checks on save", () => {
    test("a plausible record gets no flags and a quality score", async () => {
      const id = await newRecord({ laserPower: { value: "210", unit: "W" } });
      expect(await flagsOf(id)).toEqual([]);
      expect((await stored(id)).qualityScore).toBeGreaterThan(0.5);
    });

    test("a unit slip is flagged with its one-step fix, and the fix resolves it", async () => {
      const id = await newRecord({ scanSpeed: { value: "0.9", unit: "mm/s" }, laserPower: { value: "220", unit: "W" } });
      const flags = await flagsOf(id);
      const slip = flags.find((f) => f.code === "unit_slip.scan_speed");
      expect(slip?.severity).toBe("warning");
      expect(slip?.details.suggestedFix).toMatchObject({ field: "scanSpeed", value: "0.9", unit: "m/s" });
      expect(flags.map((f) => f.code)).toContain("energy.volumetric");
      const before = await stored(id);
      const fixed = await resolveFlag({ flagId: slip!.id, version: slip!.version, recordVersion: before.version, action: "fix" }, actor);
      expect(fixed.ok).toBe(true);
      if (fixed.ok) {
        expect(fixed.data.resolved).toBe(true);
        expect(fixed.data.resolution).toBe("fix");
        expect(fixed.data.recordVersion).toBe(before.version + 1);
      }
      const after = await stored(id);
      expect(after.scanSpeedMmPerS).toBe(900);
      expect(JSON.parse(after.enteredValues).scanSpeed).toMatchObject({ text: "0.9", unit: "m/s" });
      expect(await flagsOf(id)).toEqual([]); // E_v went back into its window too: stale
      const resolved = await flagsOf(id, "resolved");
      expect(resolved.find((f) => f.code === "unit_slip.scan_speed")?.resolution).toBe("fix");
      expect(resolved.find((f) => f.code === "energy.volumetric")?.resolution).toBe("stale");
      expect(resolved.filter((f) => f.code !== "unit_slip.scan_speed").every((f) => f.resolution === "stale")).toBe(true);
      const history = (await listAuditFor("record", id)).map((h) => h.action);
      expect(history).toContain("update");
      expect((await listAuditFor("flag", slip!.id)).map((h) => h.action)).toEqual(["fix"]);
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
      expect(waived.ok && waived.data).toMatchObject({ state: "waived", resolution: "waive", recordId: id, recordStatus: "needs_review", recordVersion: 1 });
      // the second reviewer, who loaded the same version, gets a clear conflict naming who acted
      const second = await resolveFlag({ flagId: flag.id, version: flag.version, action: "waive", reason: "also fine by me" }, actor);
      expect(!second.ok && second.error.code).toBe("conflict");
      expect(!second.ok && second.error.message).toMatch(new RegExp(`waived \\(waive\\) at .* by ${actor.name}`));
      // a waived finding stays waived when the checks run again
      await runChecks({ recordIds: [id] }, actor);
      expect((await flagsOf(id, "waived")).map((f) => f.id)).toEqual([flag.id]);
      const events = await listAuditFor("flag", flag.id);
      expect(events.map((e) => [e.action, e.reason])).toEqual([["waive", "thick layers are the point of the study"]]);
    });

    test("reviewers waiving at once: each flag's waiver lands exactly once, the ones who came second get a conflict", async () => {
      const ids = await Promise.all([0, 1, 2, 3, 4, 5].map((i) => newRecord({ preheat: { value: String(700 + i * 10), unit: "°C" }, laserPower: { value: String(300 + i), unit: "W" } })));
      const flags = await Promise.all(ids.map(async (id) => (await flagsOf(id)).find((f) => f.code === "range.preheat")!));
      // three reviewers on each flag, all from the version they loaded
      const attempts = flags.flatMap((f) => [1, 2, 3].map((n) => ({ flag: f, reason: `reviewer ${n}: hot-bed study` })));
      const results = await Promise.all(attempts.map((a) => resolveFlag({ flagId: a.flag.id, version: a.flag.version, action: "waive", reason: a.reason }, actor)));
      for (const f of flags) {
        const mine = results.filter((_, i) => attempts[i]!.flag.id === f.id);
        expect(mine.filter((r) => r.ok)).toHaveLength(1);
        expect(mine.filter((r) => !r.ok).map((r) => !r.ok && r.error.code)).toEqual(["conflict", "conflict"]);
        // whether they read before or after the first one wrote, they are told who acted
        for (const r of mine) if (!r.ok) expect(r.error.message).toMatch(new RegExp(`waived \\(waive\\) at .* by ${actor.name}`));
        const events = await listAuditFor("flag", f.id);
        expect(events.map((e) => e.action)).toEqual(["waive"]);
        const [after] = await flagsOf(f.record_id!, "waived");
        expect(after).toMatchObject({ id: f.id, version: f.version + 1, reason: events[0]!.reason });
      }
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
      expect((await stored(copy)).mergedIntoId).toBe(first);
      expect((await stored(first)).status).toBe("needs_review");
      const accepted = await acceptRecord({ recordId: first }, actor);
      expect(accepted.ok).toBe(true);
      expect((await stored(first)).status).toBe("accepted");
      const again = await resolveFlag({ flagId: dup!.id, version: dup!.version + 1, action: "distinct", reason: "changed my mind" }, actor);
      expect(!again.ok && again.error.code).toBe("conflict");
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
      expect((await flagsOf(b)).filter((f) => f.code.startsWith("duplicate."))).toEqual([]);
      expect((await flagsOf(a)).filter((f) => f.code.startsWith("duplicate.") && f.related_record_id === b)).toEqual([]);
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
      const open = await flagsOf(id);
      expect(open.length).toBeGreaterThan(1);
      const r = await resolveFlag({ flagId: open[0]!.id, action: "reject", reason: "power misread from a figure" }, actor);
      expect(r.ok && r.data.recordStatus).toBe("rejected");
      expect(await flagsOf(id)).toEqual([]);
      expect((await flagsOf(id, "resolved")).map((f) => [f.id, f.resolution])).toEqual(open.map((f) => [f.id, "reject"]));
      const late = await resolveFlag({ flagId: open[0]!.id, action: "waive", reason: "too late" }, actor);
      expect(!late.ok && late.error.code).toBe("conflict");
    });

    test("a fix against a record saved meanwhile is a conflict and changes nothing", async () => {
      const id = await newRecord({ scanSpeed: { value: "0.7", unit: "mm/s" }, laserPower: { value: "222", unit: "W" } });
      const slip = (await flagsOf(id)).find((f) => f.code === "unit_slip.scan_speed")!;
      const r = await resolveFlag({ flagId: slip.id, version: slip.version, recordVersion: 7, action: "fix" }, actor);
      expect(!r.ok && r.error.code).toBe("conflict");
      expect(!r.ok && r.error.message).toMatch(/you saw version 7, it is now version 1/);
      expect(await stored(id)).toMatchObject({ version: 1, scanSpeedMmPerS: 0.7 });
      expect((await flagsOf(id)).map((f) => f.id)).toContain(slip.id);
      expect(await listAuditFor("flag", slip.id)).toEqual([]);
    });

    test("bulk waive: each flag on its own, a stale one reported", async () => {
      const a = await newRecord({ preheat: { value: "900", unit: "°C" }, laserPower: { value: "280", unit: "W" } });
      const b = await newRecord({ preheat: { value: "950", unit: "°C" }, laserPower: { value: "285", unit: "W" } });
      const fa = (await flagsOf(a)).find((f) => f.code === "range.preheat")!;
      const fb = (await flagsOf(b)).find((f) => f.code === "range.preheat")!;
      const r = await resolveFlagsBulk({ items: [{ flagId: fa.id, version: fa.version }, { flagId: fb.id, version: fb.version + 1 }], action: "waive", reason: "hot-bed study" }, actor);
      expect(r.ok && [r.data.done, r.data.failed]).toEqual([1, 1]);
      expect(r.ok && r.data.items[1]!.error?.code).toBe("conflict");
      expect((await flagsOf(b)).map((f) => f.id)).toContain(fb.id);
    });

    test("the review queue lists records with open flags, worst first, with the pair's other record", async () => {
      const input = { laserPower: { value: "331", unit: "W" }, scanSpeed: { value: "1.33", unit: "m/s" } };
      const first = await newRecord(input);
      const copy = await newRecord(input);
      const q = await getReviewQueue({ code: "duplicate.exact", pageSize: 100 });
      if (!q.ok) throw new Error(q.error.message);
      const item = q.data.items.find((i) => i.record.id === copy)!;
      expect(item.flags.map((f) => [f.ruleCode, f.severity, f.isPair, f.relatedRecordId])).toEqual([["duplicate.exact", "error", true, first]]);
      expect(item.related[first]?.id).toBe(first);
      expect(item.record.source.id).toBe(sourceId);
      expect(item.record.values.find((v) => v.field === "laserPower")).toMatchObject({ canonical: 331, entered: { text: "331", unit: "W" } });
      expect(q.data.total).toBe(q.data.items.length);
      expect(q.data.items.every((i) => i.flags.every((f) => f.ruleCode.startsWith("duplicate.exact")))).toBe(true);
      const open = await listFlags({ state: "open", codePrefix: "duplicate.exact" });
      expect(q.data.counts.byRule.find((r) => r.ruleCode === "duplicate.exact")?.count).toBe(open.ok ? open.data.length : -1);
      expect(q.data.total).toBe(open.ok ? new Set(open.data.map((f) => f.record_id)).size : -1);
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
      expect((await listAuditFor("check_run", "all")).at(-1)?.after).toMatchObject({ settingsVersion: saved.ok ? saved.data.version : -1 });
      // re-running under the earlier version reproduces the earlier verdict
      const rerun = await runChecks({ recordIds: [id], settingsVersion: page.data.current.version }, actor);
      expect(rerun.ok).toBe(true);
      expect((await flagsOf(id)).map((f) => f.code)).not.toContain("range.laser_power");
      const missing = await runChecks({ all: true, settingsVersion: 9_999 }, actor);
      expect(!missing.ok && missing.error.code).toBe("not_found");
      await runChecks({ all: true }, actor);
    });

    test("a source quality override needs a reason and changes its records' quality", async () => {
      const id = await newRecord({ laserPower: { value: "215", unit: "W" } });
      const q0 = (await stored(id)).qualityScore!;
      const src = (await sql().get<{ version: number }>(`SELECT "version" FROM "Source" WHERE "id" = ?`, [sourceId]))!;
      const noReason = await setSourceQualityOverride({ sourceId, version: src.version, score: 0.2 }, actor);
      expect(!noReason.ok && noReason.error.code).toBe("invalid_input");
      const stale = await setSourceQualityOverride({ sourceId, version: src.version + 3, score: 0.2, reason: "values read off a low-resolution figure" }, actor);
      expect(!stale.ok && stale.error.code).toBe("conflict");
      const r = await setSourceQualityOverride({ sourceId, version: src.version, score: 0.2, reason: "values read off a low-resolution figure" }, actor);
      expect(r.ok).toBe(true);
      const q1 = (await stored(id)).qualityScore!;
      expect(q1).toBeLessThan(q0);
      expect(q1).toBeLessThanOrEqual(0.2);
      const view = await getSourceQuality(sourceId);
      if (!view.ok) throw new Error(view.error.message);
      expect(view.data).toMatchObject({ sourceId, version: src.version + 1, overrideReason: "values read off a low-resolution figure", overriddenBy: actor.name });
      const n = (await sql().get<{ n: number }>(`SELECT COUNT(*) AS n FROM "BuildRecord" WHERE "sourceId" = ?`, [sourceId]))!.n;
      expect(view.data.records).toBe(n);
      // put it back for the tests that follow
      const cleared = await setSourceQualityOverride({ sourceId, version: src.version + 1, score: null, reason: "" }, actor);
      expect(cleared.ok).toBe(true);
      expect((await stored(id)).qualityScore).toBe(q0);
    });

    test("qualityScorerFor gives the score a check run stores, and refuses a source it was not given", async () => {
      const inputs: [number, Partial<RecordInput>][] = [
        [sourceId, { laserPower: { value: "211", unit: "W" } }],
        [otherSourceId, { laserPower: { value: "212", unit: "W" }, spotDiameter: { value: "", unit: "" } }],
        [sourceId, { laserPower: { value: "213", unit: "W" }, provenance: { spotDiameter: "assumed", hatchSpacing: "derived" } }],
      ];
      const score = await qualityScorerFor(sql(), [sourceId, otherSourceId]);
      for (const [source, overrides] of inputs) {
        const prepared = prepareRecord(recordInputSchema.parse(mixedUnitRecord(source, overrides)));
        if (!prepared.ok) throw new Error("prepare");
        const id = await newRecord(overrides, source);
        expect(score(prepared.write)).toBe((await stored(id)).qualityScore);
      }
      const onlyOne = await qualityScorerFor(sql(), [otherSourceId]);
      const prepared = prepareRecord(recordInputSchema.parse(mixedUnitRecord(sourceId, inputs[0]![1])));
      if (!prepared.ok) throw new Error("prepare");
      expect(() => onlyOne(prepared.write)).toThrow(/source \d+ was not among/);
    });

    test("the checks inside a transaction that rolls back leave no trace", async () => {
      const id = await newRecord({ hatchSpacing: { value: "0.45", unit: "mm" }, laserPower: { value: "233", unit: "W" } });
      await sql().run(`UPDATE "BuildRecord" SET "hatchSpacingUm" = 100 WHERE "id" = ?`, [id]);
      const before = await flagsOf(id);
      await expect(
        sql().transaction(async (tx) => {
          const s = await runChecksIn(tx, [id]);
          expect(s.stale).toBeGreaterThan(0);
          throw new Error("undo");
        }),
      ).rejects.toThrow("undo");
      expect(await flagsOf(id)).toEqual(before);
      const s = await runChecksNow([id]);
      expect(s.stale).toBeGreaterThan(0);
      expect((await flagsOf(id)).map((f) => f.code)).not.toContain("range.hatch_spacing");
    });

    test("bulk inserts are checked after they commit (SQLite: the bulk writer)", async (ctx) => {
      sqliteOnly(ctx);
      const rows = [mixedUnitRecord(sourceId, { laserPower: { value: "290", unit: "W" } }), mixedUnitRecord(sourceId, { laserPower: { value: "290", unit: "W" } })];
      const r = await insertRecordsBulk(rows, actor, { importFile: "batch.csv" });
      if (!r.ok) throw new Error(r.error.message);
      const flags = await flagsOf(r.data.ids[1]!);
      expect(flags.map((f) => [f.code, f.import_file, f.import_row])).toEqual([["duplicate.exact", "batch.csv", 2]]);
    });

    test("bulk writes store the quality score a check run computes, so the run rewrites none (SQLite: the bulk writer)", async (ctx) => {
      sqliteOnly(ctx);
      const rows = [
        mixedUnitRecord(sourceId, { laserPower: { value: "210", unit: "W" } }),
        mixedUnitRecord(sourceId, { laserPower: { value: "220", unit: "W" }, spotDiameter: { value: "", unit: "" } }),
        mixedUnitRecord(sourceId, { laserPower: { value: "230", unit: "W" }, provenance: { spotDiameter: "assumed", hatchSpacing: "derived" } }),
        mixedUnitRecord(sourceId, { laserPower: { value: "240", unit: "W" }, outcome: "unknown", relativeDensity: { value: "", unit: "" } }),
      ];
      const r = await insertRecordsBulk(rows, actor, { deferChecks: true });
      if (!r.ok) throw new Error(r.error.message);
      const read = async () => Promise.all(r.data.ids.map(async (id) => (await stored(id)).qualityScore));
      const atWrite = await read();
      expect(atWrite.every((q) => typeof q === "number" && q > 0)).toBe(true);
      expect(new Set(atWrite).size).toBeGreaterThan(1); // the rows differ in completeness
      const run = await runChecks({ recordIds: r.data.ids }, actor);
      if (!run.ok) throw new Error(run.error.message);
      expect(run.data.qualityUpdated).toBe(0);
      expect(await read()).toEqual(atWrite);
    });

    test("a large batch (consecutive ids, read as one range) is checked in full: every record scored, its repeat flagged (SQLite: the bulk writer)", async (ctx) => {
      sqliteOnly(ctx);
      const rows = Array.from({ length: 800 }, (_, i) => mixedUnitRecord(sourceId, { laserPower: { value: String(100 + i * 0.25), unit: "W" } }));
      rows.push(mixedUnitRecord(sourceId, { laserPower: { value: "150", unit: "W" } })); // repeats row 201
      const r = await insertRecordsBulk(rows, actor, { importFile: "large.csv" });
      if (!r.ok) throw new Error(r.error.message);
      const unscored = await sql().get<{ n: number }>(`SELECT COUNT(*) AS n FROM "BuildRecord" WHERE "id" BETWEEN ? AND ? AND "qualityScore" IS NULL`, [r.data.ids[0]!, r.data.ids[800]!]);
      expect(unscored!.n).toBe(0);
      const flags = await flagsOf(r.data.ids[800]!);
      expect(flags.filter((f) => f.code === "duplicate.exact").map((f) => [f.import_file, f.import_row])).toEqual([["large.csv", 801]]);
    });
  });
});
