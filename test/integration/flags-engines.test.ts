// The flag, pair-decision and review-queue queries of lib/db on both engines with the same test:
// the batched writes of a check run (chunks of many rows on PostgreSQL), the filters and order of
// the flag list, the queue's order, and the atomic waiver. Records are written with each engine's
// own driver; flags go through the functions under test, and every expectation is worked out here.
import { beforeAll, expect, test } from "vitest";
import {
  flagFingerprint, flagsForRun, flagsOfRecords, getFlag, insertFlags, listFlags, countFlags, openFlagsOfRecord, recordsWithOpenFlagsRelatedTo,
  refreshFlags, reopenFlags, resolveFlagsAuto, reviewQueuePage, setFlagStateAudited, type FlagWrite,
} from "@/lib/db/flags";
import { distinctPairKeys, getPairDecision, insertPairDecision, pairKey } from "@/lib/db/pairs";
import { sql } from "@/lib/db/sql";
import { describeEachEngine, insertRows, type TableRows } from "../support/engines";

const AT = "2026-11-30T09:00:00.000Z";
const N = 1_300; // records: more than the 500 flags of one PostgreSQL INSERT and the 1,000 rows of one UPDATE
const TABLES: TableRows[] = [
  ["User", [{ id: 1, name: "invented reviewer", role: "reviewer" }]],
  ["Source", [{ id: 1, kind: "journal_article", title: "Invented study", titleKey: "invented study", updatedAt: AT }]],
  ["Material", [{ id: 1, designation: "316L", alloyKey: "316L", fingerprint: "m1" }]],
  ["BuildRecord", Array.from({ length: N }, (_, i) => ({ id: i + 1, sourceId: 1, materialId: 1, alloyKey: "316L", importFile: i < 5 ? "plan.csv" : null, importRow: i < 5 ? i + 1 : null, updatedAt: AT }))],
];

const write = (recordId: number, code: string, severity: string, related: number | null = null): FlagWrite => ({
  recordId, relatedRecordId: related, sourceId: 1, ruleCode: code, severity, message: `${code} on ${recordId}`, details: JSON.stringify({ inputs: { recordId } }),
  fingerprint: flagFingerprint(code, recordId, related), settingsVersion: 1,
});

