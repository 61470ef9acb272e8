import { z } from "zod";
import { MAX_ROW_ID, rowIdSchema } from "./ids";

export const SOURCE_KINDS = ["journal_article", "conference_paper", "thesis", "preprint", "report", "shop_trial"] as const;
export const DENSITY_METHODS = ["archimedes", "ct", "image_analysis", "other", "unknown"] as const;
export const OUTCOME_EVIDENCE = ["micrographs", "density_only", "statement_only"] as const;
export const SPOT_DEFINITIONS = ["one_over_e2", "d4sigma", "fwhm", "unstated"] as const;

export type SourceKind = (typeof SOURCE_KINDS)[number];

export const SOURCE_KIND_LABEL: Record<SourceKind, string> = {
  journal_article: "Journal article",
  conference_paper: "Conference paper",
  thesis: "Thesis",
  preprint: "Preprint",
  report: "Report",
  shop_trial: "Documented shop trial",
};

export const DENSITY_METHOD_LABEL: Record<(typeof DENSITY_METHODS)[number], string> = {
  archimedes: "Archimedes (ASTM B962)",
  ct: "X-ray CT",
  image_analysis: "Image analysis of cross-sections",
  other: "Other",
  unknown: "Not stated",
};

export const OUTCOME_EVIDENCE_LABEL: Record<(typeof OUTCOME_EVIDENCE)[number], string> = {
  micrographs: "Micrographs shown",
  density_only: "Density values only",
  statement_only: "Statement only",
};

export const SPOT_DEFINITION_LABEL: Record<(typeof SPOT_DEFINITIONS)[number], string> = {
  one_over_e2: "1/e² diameter",
  d4sigma: "D4σ (second-moment) diameter",
  fwhm: "FWHM diameter",
  unstated: "Not stated",
};

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, { message: `Keep this under ${max} characters.` })
    .nullish()
    .transform((v) => (v ? v : null));

const checkbox = z.preprocess((v) => v === true || v === "true" || v === "on" || v === "1", z.boolean());

/** What a user enters for a source (form, CLI, importer). DOI is normalized by the server. */
export const sourceInputSchema = z.object({
  kind: z.enum(SOURCE_KINDS, { message: "Choose what kind of source this is." }),
  title: z.string().trim().min(3, { message: "Enter the title (at least 3 characters)." }).max(500),
  authors: z
    .union([z.array(z.string()), z.string()])
    .nullish()
    .transform((v) => (Array.isArray(v) ? v : (v ?? "").split(/;|\n/)).map((a) => a.trim()).filter(Boolean))
    .pipe(z.array(z.string().max(200)).max(200)),
  year: z.preprocess(
    (v) => (v === "" || v === null || v === undefined ? null : Number(v)),
    z.number({ message: "Enter the year as four digits, e.g. 2021." }).int().min(1950, { message: "Enter a year from 1950 on." }).max(2100, { message: "Enter a year before 2100." }).nullable(),
  ),
  venue: optionalText(300),
  doi: optionalText(300),
  url: z
    .string()
    .trim()
    .max(1000)
    .nullish()
    .transform((v) => (v ? v : null))
    .refine((v) => v === null || /^https?:\/\/\S+$/i.test(v), { message: "Enter a web address starting with http:// or https://." }),
  notes: optionalText(5000),
  densityMethod: z.enum(DENSITY_METHODS).default("unknown"),
  outcomeEvidence: z.enum(OUTCOME_EVIDENCE).default("statement_only"),
  machineStated: checkbox.default(false),
  spotSizeDefinition: z.enum(SPOT_DEFINITIONS).nullable().default(null),
  powderReported: checkbox.default(false),
  atmosphereReported: checkbox.default(false),
});

export type SourceInput = z.input<typeof sourceInputSchema>;
export type SourceValues = z.output<typeof sourceInputSchema>;

/** Updating a source: the same fields plus the version the editor saw (optimistic locking). */
export const sourceUpdateSchema = sourceInputSchema.extend({
  id: rowIdSchema,
  version: z.coerce.number().int().positive({ message: "The form lost its version; reload the page." }).max(MAX_ROW_ID, { message: "Ids and versions are whole numbers up to 2,147,483,647." }),
});
export type SourceUpdateInput = z.input<typeof sourceUpdateSchema>;
