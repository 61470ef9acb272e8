import { z } from "zod";
import { CHECK_SETTING_DEFS, checkSettingsProblems } from "../domain/check-settings";
import { MAX_ROW_ID } from "./ids";

const number = z.preprocess(
  (v) => (typeof v === "string" ? (v.trim() === "" ? Number.NaN : Number(v.trim().replace(",", "."))) : v),
  z.number({ message: "Enter a number." }).refine(Number.isFinite, { message: "Enter a number." }),
);

/**
 * A new version of the check settings as an editor saves it: every value (strings from a form
 * are read as numbers, a decimal comma accepted), the version the editor started from (a newer
 * saved version meanwhile is a conflict), and why it changed.
 */
export const checkSettingsInputSchema = z
  .object({
    values: z.record(z.string(), number),
    basedOnVersion: z.preprocess((v) => (v === "" || v === undefined || v === null ? null : Number(v)), z.number().int().positive().max(MAX_ROW_ID).nullable()),
    reason: z.string().trim().min(3, { message: "Say why the thresholds change (at least 3 characters)." }).max(1000),
  })
  .superRefine((input, ctx) => {
    const known = new Set(CHECK_SETTING_DEFS.map((d) => d.key));
    const complete = Object.fromEntries(CHECK_SETTING_DEFS.map((d) => [d.key, input.values[d.key] ?? d.defaultValue]));
    for (const key of Object.keys(input.values)) if (!known.has(key)) complete[key] = input.values[key]!;
    for (const [key, message] of Object.entries(checkSettingsProblems(complete))) ctx.addIssue({ code: "custom", path: ["values", key], message });
  });

export type CheckSettingsInput = z.input<typeof checkSettingsInputSchema>;
