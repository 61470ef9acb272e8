import { z } from "zod";
import { RECORD_QUANTITY_FIELD_NAMES, type RecordQuantityField } from "./record";
import { MAX_ROW_ID } from "./ids";

const id = z.coerce.number({ message: "Give a number." }).int().positive({ message: "Give a positive whole number." }).max(MAX_ROW_ID, { message: "Give a whole number up to 2,147,483,647." });
const optionalVersion = z.preprocess((v) => (v === "" || v === null || v === undefined ? null : v), id.nullable()).default(null);
const reason = z
  .string()
  .trim()
  .max(1000, { message: "Keep the reason under 1,000 characters." })
  .nullish()
  .transform((v) => (v ? v : null));

export const FLAG_ACTIONS = ["waive", "fix", "reject", "merge", "distinct"] as const;
export type FlagAction = (typeof FLAG_ACTIONS)[number];

/** Actions that must say why. */
export const REASON_REQUIRED: ReadonlySet<FlagAction> = new Set(["waive", "reject", "distinct"]);

/**
 * A reviewer's action on one flag. `version` is the flag version the reviewer saw and
 * `recordVersion` the record's (a fix needs it); the CLI may leave them out to act on the current
 * versions.
 */
export const flagActionSchema = z
  .object({
    flagId: id,
    version: optionalVersion,
    recordVersion: optionalVersion,
    action: z.enum(FLAG_ACTIONS, { message: `Choose an action: ${FLAG_ACTIONS.join(", ")}.` }),
    reason,
    /** For "fix": the value to enter (with its unit); the flag's suggested fix when left out. */
    fix: z
      .object({
        field: z.enum(RECORD_QUANTITY_FIELD_NAMES as [RecordQuantityField, ...RecordQuantityField[]], { message: "Choose the field to fix." }),
        value: z.union([z.string(), z.number()]).transform((v) => String(v).trim()).pipe(z.string().min(1, { message: "Enter the corrected value." }).max(64)),
        unit: z.string().trim().max(32).default(""),
      })
      .nullish()
      .transform((v) => v ?? null),
  })
  .superRefine((v, ctx) => {
    if (REASON_REQUIRED.has(v.action) && (v.reason === null || v.reason.length < 3)) {
      ctx.addIssue({ code: "custom", path: ["reason"], message: `Say why (at least 3 characters): a ${v.action} needs a reason.` });
    }
  });
export type FlagActionInput = z.input<typeof flagActionSchema>;

/** Accepting a record: allowed only when none of its error flags is open. */
export const acceptRecordSchema = z.object({ recordId: id, version: optionalVersion, reason });

/** The same action on many flags, one reason for all. */
export const bulkFlagActionSchema = z
  .object({
    items: z.array(z.object({ flagId: id, version: optionalVersion })).min(1, { message: "Select at least one flag." }).max(1000, { message: "Act on at most 1,000 flags at once." }),
    action: z.enum(["waive", "reject", "distinct", "fix"], { message: "Bulk actions are waive, reject, distinct and fix (the suggested fix)." }),
    reason,
  })
  .superRefine((v, ctx) => {
    if (REASON_REQUIRED.has(v.action) && (v.reason === null || v.reason.length < 3)) ctx.addIssue({ code: "custom", path: ["reason"], message: `Say why (at least 3 characters): a ${v.action} needs a reason.` });
  });

/** A reviewer's override of a source's quality score, or its removal (score null). */
export const sourceQualityOverrideSchema = z
  .object({
    sourceId: id,
    version: id,
    score: z.preprocess(
      (v) => (v === "" || v === null || v === undefined ? null : typeof v === "string" ? Number(v.replace(",", ".")) : v),
      z.number({ message: "Enter a score from 0 to 1." }).min(0, { message: "Enter a score from 0 to 1." }).max(1, { message: "Enter a score from 0 to 1." }).nullable(),
    ),
    reason,
  })
  .superRefine((v, ctx) => {
    if (v.score !== null && (v.reason === null || v.reason.length < 3)) ctx.addIssue({ code: "custom", path: ["reason"], message: "Say why the score is overridden (at least 3 characters)." });
  });
