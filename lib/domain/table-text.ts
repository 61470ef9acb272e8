/**
 * Splitting a table pasted as text (copied from a spreadsheet or from a PDF viewer) into rows and
 * cells. Spreadsheets put tabs between cells; PDF viewers usually give runs of spaces, sometimes
 * single spaces. Decimal commas stay inside their cell: "0,1" is one value, never two cells.
 */

export const PASTE_SPLITTERS = ["auto", "tab", "spaces", "whitespace", "semicolon", "comma", "pipe"] as const;
export type PasteSplitter = (typeof PASTE_SPLITTERS)[number];

export interface SplitTable {
  /** Rows of trimmed cells, blank lines removed, every row padded to the widest row. */
  rows: string[][];
  /** The splitter used (the one detected when "auto" was asked for). */
  splitter: Exclude<PasteSplitter, "auto">;
}

const SPLIT: Record<Exclude<PasteSplitter, "auto">, RegExp> = {
  tab: /\t/,
  spaces: / {2,}|\t/,
  whitespace: /\s+/,
  semicolon: /;/,
  // a comma is a cell separator only when not between two digits (a decimal comma)
  comma: /,(?!\d)|(?<!\d),/,
  pipe: /\|/,
};

function lines(text: string): string[] {
  return text
    .replace(/^\uFEFF/, "")
    .split(/\r\n|\r|\n/)
    .map((l) => l.replace(/\u00A0/g, " "))
    .filter((l) => l.trim() !== "");
}

/** Share of lines in which `pattern` occurs. */
function share(ls: readonly string[], pattern: RegExp): number {
  if (!ls.length) return 0;
  return ls.filter((l) => pattern.test(l.trim())).length / ls.length;
}

function detect(ls: readonly string[]): Exclude<PasteSplitter, "auto"> {
  if (share(ls, /\t/) >= 0.5) return "tab";
  if (share(ls, /;/) >= 0.8) return "semicolon";
  if (share(ls, /\|/) >= 0.8) return "pipe";
  if (share(ls, / {2,}/) >= 0.5) return "spaces";
  return "whitespace";
}

function splitLine(line: string, splitter: Exclude<PasteSplitter, "auto">): string[] {
  const trimmed = splitter === "tab" ? line.replace(/^[\r\n]+|[\r\n]+$/g, "") : line.trim();
  let cells = trimmed.split(SPLIT[splitter]).map((c) => c.trim());
  if (splitter === "pipe") {
    // Markdown-style tables: leading and trailing pipes frame the row
    if (cells[0] === "") cells = cells.slice(1);
    if (cells[cells.length - 1] === "") cells = cells.slice(0, -1);
  }
  return cells;
}

/**
 * Splits pasted text into rows and cells. With "auto" the splitter is chosen from the text: tabs
 * when most lines have them (a spreadsheet copy), else semicolons or pipes when nearly every line
 * has them, else runs of two or more spaces (a PDF copy that kept the alignment), else any
 * whitespace. Blank lines are dropped and short rows are padded with empty cells.
 *
 * @example
 * splitTableText("P (W)\tv (mm/s)\n200\t800").rows; // [["P (W)", "v (mm/s)"], ["200", "800"]]
 * splitTableText("200  0,1  dense\n250  0,12  keyhole").rows[0]; // ["200", "0,1", "dense"]
 */
export function splitTableText(text: string, splitter: PasteSplitter = "auto"): SplitTable {
  if (typeof text !== "string") throw new TypeError("splitTableText: text must be a string");
  const ls = lines(text);
  const used = splitter === "auto" ? detect(ls) : splitter;
  const rows = ls.map((l) => splitLine(l, used));
  const width = rows.reduce((w, r) => Math.max(w, r.length), 0);
  for (const r of rows) while (r.length < width) r.push("");
  return { rows, splitter: used };
}

const NUMERIC_CELL = /^[+\-\u2212]?(\d+([.,]\d*)?|[.,]\d+)([eE][+\-\u2212]?\d+)?\s*\S{0,8}$/;

/**
 * Whether the first row reads as a header: it has a cell that is not a number while the rows below
 * have numbers in that column. A table of only text rows counts as having a header.
 *
 * @example
 * looksLikeHeader([["Power (W)", "Speed"], ["200", "800"]]); // true
 * looksLikeHeader([["200", "800"], ["250", "900"]]);          // false
 */
export function looksLikeHeader(rows: readonly (readonly string[])[]): boolean {
  const [first, ...rest] = rows;
  if (!first) return false;
  const numeric = (c: string | undefined) => c !== undefined && NUMERIC_CELL.test(c.trim());
  if (!rest.length) return first.some((c) => c.trim() !== "" && !numeric(c));
  return first.some((c, i) => c.trim() !== "" && !numeric(c) && rest.some((r) => numeric(r[i])));
}
