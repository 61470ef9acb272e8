import { z } from "zod";
import { parseQuantityList, parseQuantityRange, type QuantityRange } from "../domain/quantity-range";
import { MAX_SHOP_PLANES } from "../domain/suggestions";
import { parseQuantity, checkHardLimit, type Quantity } from "../domain/units";
import { RECORD_STATUSES } from "./record";

/** Statuses counted unless the user chooses: everything that is not rejected or merged away. */
export const DEFAULT_COVERAGE_STATUSES = ["draft", "needs_review", "accepted"] as const;

/**
 * A filter given as one value matches within the near-duplicate tolerance of DOMAIN.md (h and t
 * ±1 µm, d ±2 µm), so "30um" also finds 30.48 µm (1.2 mil) entered in another unit.
 */
export const SINGLE_VALUE_TOLERANCE_UM: Partial<Record<Quantity, number>> = { hatchSpacing: 1, layerThickness: 1, spotDiameter: 2 };

export interface RangeFilter extends QuantityRange {
  /** As typed, for showing the filter back. */
  text: string;
}

const blankToUndefined = (v: unknown) => (v === null || v === undefined || (typeof v === "string" && v.trim() === "") ? undefined : v);

/** An optional range filter typed as text: "80-120um", "30um", "80-". */
function rangeFilter(quantity: Quantity) {
  return z.preprocess(
    blankToUndefined,
    z
      .string()
      .trim()
      .max(100)
      .optional()
      .transform((text, ctx): RangeFilter | null => {
        if (text === undefined) return null;
        const r = parseQuantityRange(text, quantity);
        if (!r.ok) {
          ctx.addIssue({ code: "custom", message: r.message });
          return z.NEVER;
        }
        const { min, max } = r.range;
        const tol = SINGLE_VALUE_TOLERANCE_UM[quantity];
        if (tol !== undefined && min !== null && min === max) return { min: min - tol, max: max + tol, text };
        return { min, max, text };
      }),
  );
}

/** A machine or grid range that must have both ends: "50-400W". */
function closedRange(quantity: Quantity, what: string, required: boolean) {
  const inner = z
    .string()
    .trim()
    .max(100)
    .optional()
    .transform((text, ctx): { min: number; max: number; text: string } | null => {
      if (text === undefined) {
        if (required) ctx.addIssue({ code: "custom", message: `Give the ${what} as MIN-MAX with a unit.` });
        return null;
      }
      const r = parseQuantityRange(text, quantity);
      if (!r.ok) {
        ctx.addIssue({ code: "custom", message: r.message });
        return z.NEVER;
      }
      const { min, max } = r.range;
      if (min === null || max === null || !(min < max)) {
        ctx.addIssue({ code: "custom", message: `Give the ${what} as MIN-MAX with a unit, the minimum below the maximum (got '${text}').` });
        return z.NEVER;
      }
      return { min, max, text };
    });
  return z.preprocess(blankToUndefined, inner);
}

/** One optional value with a unit: "100um". */
function singleValue(quantity: Quantity) {
  return z.preprocess(
    blankToUndefined,
    z
      .string()
      .trim()
      .max(64)
      .optional()
      .transform((text, ctx): number | null => {
        if (text === undefined) return null;
        const r = parseQuantity(text, quantity);
        const problem = r.ok ? checkHardLimit(r.value, quantity) : r.message;
        if (problem) {
          ctx.addIssue({ code: "custom", message: problem });
          return z.NEVER;
        }
        return r.ok ? r.value : z.NEVER;
      }),
  );
}

/** Values the shop can run: "80, 100, 120um". */
function valueList(quantity: Quantity, what: string) {
  return z.preprocess(
    blankToUndefined,
    z
      .string({ message: `Give the ${what}, e.g. 100um.` })
      .trim()
      .max(200)
      .transform((text, ctx): number[] => {
        const r = parseQuantityList(text, quantity);
        if (!r.ok) {
          ctx.addIssue({ code: "custom", message: r.message });
          return z.NEVER;
        }
        return r.values;
      }),
  );
}

