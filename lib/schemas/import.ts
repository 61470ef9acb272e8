import { z } from "zod";
import { CSV_DELIMITERS } from "../domain/csv";
import { PASTE_SPLITTERS } from "../domain/table-text";
import { MAX_ROW_ID } from "./ids";

const sha256 = z.string().regex(/^[0-9a-f]{64}$/, { message: "Upload the file again: its reference is not valid." });
const optionalId = z.preprocess((v) => (v === "" || v === null || v === undefined ? null : Number(v)), z.number().int().positive().max(MAX_ROW_ID).nullable());

/** Where an import's rows come from, as the import page sends it. */
export const importTableSchema = z.discriminatedUnion("kind", [
  z.object({
    kind: z.literal("file"),
    sha256,
    fileName: z.string().trim().min(1).max(200),
    format: z.enum(["csv", "xlsx"]),
    sheet: z.string().max(200).nullish().transform((v) => v || null),
    delimiter: z.enum(CSV_DELIMITERS).nullish().transform((v) => v ?? null),
  }),
  z.object({
    kind: z.literal("paste"),
    text: z.string().max(900_000, { message: "Paste at most about 900,000 characters; import longer tables as a file." }),
    splitter: z.enum(PASTE_SPLITTERS).default("auto"),
  }),
  z.object({
    kind: z.literal("pdf_table"),
    rows: z.array(z.array(z.string().max(1000)).max(200)).min(1).max(10_000),
    page: z.number().int().positive().max(MAX_ROW_ID),
    box: z.object({ x: z.number().finite(), y: z.number().finite(), width: z.number().finite(), height: z.number().finite() }),
    fileName: z.string().trim().min(1).max(200),
    label: z.string().max(60).nullish().transform((v) => v || null),
  }),
]);
export type ImportTableRequest = z.output<typeof importTableSchema>;

/** A preview or commit request: the table, the mapping (checked by the server), the source. */
export const importRequestSchema = z.object({
  table: importTableSchema,
  mapping: z.unknown().nullable().default(null),
  sourceId: optionalId.default(null),
  sourceDoi: z.string().trim().max(300).nullish().transform((v) => v || null),
  excludeErrors: z.boolean().default(false),
});
export type ImportRequest = z.input<typeof importRequestSchema>;
