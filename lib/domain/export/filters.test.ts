import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { exampleRecords } from "./example-records";
import { applyFilters, dropReason, DROP_REASONS } from "./filters";
import type { ExportFilters } from "./types";

const open: ExportFilters = { includeUnreviewed: false, minQuality: null, alloys: [], sourceIds: [], enteredFrom: null, enteredTo: null };
const rec = { status: "accepted", alloyKey: "316L", sourceId: 3, createdAt: "2026-03-05T10:00:00.000Z", qualityScore: 0.6 };

describe("dropReason", () => {
  test.each<[string, Partial<typeof rec>, Partial<ExportFilters>, string | null]>([
    ["accepted passes", {}, {}, null],
    ["awaiting review is out by default", { status: "needs_review" }, {}, "status"],
    ["awaiting review is in on request", { status: "needs_review" }, { includeUnreviewed: true }, null],
    ["rejected never enters", { status: "rejected" }, { includeUnreviewed: true }, "status"],
    ["other alloy", {}, { alloys: ["IN718"] }, "alloy"],
    ["other source", {}, { sourceIds: [4] }, "source"],
    ["entered before the range", {}, { enteredFrom: "2026-03-06" }, "date"],
    ["entered on the last day", {}, { enteredTo: "2026-03-05" }, null],
    ["below the quality", {}, { minQuality: 0.7 }, "quality"],
    ["not scored with a quality filter", { qualityScore: null }, { minQuality: 0.1 }, "quality"] as never,
  ])("%s", (_, r, f, expected) => {
    expect(dropReason({ ...rec, ...r } as typeof rec, { ...open, ...f })).toBe(expected);
  });
});

test("every record is kept or counted under exactly one reason", () => {
  const records = exampleRecords(300, 8, 5).map((r, i) => ({ ...r, status: ["accepted", "needs_review", "rejected", "draft"][i % 4]! }));
  fc.assert(
    fc.property(
      fc.record({
        includeUnreviewed: fc.boolean(),
        minQuality: fc.option(fc.double({ min: 0, max: 1, noNaN: true })),
        alloys: fc.subarray(["316L", "IN718", "Ti-6Al-4V"]),
        sourceIds: fc.subarray([1, 2, 3, 4, 5, 6, 7, 8]),
        enteredFrom: fc.option(fc.constantFrom("2026-03-03", "2026-03-10")),
        enteredTo: fc.option(fc.constantFrom("2026-03-12", "2026-03-27")),
      }),
      (f) => {
        const r = applyFilters(records, f);
        const droppedTotal = DROP_REASONS.reduce((s, k) => s + r.dropped[k], 0);
        expect(r.kept.length + droppedTotal).toBe(records.length);
        for (const k of r.kept) expect(dropReason(k, f)).toBeNull();
      },
    ),
    { numRuns: 60 },
  );
});
