/**
 * Which records enter a training set. Every record left out is counted under the first filter
 * that left it out, so the datasheet can say where each one went and nothing disappears unseen.
 */
import type { ExportFilters, ExportRecord } from "./types";

export const DROP_REASONS = ["status", "alloy", "source", "date", "quality"] as const;
export type DropReason = (typeof DROP_REASONS)[number];

export interface FilterResult<R> {
  kept: R[];
  dropped: Record<DropReason, number>;
}

/** Statuses that can enter: accepted, and awaiting review on request. Drafts, rejected and merged records never do. */
export function allowedStatuses(filters: Pick<ExportFilters, "includeUnreviewed">): readonly string[] {
  return filters.includeUnreviewed ? ["accepted", "needs_review"] : ["accepted"];
}

/**
 * The first filter a record fails, or null when it passes them all.
 *
 * @example
 * dropReason({ status: "needs_review", ... }, { includeUnreviewed: false, ... }); // "status"
 */
export function dropReason(r: Pick<ExportRecord, "status" | "alloyKey" | "sourceId" | "createdAt" | "qualityScore">, f: ExportFilters): DropReason | null {
  if (!allowedStatuses(f).includes(r.status)) return "status";
  if (f.alloys.length && !f.alloys.includes(r.alloyKey)) return "alloy";
  if (f.sourceIds.length && !f.sourceIds.includes(r.sourceId)) return "source";
  const day = r.createdAt.slice(0, 10);
  if ((f.enteredFrom !== null && day < f.enteredFrom) || (f.enteredTo !== null && day > f.enteredTo)) return "date";
  if (f.minQuality !== null && (r.qualityScore === null || r.qualityScore < f.minQuality)) return "quality";
  return null;
}

/**
 * Applies the filters, keeping the input order.
 *
 * @example
 * applyFilters(records, { includeUnreviewed: false, minQuality: null, alloys: [], sourceIds: [], enteredFrom: null, enteredTo: null });
 * // { kept: [...accepted records], dropped: { status: 12, alloy: 0, source: 0, date: 0, quality: 0 } }
 */
export function applyFilters<R extends Pick<ExportRecord, "status" | "alloyKey" | "sourceId" | "createdAt" | "qualityScore">>(records: readonly R[], filters: ExportFilters): FilterResult<R> {
  const dropped: Record<DropReason, number> = { status: 0, alloy: 0, source: 0, date: 0, quality: 0 };
  const kept: R[] = [];
  for (const r of records) {
    const reason = dropReason(r, filters);
    if (reason === null) kept.push(r);
    else dropped[reason] += 1;
  }
  return { kept, dropped };
}

/**
 * The filters in words, for the datasheet.
 *
 * @example describeFilters(defaults); // ["status: accepted", "quality: any", ...]
 */
export function describeFilters(f: ExportFilters): string[] {
  return [
    `status: ${allowedStatuses(f).join(" or ")}`,
    `record quality: ${f.minQuality === null ? "any (including not yet scored)" : `at least ${f.minQuality}`}`,
    `alloys: ${f.alloys.length ? f.alloys.join(", ") : "all"}`,
    `sources: ${f.sourceIds.length ? f.sourceIds.join(", ") : "all"}`,
    `entered: ${f.enteredFrom ?? "any time"} to ${f.enteredTo ?? "now"}`,
  ];
}
