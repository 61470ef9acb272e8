import { z } from "zod";
import { FIGURE_QUANTITY_FIELDS } from "../domain/figure-records";
import { OUTCOMES } from "../domain/outcomes";
import { MAX_ROW_ID } from "./ids";

const finite = (message: string) => z.coerce.number({ message }).refine(Number.isFinite, { message });

const tick = z.object({
  pixel: finite("Mark the tick on the figure."),
  value: finite("Type the tick's value as a number."),
});

const axis = z.object({
  field: z.enum(FIGURE_QUANTITY_FIELDS, { message: "Choose the quantity on this axis." }),
  unit: z.string().trim().min(1, { message: "Choose the axis unit." }).max(32),
  scale: z.enum(["linear", "log"]).default("linear"),
  ticks: z.tuple([tick, tick], { message: "Mark two ticks on this axis." }),
});

const fixedValue = z.object({ value: z.union([z.string(), z.number()]).transform((v) => String(v).trim()), unit: z.string().trim().max(32).default("") });

/** A figure read into points, as the figure reader sends it to preview or commit. */
export const figureReadingSchema = z.object({
  sourceId: z.coerce.number({ message: "Choose the source this figure comes from." }).int().positive({ message: "Choose the source this figure comes from." }).max(MAX_ROW_ID, { message: "Choose the source this figure comes from." }),
  page: z.preprocess((v) => (v === "" || v === undefined ? null : v), z.coerce.number().int().positive().max(100_000).nullable()).default(null),
  figureLabel: z.string().trim().min(1, { message: 'Name the figure, e.g. "Fig. 3".' }).max(40, { message: "Keep the figure label under 40 characters." }),
  alloy: z.string().trim().max(200).default(""),
  axes: z.object({ x: axis, y: axis }),
  fixed: z.partialRecord(z.enum(FIGURE_QUANTITY_FIELDS), fixedValue).default({}),
  kinds: z
    .array(z.object({ id: z.string().trim().min(1).max(40), outcome: z.enum(OUTCOMES, { message: "Choose the outcome this marker stands for." }), legend: z.string().trim().max(200).default("") }))
    .min(1, { message: "Set an outcome for at least one marker kind." })
    .max(20),
  points: z
    .array(z.object({ pixel: z.object({ x: finite("A point needs a position."), y: finite("A point needs a position.") }), kind: z.string().trim().min(1).max(40), pixelUncertaintyPx: z.coerce.number().min(0).max(50).optional() }))
    .max(5_000, { message: "Read at most 5,000 points at a time." }),
  /** Only check and show what would be written. */
  dryRun: z.boolean().default(false),
});

export type FigureReadingInput = z.input<typeof figureReadingSchema>;
export type FigureReading = z.output<typeof figureReadingSchema>;