const statusList = z
  .preprocess((v) => (v === undefined || v === null || v === "" ? [] : Array.isArray(v) ? v : String(v).split(",")), z.array(z.enum(RECORD_STATUSES, { message: `Status is one of ${RECORD_STATUSES.join(", ")}.` })))
  .transform((list) => (list.length ? [...new Set(list)] : [...DEFAULT_COVERAGE_STATUSES]));

const wholeNumber = (min: number, max: number, fallback: number, what: string) =>
  z.preprocess(
    blankToUndefined,
    z.coerce
      .number({ message: `${what} is a whole number.` })
      .int({ message: `${what} is a whole number.` })
      .min(min, { message: `${what} is at least ${min}.` })
      .max(max, { message: `${what} is at most ${max}.` })
      .default(fallback),
  );

export const AXIS_SCALE_CHOICES = ["auto", "linear", "log"] as const;
const scaleChoice = z.preprocess(blankToUndefined, z.enum(AXIS_SCALE_CHOICES, { message: "Scale is auto, linear or log." }).default("auto"));

const alloyChoice = z.preprocess(
  blankToUndefined,
  z
    .string()
    .trim()
    .max(100)
    .optional()
    .transform((v) => (v === undefined || v.toLowerCase() === "all" ? null : v)),
);

/** The grid shared by the coverage view and the suggestions. */
const gridFields = {
  k: wholeNumber(1, 1000, 3, "k"),
  powerBins: wholeNumber(2, 60, 12, "The number of power bins"),
  speedBins: wholeNumber(2, 60, 12, "The number of speed bins"),
  powerScale: scaleChoice,
  speedScale: scaleChoice,
};

/**
 * The coverage view: which records (alloy or all, status, hatch, layer and spot ranges), the grid
 * over the power–speed plane (range, bins and scale of each axis, k), and optionally the hatch,
 * layer and spot the process window is drawn for. The same shape for the page, the API and the CLI.
 */
export const coverageQuerySchema = z.object({
  alloy: alloyChoice,
  status: statusList,
  hatch: rangeFilter("hatchSpacing"),
  layer: rangeFilter("layerThickness"),
  spot: rangeFilter("spotDiameter"),
  power: closedRange("laserPower", "power range of the grid", false),
  speed: closedRange("scanSpeed", "speed range of the grid", false),
  windowHatch: singleValue("hatchSpacing"),
  windowLayer: singleValue("layerThickness"),
  windowSpot: singleValue("spotDiameter"),
  ...gridFields,
});

export type CoverageQueryInput = z.input<typeof coverageQuerySchema>;
export type CoverageQuery = z.output<typeof coverageQuerySchema>;

/**
 * A request for suggested experiments: the alloy, how many, the seed, the machine's limits (power
 * and speed ranges, the hatch and layer values it can run, its spot) and the grid.
 */
export const suggestionRequestSchema = z
  .object({
    alloy: z.preprocess(blankToUndefined, z.string({ message: "Choose the alloy the experiments are for." }).trim().min(1).max(100)),
    n: wholeNumber(1, 200, 12, "The number of suggestions"),
    seed: z.preprocess(blankToUndefined, z.coerce.number({ message: "The seed is a whole number." }).int({ message: "The seed is a whole number." }).min(0, { message: "The seed is 0 or more." }).max(2 ** 31 - 1).optional()),
    power: closedRange("laserPower", "machine's power range", true),
    speed: closedRange("scanSpeed", "machine's speed range", true),
    hatch: valueList("hatchSpacing", "hatch spacings the machine can run"),
    layer: valueList("layerThickness", "layer thicknesses the machine can run"),
    spot: singleValue("spotDiameter"),
    status: statusList,
    ...gridFields,
  })
  .superRefine((r, ctx) => {
    if (r.hatch.length * r.layer.length > MAX_SHOP_PLANES) {
      ctx.addIssue({ code: "custom", path: ["hatch"], message: `At most ${MAX_SHOP_PLANES} hatch × layer combinations; you gave ${r.hatch.length} × ${r.layer.length}.` });
    }
  });

export type SuggestionRequestInput = z.input<typeof suggestionRequestSchema>;
export type SuggestionRequest = z.output<typeof suggestionRequestSchema>;
