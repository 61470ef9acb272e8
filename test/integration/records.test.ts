// Sources, records and bulk inserts through lib/server, on SQLite and on PostgreSQL.
import { beforeAll, describe, expect, test } from "vitest";
import { POSTGRES_INSERT_ROWS } from "@/lib/db/records";
import { sql } from "@/lib/db/sql";
import { localActor, type Actor } from "@/lib/server/actor";
import { createRecord, getRecordPage, listRecords, rejectRecord, updateRecord } from "@/lib/server/records";
import { createSource, getSourcePage, updateSource } from "@/lib/server/sources";
import { insertRecordsBulk } from "@/lib/server/records-bulk";
import { describeEachEngine } from "../support/engines";
import { mixedUnitRecord, sourceInput } from "../support/fixtures";

const listRecordsCount = async () => (await sql().get<{ n: number }>(`SELECT COUNT(*) AS n FROM "BuildRecord"`))!.n;

describeEachEngine("records", () => {

  let actor: Actor;
  let sourceId: number;

  beforeAll(async () => {
    actor = await localActor();
    const s = await createSource(sourceInput(), actor);
    if (!s.ok) throw new Error(s.error.message);
    sourceId = s.data.id;
  });

  describe("sources", () => {
    test("DOI is normalized and a second source with it is refused, offering the first", async () => {
      const page = await getSourcePage(sourceId);
      expect(page.ok && page.data.source.doi).toBe("10.5555/test.0001");
      const again = await createSource(sourceInput({ title: "Another title entirely", doi: "doi:10.5555/test.0001" }), actor);
      expect(again.ok).toBe(false);
      if (!again.ok) {
        expect(again.error.code).toBe("conflict");
        expect(again.error.details?.existingSourceId).toBe(sourceId);
      }
    });

    test("same title and year is offered instead of a copy unless confirmed", async () => {
      const same = await createSource(sourceInput({ doi: null, title: "PROCESS windows for a test alloy, in a fictional study!" }), actor);
      expect(!same.ok && same.error.code).toBe("conflict");
      const confirmed = await createSource(sourceInput({ doi: null, title: "PROCESS windows for a test alloy, in a fictional study!" }), actor, { allowSameTitle: true });
      expect(confirmed.ok).toBe(true);
    });

    test("bad input comes back as field errors", async () => {
      const r = await createSource({ kind: "blog", title: "x", year: "20x1", url: "ftp://nope", doi: "not a doi" }, actor);
      expect(r.ok).toBe(false);
      if (!r.ok) {
        expect(r.error.code).toBe("invalid_input");
        expect(Object.keys(r.error.details?.fieldErrors ?? {})).toEqual(expect.arrayContaining(["kind", "title", "year", "url"]));
      }
    });

    test("a stale edit of a source is a conflict", async () => {
      const first = await updateSource({ ...sourceInput({ notes: "first" }), id: sourceId, version: 1 }, actor);
      expect(first.ok).toBe(true);
      const second = await updateSource({ ...sourceInput({ notes: "second" }), id: sourceId, version: 1 }, actor);
      expect(!second.ok && second.error.code).toBe("conflict");
    });
  });

  describe("records", () => {
    test("mixed units are stored canonical, with the text as entered kept", async () => {
      const r = await createRecord(mixedUnitRecord(sourceId), actor);
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      const page = await getRecordPage(r.data.id);
      expect(page.ok).toBe(true);
      if (!page.ok) return;
      const rec = page.data.record;
      expect(rec.laserPowerW).toBeCloseTo(200, 9);
      expect(rec.scanSpeedMmPerS).toBeCloseTo(800, 9);
      expect(rec.hatchSpacingUm).toBeCloseTo(100, 9);
      expect(rec.layerThicknessUm).toBeCloseTo(30, 9);
      expect(rec.spotDiameterUm).toBeCloseTo(80, 9);
      // E_v = P/(v·h·t) = 200 / (800 · 0.1 · 0.03) = 83.33 J/mm³
      expect(rec.volumetricEnergyJMm3).toBeCloseTo(83.333, 2);
      expect(rec.alloyKey).toBe("316L");
      expect(rec.material.designation).toBe("SS316L");
      expect(rec.enteredValues.scanSpeed).toEqual({ text: "0,8", unit: "m/s", provenance: "reported" });
      expect(page.data.history.map((h) => h.action)).toEqual(["create"]);
    });

    test("FWHM spot is stored as its 1/e² diameter", async () => {
      const r = await createRecord(mixedUnitRecord(sourceId, { spotDiameter: { value: "50", unit: "µm" }, spotDefinition: "fwhm" }), actor);
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      const page = await getRecordPage(r.data.id);
      expect(page.ok && page.data.record.spotDiameterUm).toBeCloseTo(84.93, 1);
    });

    test.each([
      ["laserPower", { laserPower: { value: "abc", unit: "W" } }],
      ["scanSpeed", { scanSpeed: { value: "800", unit: "kg" } }],
      ["laserPower", { laserPower: { value: "-5", unit: "W" } }],
      ["laserPower", { laserPower: { value: "", unit: "W" } }],
      ["sourceId", { sourceId: 0 }],
    ] as const)("bad %s is a field error and writes nothing", async (field, overrides) => {
      const before = await listRecordsCount();
      const r = await createRecord({ ...mixedUnitRecord(sourceId), ...overrides }, actor);
      expect(r.ok).toBe(false);
      if (!r.ok) {
        expect(r.error.code).toBe("invalid_input");
        expect(Object.keys(r.error.details?.fieldErrors ?? {}).some((k) => k.startsWith(field))).toBe(true);
      }
      expect(await listRecordsCount()).toBe(before);
    });

    test("a record for a source that does not exist is refused", async () => {
      const r = await createRecord(mixedUnitRecord(99_999), actor);
      expect(!r.ok && r.error.details?.fieldErrors?.sourceId).toBeTruthy();
    });

    test("two people editing one record: the second save is a conflict, never a silent overwrite", async () => {
      const created = await createRecord(mixedUnitRecord(sourceId), actor);
      if (!created.ok) throw new Error(created.error.message);
      const { id, version } = created.data;
      const alice = await updateRecord({ ...mixedUnitRecord(sourceId, { laserPower: { value: "210", unit: "W" } }), id, version }, actor);
      expect(alice.ok).toBe(true);
      const bob = await updateRecord({ ...mixedUnitRecord(sourceId, { laserPower: { value: "190", unit: "W" } }), id, version }, actor);
      expect(bob.ok).toBe(false);
      if (!bob.ok) expect(bob.error.code).toBe("conflict");
      const page = await getRecordPage(id);
      expect(page.ok && page.data.record.laserPowerW).toBe(210);
      expect(page.ok && page.data.history.map((h) => h.action)).toEqual(["create", "update"]);
    });

    test("rejecting keeps the record, needs a reason, and is audited", async () => {
      const created = await createRecord(mixedUnitRecord(sourceId), actor);
      if (!created.ok) throw new Error(created.error.message);
      const noReason = await rejectRecord({ id: created.data.id, version: created.data.version, reason: "" }, actor);
      expect(!noReason.ok && noReason.error.details?.fieldErrors?.reason).toBeTruthy();
      const r = await rejectRecord({ id: created.data.id, version: created.data.version, reason: "Values copied from the wrong table" }, actor);
      expect(r.ok).toBe(true);
      const page = await getRecordPage(created.data.id);
      expect(page.ok && page.data.record.status).toBe("rejected");
      expect(page.ok && page.data.history.at(-1)?.reason).toBe("Values copied from the wrong table");
    });
  });

  describe("bulk insert", () => {
    test("one bad row refuses the whole batch, naming row and field", async () => {
      const before = await listRecordsCount();
      const rows = [mixedUnitRecord(sourceId), mixedUnitRecord(sourceId, { scanSpeed: { value: "fast", unit: "mm/s" } }), mixedUnitRecord(sourceId)];
      const r = await insertRecordsBulk(rows, actor);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.error.details?.rowErrors).toEqual([expect.objectContaining({ row: 2, field: "scanSpeed" })]);
      expect(await listRecordsCount()).toBe(before);
    });

    test("with excludeErrors, good rows are written and bad ones reported", async () => {
      const before = await listRecordsCount();
      const rows = [mixedUnitRecord(sourceId), mixedUnitRecord(sourceId, { scanSpeed: { value: "fast", unit: "mm/s" } })];
      const r = await insertRecordsBulk(rows, actor, { excludeErrors: true, importFile: "table.csv" });
      expect(r.ok).toBe(true);
      if (r.ok) {
        expect(r.data.ids).toHaveLength(1);
        expect(r.data.excluded.map((e) => e.row)).toEqual([2]);
      }
      expect(await listRecordsCount()).toBe(before + 1);
    });
  });

  describe("bulk insert, many rows", () => {
    test("ids come back in row order across several multi-row statements, each row with its own author time", async () => {
      const n = POSTGRES_INSERT_ROWS * 2 + 321;
      const base = Date.parse("2026-11-30T08:00:00.000Z");
      const rows = Array.from({ length: n }, (_, i) => mixedUnitRecord(sourceId, { locationPage: i + 1 }));
      const r = await insertRecordsBulk(rows, actor, { deferChecks: true, rowMeta: (i) => ({ actorId: actor.id, at: new Date(base + i * 1000) }) });
      if (!r.ok) throw new Error(r.error.message);
      expect(r.data.rows).toEqual(rows.map((_, i) => i + 1));
      const stored = await sql().all<{ id: number; locationPage: number; createdAt: string }>(
        `SELECT "id", "locationPage", "createdAt" FROM "BuildRecord" WHERE "id" >= ? AND "id" <= ? ORDER BY "id"`,
        [Math.min(...r.data.ids), Math.max(...r.data.ids)],
      );
      const byId = new Map(stored.map((s) => [s.id, s]));
      expect(byId.size).toBe(n);
      r.data.ids.forEach((id, i) => {
        expect(byId.get(id)?.locationPage).toBe(i + 1);
        expect(byId.get(id)?.createdAt).toBe(new Date(base + i * 1000).toISOString());
      });
    });
  });

  describe("records table query", () => {
    test("filters, sorts and pages on the server", async () => {
      const page = await listRecords({ alloy: ["316L"], sort: "laserPowerW", direction: "desc", pageSize: 2, page: 0 });
      expect(page.ok).toBe(true);
      if (!page.ok) return;
      expect(page.data.rows.length).toBeLessThanOrEqual(2);
      expect(page.data.total).toBeGreaterThanOrEqual(page.data.rows.length);
      const powers = page.data.rows.map((r) => r.laserPowerW ?? 0);
      expect([...powers].sort((a, b) => b - a)).toEqual(powers);
    });

    test("range filter in canonical units", async () => {
      // 0,21 kW is 210 W
      const written = await insertRecordsBulk([mixedUnitRecord(sourceId, { laserPower: { value: "0,21", unit: "kW" } })], actor, { deferChecks: true });
      expect(written.ok).toBe(true);
      const page = await listRecords({ ranges: { laserPowerW: { min: 205, max: 215 } } });
      expect(page.ok && page.data.rows.every((r) => r.laserPowerW! >= 205 && r.laserPowerW! <= 215)).toBe(true);
      expect(page.ok && page.data.total).toBeGreaterThanOrEqual(1);
    });

    test("min above max is a clear message", async () => {
      const page = await listRecords({ ranges: { laserPowerW: { min: 300, max: 100 } } });
      expect(!page.ok && page.error.message).toMatch(/filters/);
    });
  });
});