describeEachEngine("flags, pairs and the queue", (current) => {
  beforeAll(async () => {
    await insertRows(current(), TABLES);
    // every record a range warning; every 10th an error too; records 2 and 3 a duplicate pair on 1
    const writes = Array.from({ length: N }, (_, i) => write(i + 1, "range.laser_power", "warning"));
    for (let id = 10; id <= N; id += 10) writes.push(write(id, "unit_slip.scan_speed", "error"));
    writes.push(write(2, "duplicate.exact", "error", 1), write(3, "duplicate.near", "warning", 1));
    await sql().transaction((tx) => insertFlags(tx, writes, AT));
  });

  test("a batch of new flags is stored whole, open, at version 1, with details and time", async () => {
    const all = await flagsOfRecords(sql(), "all");
    expect(all).toHaveLength(N + N / 10 + 2);
    const f = all.find((x) => x.fingerprint === flagFingerprint("duplicate.exact", 2, 1))!;
    expect(f).toMatchObject({ recordId: 2, relatedRecordId: 1, ruleCode: "duplicate.exact", severity: "error", state: "open", version: 1, settingsVersion: 1, details: { inputs: { recordId: 2 } }, createdAt: AT });
    expect((await flagsForRun(sql(), [10, 11])).map((r) => [r.recordId, r.ruleCode]).sort()).toEqual([[10, "range.laser_power"], [10, "unit_slip.scan_speed"], [11, "range.laser_power"]]);
    expect(await recordsWithOpenFlagsRelatedTo(sql(), [1], ["duplicate.exact", "duplicate.near"])).toEqual([2, 3]);
    expect(await recordsWithOpenFlagsRelatedTo(sql(), [1], ["duplicate.near"])).toEqual([3]);
  });

  test("refresh, reopen and automatic resolution write every row of a large batch, and leave flags that are no longer open alone", async () => {
    const ranges = (await flagsForRun(sql(), "all")).filter((f) => f.ruleCode === "range.laser_power").sort((a, b) => a.id - b.id);
    expect(ranges).toHaveLength(N);
    const waivedId = ranges[0]!.id;
    await sql().run(`UPDATE "Flag" SET "state" = 'waived', "version" = "version" + 1 WHERE "id" = ?`, [waivedId]);
    await sql().transaction(async (tx) => {
      await refreshFlags(tx, ranges.slice(1).map((f) => ({ id: f.id, write: { ...write(f.recordId!, f.ruleCode, "info"), message: `refreshed ${f.recordId}`, settingsVersion: 2 } })));
      await resolveFlagsAuto(tx, ranges.map((f, i) => ({ id: f.id, resolution: i % 2 ? "stale" : "fix", reason: i % 2 ? "the finding no longer appears" : "fixed" })), 1, 3, AT);
    });
    const after = new Map((await flagsOfRecords(sql(), "all")).map((f) => [f.id, f]));
    expect(after.get(waivedId)).toMatchObject({ state: "waived", resolution: null, version: 2 }); // not open: left alone
    const second = after.get(ranges[1]!.id)!;
    expect(second).toMatchObject({ state: "resolved", resolution: "stale", severity: "info", message: `refreshed ${ranges[1]!.recordId}`, settingsVersion: 3, resolvedById: 1, resolvedAt: AT, version: 3 });
    const resolved = ranges.slice(1).map((f) => after.get(f.id)!);
    expect(resolved.every((f) => f.state === "resolved" && f.version === 3 && f.settingsVersion === 3)).toBe(true);
    expect(resolved.filter((f) => f.resolution === "fix")).toHaveLength(Math.floor((N - 1) / 2));

    await sql().transaction((tx) => reopenFlags(tx, ranges.slice(1).map((f) => ({ id: f.id, write: write(f.recordId!, f.ruleCode, "warning") }))));
    const reopened = (await flagsOfRecords(sql(), ranges.slice(1).map((f) => f.recordId!))).filter((f) => f.ruleCode === "range.laser_power");
    expect(reopened).toHaveLength(N - 1);
    for (const f of reopened) expect(f).toMatchObject({ state: "open", resolution: null, reason: null, resolvedById: null, resolvedAt: null, severity: "warning", settingsVersion: 1, version: 4 });
  });

  test("the flag list filters by record, state, severity and code prefix (any case), worst first within a record", async () => {
    const ofTen = await listFlags(sql(), { recordId: 10 });
    expect(ofTen.map((f) => [f.ruleCode, f.severity])).toEqual([["unit_slip.scan_speed", "error"], ["range.laser_power", "warning"]]);
    expect(ofTen[0]).toMatchObject({ importFile: null, recordStatus: "needs_review", resolvedByName: null });
    const imported = await listFlags(sql(), { recordId: 2, codePrefix: "DUPLICATE." });
    expect(imported.map((f) => [f.ruleCode, f.importFile, f.importRow])).toEqual([["duplicate.exact", "plan.csv", 2]]);
    expect(await countFlags(sql(), { severity: "error", state: "open" })).toBe(N / 10 + 1);
    expect(await countFlags(sql(), { codePrefix: "range_" })).toBe(0); // "_" is literal, not a wildcard
    const page = await listFlags(sql(), { state: "open", limit: 3, offset: 1 });
    expect(page.map((f) => f.recordId)).toEqual([2, 3, 3]); // record 1 has no open flag: its one was waived above
    expect((await openFlagsOfRecord(sql(), 2)).map((f) => f.ruleCode)).toEqual(["duplicate.exact", "range.laser_power"]);
  });

  test("the queue lists records worst first, then by how many open flags, then by id", async () => {
    const { recordIds, total } = await reviewQueuePage(sql(), { offset: 0, limit: 5 });
    expect(total).toBe(N - 1); // record 1's range flag was waived above
    // errors: the duplicate on 2 (two flags), then every 10th record (two flags each)
    expect(recordIds).toEqual([2, 10, 20, 30, 40]);
    expect((await reviewQueuePage(sql(), { codePrefix: "duplicate.", offset: 0, limit: 10 })).recordIds).toEqual([2, 3]);
  });

  test("a waiver with its audit event lands at the version seen, once; at another version it writes nothing", async () => {
    const f = (await listFlags(sql(), { recordId: 3, codePrefix: "duplicate." }))[0]!;
    const audits = async () => (await sql().all<{ reason: string }>(`SELECT "reason" FROM "AuditEvent" WHERE "entityType" = 'flag' AND "entityId" = ? ORDER BY "id"`, [String(f.id)])).map((a) => a.reason);
    const waive = (version: number, reason: string) =>
      setFlagStateAudited(sql(), f.id, version, { state: "waived", resolution: "waive", reason, actorId: 1, at: AT }, { actorId: 1, actorName: "invented reviewer", action: "waive", entityType: "flag", entityId: f.id, before: { state: "open" }, after: { state: "waived" }, reason });
    expect(await waive(f.version + 1, "too new")).toBe(false);
    expect(await audits()).toEqual([]);
    const [a, b] = await Promise.all([waive(f.version, "first"), waive(f.version, "second")]);
    expect([a, b].sort()).toEqual([false, true]);
    expect(await audits()).toHaveLength(1);
    expect(await getFlag(sql(), f.id)).toMatchObject({ state: "waived", version: f.version + 1, reason: (await audits())[0], resolvedById: 1 });
    expect((await listFlags(sql(), { recordId: 3, state: "waived" }))[0]?.resolvedByName).toBe("invented reviewer");
    // a flag of a record rejected meanwhile is no longer acted on
    const [onRejected] = await listFlags(sql(), { recordId: 4, state: "open" });
    await sql().run(`UPDATE "BuildRecord" SET "status" = 'rejected' WHERE "id" = 4`);
    const late = await setFlagStateAudited(sql(), onRejected!.id, onRejected!.version, { state: "waived", resolution: "waive", reason: "late", actorId: 1, at: AT }, { actorId: 1, actorName: "invented reviewer", action: "waive", entityType: "flag", entityId: onRejected!.id, reason: "late" });
    expect(late).toBe(false);
    expect(await getFlag(sql(), onRejected!.id)).toMatchObject({ state: "open", version: onRejected!.version });
    expect(await sql().get(`SELECT "id" FROM "AuditEvent" WHERE "entityId" = ?`, [String(onRejected!.id)])).toBeUndefined();
  });

  test("pair decisions are stored once per unordered pair", async () => {
    const first = await insertPairDecision(sql(), { a: 3, b: 1, decision: "distinct", reason: "different machines", actorId: 1, at: AT });
    expect(first).toEqual(expect.any(Number));
    expect(await insertPairDecision(sql(), { a: 1, b: 3, decision: "merged", reason: null, actorId: 1, at: AT })).toBe(null);
    expect(await getPairDecision(sql(), 3, 1)).toMatchObject({ id: first, recordAId: 1, recordBId: 3, decision: "distinct", decidedAt: AT });
    expect(await distinctPairKeys(sql())).toEqual(new Set([pairKey(3, 1)]));
  });
});
