/**
 * CSV for training sets: RFC 4180 quoting, numbers written as numbers, and text cells guarded
 * against formula injection (OWASP, "CSV Injection"): a text cell that starts with = + - @, a tab
 * or a carriage return is prefixed with a single quote and quoted, so a spreadsheet shows it as
 * text instead of running it. Formatting is deterministic: the same rows give the same bytes.
 */

export type Cell = number | string | null;
export type ColumnKind = "integer" | "number" | "text";

export interface TableColumn {
  name: string;
  kind: ColumnKind;
}

const FORMULA_START = /^[=+\-@\t\r]/;
const NEEDS_QUOTES = /[",\r\n]/;

/**
 * A text cell made safe for spreadsheets and quoted when it must be.
 *
 * @example escapeTextCell("=HYPERLINK(\"x\")"); // "\"'=HYPERLINK(\"\"x\"\")\""
 * @example escapeTextCell("316L"); // "316L"
 */
export function escapeTextCell(text: string): string {
  const guarded = FORMULA_START.test(text) ? `'${text}` : text;
  return guarded !== text || NEEDS_QUOTES.test(guarded) ? `"${guarded.replace(/"/g, '""')}"` : guarded;
}

/**
 * A number as the shortest text that reads back to the same double; not finite → empty.
 *
 * @example formatNumberCell(0.1 + 0.2); // "0.30000000000000004"
 * @example formatNumberCell(-0); // "0"
 */
export function formatNumberCell(x: number): string {
  if (!Number.isFinite(x)) return "";
  return Object.is(x, -0) ? "0" : String(x);
}

/** Rows to write, by position: a columnar table or plain arrays of cells. */
export interface CellSource {
  readonly rowCount: number;
  value(row: number, col: number): Cell;
}

/** Plain arrays of cells as a cell source. @example rowsSource([[1, "a"]]).value(0, 1); // "a" */
export function rowsSource(rows: readonly (readonly Cell[])[]): CellSource {
  return { rowCount: rows.length, value: (r, c) => rows[r]![c] ?? null };
}

/** Distinct numbers remembered per column before caching stops (it pays only for repeated values). */
const CACHE_LIMIT = 4096;

/**
 * The table as CSV text: a header row, then one line per row, "\n" line ends, a final newline.
 *
 * @example writeCsv([{ name: "alloy", kind: "text" }, { name: "p_w", kind: "number" }], [["316L", 200]]); // "alloy,p_w\n316L,200\n"
 */
export function writeCsv(columns: readonly TableColumn[], data: CellSource | readonly (readonly Cell[])[]): string {
  const source: CellSource = Array.isArray(data) ? rowsSource(data as readonly (readonly Cell[])[]) : (data as CellSource);
  if (Array.isArray(data)) {
    (data as readonly (readonly Cell[])[]).forEach((row, r) => {
      if (row.length !== columns.length) throw new RangeError(`writeCsv: row ${r} has ${row.length} cells for ${columns.length} columns`);
    });
  }
  const caches: (Map<number, string> | null)[] = columns.map((c) => (c.kind === "text" ? null : new Map()));
  const lines: string[] = new Array(source.rowCount + 1);
  lines[0] = columns.map((c) => escapeTextCell(c.name)).join(",");
  const width = columns.length;
  for (let r = 0; r < source.rowCount; r++) {
    let line = "";
    for (let c = 0; c < width; c++) {
      if (c) line += ",";
      const v = source.value(r, c);
      if (v === null) continue;
      const column = columns[c]!;
      if (column.kind === "text") {
        line += escapeTextCell(String(v));
        continue;
      }
      if (typeof v !== "number") throw new TypeError(`writeCsv: column ${column.name} holds numbers, got ${JSON.stringify(v)}`);
      const cache = caches[c];
      let text = cache?.get(v);
      if (text === undefined) {
        text = formatNumberCell(v);
        if (cache) {
          if (cache.size < CACHE_LIMIT) cache.set(v, text);
          else caches[c] = null;
        }
      }
      line += text;
    }
    lines[r + 1] = line;
  }
  return `${lines.join("\n")}\n`;
}
