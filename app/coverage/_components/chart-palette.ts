/**
 * Colours of the coverage charts, beside the outcome palette they extend (app/_components/palette.ts).
 *
 * The count ramp is one hue (the interface's teal) in steps of lightness only, so it reads the same
 * under every colour-vision deficiency and in greyscale; the darkest step holds white text at
 * ≥ 4.5:1. Boundary lines darken the outcome hues of their mechanism to ≥ 3:1 against white and
 * carry their own dash pattern, so no line depends on its colour.
 */
import { OUTCOME_COLOURS } from "../../_components/palette";

/** Empty first, then five steps from light to dark. */
export const COUNT_RAMP = ["#ffffff", "#dcecea", "#aed3ce", "#72b0a8", "#35857c", "#0b554f"] as const;

/** Text colour on each ramp step. */
export const COUNT_TEXT = ["#9b1c1c", "#1b2128", "#1b2128", "#1b2128", "#ffffff", "#ffffff"] as const;

export const MECHANISM_LINES = {
  lack_of_fusion: { label: "lack-of-fusion boundary", colour: "#a33a82", dash: "7 4" },
  keyhole: { label: "keyhole boundary", colour: "#a8520c", dash: "" },
  balling: { label: "balling boundary", colour: "#6f5b00", dash: "2 3" },
} as const;

/** The window's fill on the scatter plot, and the hatching of cells outside it. */
export const WINDOW_FILL = "#e3f1ef";
export const OUTSIDE_HATCH = "#8d96a0";

/** Suggested experiments: a dark star, unlike every outcome symbol. */
export const SUGGESTION_MARK = "#1b2128";

/** Each outcome's symbol, so colour is never the only cue. */
export const OUTCOME_SYMBOLS: Record<keyof typeof OUTCOME_COLOURS, string> = {
  dense: "circle",
  keyhole: "triangle",
  lack_of_fusion: "square",
  balling: "diamond",
  cracking: "cross",
  other: "wye",
  unknown: "circle",
};

export const BAR_FILL = "#0e6a63";
