/**
 * CSV reading rules shared by the streaming file reader (lib/server) and whole-text parsing:
 * delimiter detection, the parser options, and readable messages for malformed files. Parsing
 * itself is csv-parse's (RFC 4180 quoting, BOM removal), configured here once.
 */
import type { Options as CsvParseOptions } from "csv-parse";
import { parse as parseSync } from "csv-parse/sync";

export const CSV_DELIMITERS = [",", ";", "\t", "|"] as const;
export type CsvDelimiter = (typeof CSV_DELIMITERS)[number];

/** Counts of a delimiter per non-blank line of the sample, outside double quotes. */
function countsPerLine(sample: string, delimiter: string): number[] {
  const counts: number[] = [];
  let inQuotes = false;
  let n = 0;
  let content = false;
  for (let i = 0; i < sample.length; i++) {
    const ch = sample[i];
    if (ch === '"') {
      inQuotes = !inQuotes;
      content = true;
    } else if (!inQuotes && (ch === "\n" || ch === "\r")) {
      if (ch === "\r" && sample[i + 1] === "\n") i++;
      if (content) counts.push(n);
      n = 0;
      content = false;
    } else {
      if (!inQuotes && ch === delimiter) n++;
      if (ch !== " ") content = true;
    }
  }
  if (content) counts.push(n);
  return counts;
}

/**
 * Picks the delimiter of a CSV file from its first few kilobytes. A candidate is steady when it
 * appears the same number of times (at least once) on every line; steady candidates win in the
 * order tab, semicolon, pipe, comma, because tabs and semicolons seldom occur inside data while
 * commas do (decimal commas: "200;0,1"). With no steady candidate the most frequent one wins.
 * Falls back to ",".
 *
 * @example
 * sniffDelimiter("a;b\n1;0,5\n2;0,75\n"); // ";"
 * sniffDelimiter("a\tb\n1\t2\n");         // "\t"
 */
export function sniffDelimiter(sample: string): CsvDelimiter {
  const text = sample.replace(/^\uFEFF/, "");
  // the last line of a long sample may be cut short
  const cut = text.lastIndexOf("\n");
  const body = cut > 0 && text.length >= 4096 ? text.slice(0, cut + 1) : text;
  let frequent: { d: CsvDelimiter; mean: number } | null = null;
  for (const d of ["\t", ";", "|", ","] as const) {
    const counts = countsPerLine(body, d);
    if (!counts.length) continue;
    const mean = counts.reduce((s, c) => s + c, 0) / counts.length;
    if (mean === 0) continue;
    if (counts.every((c) => c === counts[0])) return d;
    if (!frequent || mean > frequent.mean) frequent = { d, mean };
  }
  return frequent?.d ?? ",";
}

/**
 * The csv-parse options every CSV import uses: BOM removed, rows of uneven length allowed (the
 * mapping step reports missing cells), blank lines skipped, cells kept as text exactly as written
 * apart from surrounding spaces. Quotes must be well formed: a stray quote is an error with its
 * line, not a silent guess.
 *
 * @example
 * csvParseOptions(";").delimiter; // ";"
 */
export function csvParseOptions(delimiter: CsvDelimiter): CsvParseOptions {
  return {
    delimiter,
    bom: true,
    relax_column_count: true,
    skip_empty_lines: true,
    trim: true,
    cast: false,
    max_record_size: 1_000_000,
  };
}

export type CsvTextResult = { ok: true; rows: string[][]; delimiter: CsvDelimiter } | { ok: false; message: string; line: number | null };

/**
 * A csv-parse error as a sentence naming the line. csv-parse reports `code` and `lines`.
 *
 * @example
 * describeCsvError({ code: "CSV_QUOTE_NOT_CLOSED", lines: 3 }); // { message: "Line 3: a quoted cell is never closed (a \" is missing).", line: 3 }
 */
export function describeCsvError(error: unknown): { message: string; line: number | null } {
  const e = (error ?? {}) as { code?: unknown; lines?: unknown; message?: unknown };
  const line = typeof e.lines === "number" ? e.lines : null;
  const where = line !== null ? `Line ${line}: ` : "";
  switch (e.code) {
    case "CSV_QUOTE_NOT_CLOSED":
      return { message: `${where}a quoted cell is never closed (a " is missing).`, line };
    case "CSV_INVALID_CLOSING_QUOTE":
    case "INVALID_OPENING_QUOTE":
      return { message: `${where}a quote appears inside an unquoted cell; put the whole cell in quotes and double the inner quote ("").`, line };
    case "CSV_MAX_RECORD_SIZE":
      return { message: `${where}a row is longer than 1,000,000 characters; this is not a table of build records.`, line };
    default:
      return { message: `${where}the file cannot be read as CSV (${typeof e.message === "string" ? e.message : "unknown problem"}).`, line };
  }
}

/**
 * Parses a whole CSV text (small files, pasted CSV, tests). Large files go through the streaming
 * reader in lib/server with the same options.
 *
 * @example
 * parseCsvText('\uFEFFP (W);h (mm)\n200;"0,1"\n'); // { ok: true, rows: [["P (W)", "h (mm)"], ["200", "0,1"]], delimiter: ";" }
 */
export function parseCsvText(text: string, delimiter?: CsvDelimiter): CsvTextResult {
  if (typeof text !== "string") throw new TypeError("parseCsvText: text must be a string");
  const d = delimiter ?? sniffDelimiter(text.slice(0, 16_384));
  try {
    const rows = parseSync(text, csvParseOptions(d)) as string[][];
    return { ok: true, rows, delimiter: d };
  } catch (error) {
    return { ok: false, ...describeCsvError(error) };
  }
}
