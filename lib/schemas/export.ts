import { z } from "zod";
import { parseSplitSpec } from "../domain/export/splits";
import { BALANCE_METHODS, FEATURE_GROUPS, LABEL_SCHEMES, type ExportOptions } from "../domain/export/types";
import { MAX_ROW_ID } from "./ids";

/** An export run's name: lower-case letters, digits, dot, dash and underscore; safe as a folder name and in a URL. */
export const EXPORT_NAME_PATTERN = /^[a-z0-9][a-z0-9._-]{0,79}$/;
/** The files an export can hold; the download route serves nothing else. */
export const EXPORT_FILE_PATTERN = /^(train|validation|test|folds)\.(csv|parquet)$|^DATASHEET\.md$|^manifest\.json$/;

const listOf = <T extends z.ZodTypeAny>(item: T) =>
  z.preprocess((v) => (v === undefined || v === null || v === "" ? [] : Array.isArray(v) ? v : String(v).split(",").map((s) => s.trim()).filter(Boolean)), z.array(item));

const optionalNumber = (schema: z.ZodNumber) => z.preprocess((v) => (v === "" || v === undefined || v === null ? null : Number(v)), schema.nullable());
const day = z.preprocess((v) => (v === "" || v === undefined ? null : v), z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date as YYYY-MM-DD.").nullable());
const flag = z.preprocess((v) => v === true || v === "true" || v === "on" || v === "1", z.boolean());

/**
 * An export as a form, the CLI or the API asks for it (text or JSON). Defaults: accepted records,
 * binary label at 99 %, every feature group, no balancing, source split 0.7/0.15/0.15, seed 1.
 */
export const exportRequestSchema = z
  .object({
    name: z.preprocess((v) => (v === "" ? undefined : v), z.string().trim().toLowerCase().regex(EXPORT_NAME_PATTERN, "Use 1–80 lower-case letters, digits, '.', '-' or '_', starting with a letter or digit.").optional()),
    label: z.enum(LABEL_SCHEMES, { message: "Choose binary, multiclass or density." }).default("binary"),
    densityThreshold: z.coerce.number({ message: "Enter a number." }).min(50, "At least 50 %.").max(100, "At most 100 %.").default(99),
    balance: z.enum(BALANCE_METHODS, { message: "Choose none, weights, over, under, smote or gaussian." }).default("none"),
    k: z.coerce.number({ message: "Enter a whole number." }).int("Enter a whole number.").min(1, "At least 1.").max(50, "At most 50.").default(5),
    maxSyntheticMultiple: z.coerce.number({ message: "Enter a number." }).positive("Above 0.").max(1000, "At most 1000.").default(5),
    split: z.string().trim().default("source:0.7,0.15,0.15"),
    features: listOf(z.enum(FEATURE_GROUPS, { message: `Feature groups are ${FEATURE_GROUPS.join(", ")}.` })).default([...FEATURE_GROUPS]),
    minQuality: optionalNumber(z.number({ message: "Enter a number from 0 to 1." }).min(0, "From 0 to 1.").max(1, "From 0 to 1.")).default(null),
    includeUnreviewed: flag.default(false),
    alloys: listOf(z.string().min(1).max(100)).default([]),
    sources: listOf(z.coerce.number({ message: "Source ids are whole numbers." }).int().positive().max(MAX_ROW_ID, { message: "Source ids are whole numbers up to 2,147,483,647." })).default([]),
    enteredFrom: day.default(null),
    enteredTo: day.default(null),
    seed: z.coerce.number({ message: "Enter a whole number." }).int("Enter a whole number.").min(0, "From 0 to 4294967295.").max(4_294_967_295, "From 0 to 4294967295.").default(1),
  })
  .superRefine((r, ctx) => {
    const s = parseSplitSpec(r.split);
    if (!s.ok) ctx.addIssue({ code: "custom", path: ["split"], message: s.message });
    if (r.features.length === 0) ctx.addIssue({ code: "custom", path: ["features"], message: "Choose at least one feature group." });
    if (r.enteredFrom && r.enteredTo && r.enteredFrom > r.enteredTo) ctx.addIssue({ code: "custom", path: ["enteredTo"], message: "The end date is before the start date." });
    if (r.label === "density" && r.balance !== "none") ctx.addIssue({ code: "custom", path: ["balance"], message: "Balancing needs classes; relative density is a regression label. Choose none." });
  });

export type ExportRequest = z.output<typeof exportRequestSchema>;

/**
 * The core's options from a parsed request.
 *
 * @example toExportOptions(exportRequestSchema.parse({ seed: 7 })).split; // { kind: "source", train: 0.7, … }
 */
export function toExportOptions(r: ExportRequest): ExportOptions {
  const split = parseSplitSpec(r.split);
  if (!split.ok) throw new RangeError(`toExportOptions: ${split.message}`);
  return {
    filters: { includeUnreviewed: r.includeUnreviewed, minQuality: r.minQuality, alloys: [...new Set(r.alloys)].sort(), sourceIds: [...new Set(r.sources)].sort((a, b) => a - b), enteredFrom: r.enteredFrom, enteredTo: r.enteredTo },
    label: { scheme: r.label, densityThresholdPct: r.densityThreshold },
    features: FEATURE_GROUPS.filter((g) => r.features.includes(g)),
    balance: { method: r.balance, k: r.k, maxSyntheticMultiple: r.maxSyntheticMultiple },
    split: split.spec,
    seed: r.seed,
  };
}

/**
 * A request that gives these options again (for re-running a saved export).
 *
 * @example toExportOptions(requestFromOptions(o)); // deep-equal to o
 */
export function requestFromOptions(o: ExportOptions): Omit<ExportRequest, "name"> {
  return {
    label: o.label.scheme,
    densityThreshold: o.label.densityThresholdPct,
    balance: o.balance.method,
    k: o.balance.k,
    maxSyntheticMultiple: o.balance.maxSyntheticMultiple,
    split: o.split.kind === "source" ? `source:${o.split.train},${o.split.validation},${o.split.test}` : `folds:${o.split.k}`,
    features: [...o.features],
    minQuality: o.filters.minQuality,
    includeUnreviewed: o.filters.includeUnreviewed,
    alloys: [...o.filters.alloys],
    sources: [...o.filters.sourceIds],
    enteredFrom: o.filters.enteredFrom,
    enteredTo: o.filters.enteredTo,
    seed: o.seed,
  };
}
