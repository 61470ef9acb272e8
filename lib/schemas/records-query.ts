import { z } from "zod";
import { OUTCOMES } from "../domain/outcomes";
import { RECORD_STATUSES } from "./record";
import { rowIdSchema } from "./ids";

/** Columns the records table can sort by, mapped to database columns by the db layer. */
export const RECORD_SORT_KEYS = [
  "id", "alloyKey", "sourceId", "laserPowerW", "scanSpeedMmPerS", "hatchSpacingUm", "layerThicknessUm",
  "spotDiameterUm", "volumetricEnergyJMm3", "relativeDensityPct", "outcome", "status", "qualityScore", "updatedAt",
] as const;
export type RecordSortKey = (typeof RECORD_SORT_KEYS)[number];

/** Numeric columns a range filter applies to. */
export const RECORD_RANGE_KEYS = [
  "laserPowerW", "scanSpeedMmPerS", "hatchSpacingUm", "layerThicknessUm", "spotDiameterUm", "volumetricEnergyJMm3", "relativeDensityPct",
] as const;
export type RecordRangeKey = (typeof RECORD_RANGE_KEYS)[number];

const list = <T extends readonly [string, ...string[]]>(values: T) =>
  z.preprocess((v) => (v === undefined || v === "" ? [] : Array.isArray(v) ? v : String(v).split(",")), z.array(z.enum(values)));

const numberOrNull = z.preprocess((v) => (v === "" || v === undefined || v === null ? null : Number(v)), z.number({ message: "Enter a number." }).finite().nullable());

/** Filters, sort and page of the records table; the same shape for the API, the page and the CLI. */
export const recordsQuerySchema = z
  .object({
    alloy: z.preprocess((v) => (v === undefined || v === "" ? [] : Array.isArray(v) ? v : String(v).split(",")), z.array(z.string().trim().min(1).max(100))),
    sourceId: z.preprocess((v) => (v === undefined || v === "" ? [] : Array.isArray(v) ? v : String(v).split(",")), z.array(rowIdSchema)),
    status: list(RECORD_STATUSES),
    outcome: list(OUTCOMES),
    ranges: z.partialRecord(z.enum(RECORD_RANGE_KEYS), z.object({ min: numberOrNull.default(null), max: numberOrNull.default(null) })).default({}),
    search: z.string().trim().max(200).optional(),
    sort: z.enum(RECORD_SORT_KEYS).default("id"),
    direction: z.enum(["asc", "desc"]).default("asc"),
    page: z.coerce.number().int().min(0).default(0),
    pageSize: z.coerce.number().int().min(1).max(1000).default(100),
  })
  .superRefine((q, ctx) => {
    for (const [key, range] of Object.entries(q.ranges)) {
      if (range && range.min !== null && range.max !== null && range.min > range.max) {
        ctx.addIssue({ code: "custom", path: ["ranges", key], message: "The minimum is above the maximum: swap them." });
      }
    }
  });

export type RecordsQueryInput = z.input<typeof recordsQuerySchema>;
export type RecordsQuery = z.output<typeof recordsQuerySchema>;
