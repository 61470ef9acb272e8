import type { z } from "zod";

/** Field path -> messages, the shape every form and API returns for bad input. */
export type FieldErrors = Record<string, string[]>;

/** Flattens zod issues into field errors keyed by dotted path ("laserPower.value"). */
export function fieldErrorsOf(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.map(String).join(".") : "_form";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}
