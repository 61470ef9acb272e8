// The home overview (getDashboard: collection counts, open-flag counts, recent audit events) on
// both engines with the same test. The data is written with each engine's own driver, and the
// expected figures are counted from that same data in plain JavaScript, not by SQL.
import { beforeAll, expect, test } from "vitest";
import type { Dashboard } from "@/lib/server/dashboard";
import { getDashboard } from "@/lib/server/dashboard";
import { getFlagCounts } from "@/lib/server/flags";
import { describeEachEngine, insertRows, type TableRows } from "../support/engines";

const AT = "2026-11-30T08:00:00.000Z";
const SOURCES = [
  { id: 1, title: "Invented porosity survey, Lab of Fusion Trials" },
  { id: 2, title: "Invented keyhole threshold note" },
  { id: 3, title: "Invented source without flags" },
];
const RECORDS = [
  { id: 1, sourceId: 1, alloyKey: "316L", status: "accepted", outcome: "dense" },
  { id: 2, sourceId: 1, alloyKey: "316L", status: "needs_review", outcome: "lack_of_fusion" },
  { id: 3, sourceId: 2, alloyKey: "Ti-6Al-4V", status: "needs_review", outcome: "keyhole" },
  { id: 4, sourceId: 2, alloyKey: "Ti-6Al-4V", status: "accepted", outcome: "dense" },
  { id: 5, sourceId: 2, alloyKey: "AlSi10Mg", status: "rejected", outcome: "dense" },
  { id: 6, sourceId: 3, alloyKey: "316L", status: "accepted", outcome: "unknown" },
];
const FLAGS = [
  { id: 1, recordId: 2, sourceId: 1, ruleCode: "range.ved_low", severity: "warning", state: "open" },
  { id: 2, recordId: 3, sourceId: 2, ruleCode: "range.ved_high", severity: "warning", state: "open" },
  { id: 3, recordId: 3, sourceId: 2, ruleCode: "unit.hatch", severity: "error", state: "open" },
  { id: 4, recordId: 4, sourceId: 2, ruleCode: "range.ved_high", severity: "warning", state: "resolved" },
  { id: 5, recordId: 5, sourceId: null, ruleCode: "dup.pair", severity: "info", state: "open" },
];
const EVENTS = Array.from({ length: 14 }, (_, i) => ({ id: i + 1, action: i % 2 ? "record.update" : "record.create", entityId: String((i % 6) + 1), at: new Date(Date.parse(AT) + i * 60_000).toISOString() }));

const TABLES: TableRows[] = [
  ["Source", SOURCES.map((s) => ({ id: s.id, kind: "article", title: s.title, titleKey: s.title.toLowerCase(), updatedAt: AT }))],
  ["Material", [{ id: 1, designation: "invented", alloyKey: "mixed", fingerprint: "m1" }]],
  ["BuildRecord", RECORDS.map((r) => ({ ...r, materialId: 1, updatedAt: AT }))],
  ["Flag", FLAGS.map((f) => ({ ...f, message: `finding ${f.id}`, fingerprint: `${f.ruleCode}|${f.recordId}|` }))],
  ["AuditEvent", EVENTS.map((e) => ({ ...e, actorName: "local", entityType: "record" }))],
];

const countBy = <T>(items: T[], key: (t: T) => string) => items.reduce<Record<string, number>>((acc, t) => ((acc[key(t)] = (acc[key(t)] ?? 0) + 1), acc), {});

describeEachEngine("home overview", (current) => {
  let dashboard: Dashboard;
  beforeAll(async () => {
    await insertRows(current(), TABLES);
    const result = await getDashboard();
    if (!result.ok) throw new Error(`getDashboard failed: ${JSON.stringify(result.error)}`);
    dashboard = result.data;
  });

  test("collection counts: records, sources, by status, by outcome", () => {
    expect(dashboard.stats.records).toBe(RECORDS.length);
    expect(dashboard.stats.sources).toBe(SOURCES.length);
    expect(dashboard.stats.byStatus).toEqual(countBy(RECORDS, (r) => r.status));
    expect(dashboard.stats.byOutcome).toEqual(countBy(RECORDS, (r) => r.outcome));
  });

  test("alloys most records first, ties in alloy order, each with its statuses", () => {
    const alloys = [...new Set(RECORDS.map((r) => r.alloyKey))].sort();
    const expected = alloys
      .map((alloyKey) => {
        const mine = RECORDS.filter((r) => r.alloyKey === alloyKey);
        return { alloyKey, count: mine.length, byStatus: countBy(mine, (r) => r.status) };
      })
      .sort((a, b) => b.count - a.count);
    expect(dashboard.stats.byAlloy).toEqual(expected);
  });

  test("open flags only: by severity, by rule, and the records that carry one", () => {
    const open = FLAGS.filter((f) => f.state === "open");
    expect(dashboard.flags.bySeverity).toEqual(countBy(open, (f) => f.severity));
    expect(dashboard.flags.records).toBe(new Set(open.map((f) => f.recordId)).size);
    const rules = Object.entries(countBy(open, (f) => `${f.ruleCode}\u0000${f.severity}`))
      .map(([k, count]) => ({ ruleCode: k.split("\u0000")[0]!, severity: k.split("\u0000")[1]!, count }))
      .sort((a, b) => b.count - a.count || (a.ruleCode < b.ruleCode ? -1 : a.ruleCode > b.ruleCode ? 1 : 0));
    expect(dashboard.flags.byRule).toEqual(rules);
  });

  test("open flags by source, most first, the flags without a source first among equals, with the source's title", () => {
    const open = FLAGS.filter((f) => f.state === "open");
    const ids = [...new Set(open.map((f) => f.sourceId))];
    const expected = ids
      .map((sourceId) => ({ sourceId, title: SOURCES.find((s) => s.id === sourceId)?.title ?? null, count: open.filter((f) => f.sourceId === sourceId).length }))
      .sort((a, b) => b.count - a.count || (a.sourceId ?? -Infinity) - (b.sourceId ?? -Infinity));
    expect(dashboard.flags.bySource).toEqual(expected);
  });

  test("the twelve latest audit events, newest first, with their times", () => {
    const latest = [...EVENTS].sort((a, b) => b.id - a.id).slice(0, 12);
    expect(dashboard.recent.map((e) => ({ id: e.id, action: e.action, entityId: e.entityId, at: e.at.toISOString() }))).toEqual(
      latest.map((e) => ({ id: e.id, action: e.action, entityId: e.entityId, at: e.at })),
    );
  });

  test("the flag counts use case gives the same counts as the overview", async () => {
    const result = await getFlagCounts();
    expect(result).toEqual({ ok: true, data: dashboard.flags });
  });
});
