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

/** Columns stored by kind (a ColumnarTable): number columns as Float64Arrays (NaN = empty), text columns as arrays. */
export interface ColumnSource {
  readonly rowCount: number;
  numberColumn(col: number): Float64Array;
  textColumn(col: number): readonly (string | null)[];
}

/** Distinct numbers (or texts) remembered per column before caching stops (it pays only for repeated values). */
const CACHE_LIMIT = 4096;
/** Values per column kept in the short list before the map. */
const FEW = 8;
/** Text is handed on in pieces of about this many characters. */
const PIECE_CHARS = 1 << 16;

type Data = CellSource | ColumnSource | readonly (readonly Cell[])[];
const isColumnSource = (d: Data): d is ColumnSource => !Array.isArray(d) && typeof (d as Partial<ColumnSource>).numberColumn === "function";

/**
 * Formatters of number and text cells per column: formatNumberCell and escapeTextCell, with the
 * results remembered per column while that pays.
 */
function cellFormatters(columns: readonly TableColumn[]): { formatNumber: (c: number, v: number) => string; formatText: (c: number, v: string) => string } {
  const width = columns.length;
  const numberCaches: (Map<number, string> | null)[] = columns.map((c) => (c.kind === "text" ? null : new Map()));
  const textCaches: (Map<string, string> | null)[] = columns.map((c) => (c.kind === "text" ? new Map() : null));
  // Columns with a handful of values (layer, absorptivity, mixture and composition per alloy) are
  // answered from a short list compared with ===, before the map.
  const fewValues = columns.map(() => new Float64Array(FEW));
  const fewTexts = columns.map(() => new Array<string>(FEW));
  const fewCount = new Int32Array(width);
  const formatNumber = (c: number, v: number): string => {
    // A column whose values turned out all different is formatted straight away.
    if (numberCaches[c] === null) return formatNumberCell(v);
    const few = fewValues[c]!;
    const n = fewCount[c]!;
    for (let i = 0; i < n; i++) if (few[i] === v && (v !== 0 || Object.is(few[i], v))) return fewTexts[c]![i]!;
    if (n < FEW) {
      const text = formatNumberCell(v);
      few[n] = v;
      fewTexts[c]![n] = text;
      fewCount[c] = n + 1;
      return text;
    }
    const cache = numberCaches[c];
    let text = cache?.get(v);
    if (text === undefined) {
      text = formatNumberCell(v);
      if (cache) {
        if (cache.size < CACHE_LIMIT) cache.set(v, text);
        else numberCaches[c] = null;
      }
    }
    return text;
  };
  const formatText = (c: number, v: string): string => {
    const cache = textCaches[c];
    let text = cache?.get(v);
    if (text === undefined) {
      text = escapeTextCell(v);
      if (cache) {
        if (cache.size < CACHE_LIMIT) cache.set(v, text);
        else textCaches[c] = null;
      }
    }
    return text;
  };
  return { formatNumber, formatText };
}

/**
 * The CSV text in pieces of about PIECE_CHARS characters, in order; the pieces joined are the file.
 * Every number is formatted by formatNumberCell and every text by escapeTextCell, each remembered
 * per column while that pays.
 */
function writeCsvPieces(columns: readonly TableColumn[], data: Data, emit: (piece: string) => void): void {
  if (Array.isArray(data)) {
    (data as readonly (readonly Cell[])[]).forEach((row, r) => {
      if (row.length !== columns.length) throw new RangeError(`writeCsv: row ${r} has ${row.length} cells for ${columns.length} columns`);
    });
  }
  const width = columns.length;
  let piece = columns.map((c) => escapeTextCell(c.name)).join(",") + "\n";
  const { formatNumber, formatText } = cellFormatters(columns);
  if (isColumnSource(data)) {
    const numbers = columns.map((c, j) => (c.kind === "text" ? null : data.numberColumn(j)));
    const texts = columns.map((c, j) => (c.kind === "text" ? data.textColumn(j) : null));
    for (let r = 0; r < data.rowCount; r++) {
      let line = "";
      for (let c = 0; c < width; c++) {
        if (c) line += ",";
        const col = numbers[c];
        if (col) {
          const v = col[r]!;
          if (v === v) line += formatNumber(c, v);
        } else {
          const v = texts[c]![r];
          if (v !== null && v !== undefined) line += formatText(c, v);
        }
      }
      piece += line + "\n";
      if (piece.length >= PIECE_CHARS) {
        emit(piece);
        piece = "";
      }
    }
  } else {
    const source: CellSource = Array.isArray(data) ? rowsSource(data as readonly (readonly Cell[])[]) : (data as CellSource);
    for (let r = 0; r < source.rowCount; r++) {
      let line = "";
      for (let c = 0; c < width; c++) {
        if (c) line += ",";
        const v = source.value(r, c);
        if (v === null) continue;
        const column = columns[c]!;
        if (column.kind === "text") {
          line += formatText(c, String(v));
          continue;
        }
        if (typeof v !== "number") throw new TypeError(`writeCsv: column ${column.name} holds numbers, got ${JSON.stringify(v)}`);
        line += formatNumber(c, v);
      }
      piece += line + "\n";
      if (piece.length >= PIECE_CHARS) {
        emit(piece);
        piece = "";
      }
    }
  }
  if (piece) emit(piece);
}

/**
 * The table as CSV text: a header row, then one line per row, "\n" line ends, a final newline.
 *
 * @example writeCsv([{ name: "alloy", kind: "text" }, { name: "p_w", kind: "number" }], [["316L", 200]]); // "alloy,p_w\n316L,200\n"
 */
export function writeCsv(columns: readonly TableColumn[], data: Data): string {
  const pieces: string[] = [];
  writeCsvPieces(columns, data, (p) => pieces.push(p));
  return pieces.join("");
}

/**
 * The same CSV as writeCsv, as UTF-8 bytes in one buffer; no whole-file string is built (a
 * columnar table is written cell by cell, plain rows piece by piece).
 *
 * @example new TextDecoder().decode(writeCsvBytes(columns, rows)) === writeCsv(columns, rows); // true
 */
export function writeCsvBytes(columns: readonly TableColumn[], data: Data): Uint8Array {
  if (isColumnSource(data)) return columnsToCsvBytes(columns, data);
  const encoder = new TextEncoder();
  const rows = Array.isArray(data) ? data.length : (data as CellSource).rowCount;
  let bytes = new Uint8Array(Math.max(1 << 12, (rows + 1) * columns.length * 8));
  let used = 0;
  writeCsvPieces(columns, data, (piece) => {
    let from = 0;
    for (;;) {
      const { read, written } = encoder.encodeInto(from ? piece.slice(from) : piece, bytes.subarray(used));
      used += written;
      from += read;
      if (from >= piece.length) return;
      const bigger = new Uint8Array(Math.max(bytes.length * 2, used + 3 * (piece.length - from)));
      bigger.set(bytes.subarray(0, used));
      bytes = bigger;
    }
  });
  return bytes.subarray(0, used);
}

const COMMA = 0x2c;
const NEWLINE = 0x0a;
/** Longest text formatNumberCell gives ("-1.2345678901234567e-308" is 24 characters), plus the comma. */
const NUMBER_BYTES = 32;

/**
 * CSV bytes of a column source written cell by cell into one buffer: number texts are ASCII and
 * copied byte by byte, other text goes through the UTF-8 encoder; no line or file string is built.
 */
function columnsToCsvBytes(columns: readonly TableColumn[], data: ColumnSource): Uint8Array {
  const encoder = new TextEncoder();
  const { formatNumber, formatText } = cellFormatters(columns);
  const width = columns.length;
  const numbers = columns.map((c, j) => (c.kind === "text" ? null : data.numberColumn(j)));
  const texts = columns.map((c, j) => (c.kind === "text" ? data.textColumn(j) : null));
  let buf: Uint8Array = new Uint8Array(Math.max(1 << 12, (data.rowCount + 1) * width * 10));
  let pos = 0;
  const grow = (n: number): Uint8Array => {
    const bigger = new Uint8Array(Math.max(buf.length * 2, pos + n));
    bigger.set(buf.subarray(0, pos));
    return bigger;
  };
  /** Writes text at `at` (room for 3 bytes per UTF-16 unit made first); returns the position after it. */
  const putText = (text: string, at: number): number => {
    pos = at;
    if (pos + 3 * text.length > buf.length) buf = grow(3 * text.length);
    let p = pos;
    for (let i = 0; i < text.length; i++) {
      const ch = text.charCodeAt(i);
      if (ch >= 0x80) return p + encoder.encodeInto(text.slice(i), buf.subarray(p)).written;
      buf[p++] = ch;
    }
    return p;
  };
  pos = putText(`${columns.map((c) => escapeTextCell(c.name)).join(",")}\n`, 0);
  const rowRoom = width * NUMBER_BYTES + 1;
  for (let r = 0; r < data.rowCount; r++) {
    if (pos + rowRoom > buf.length) buf = grow(rowRoom);
    let out = buf;
    let p = pos;
    for (let c = 0; c < width; c++) {
      if (c) out[p++] = COMMA;
      const col = numbers[c];
      if (col) {
        const v = col[r]!;
        if (v !== v) continue;
        const text = formatNumber(c, v);
        for (let i = 0; i < text.length; i++) out[p++] = text.charCodeAt(i);
      } else {
        const v = texts[c]![r];
        if (v === null || v === undefined) continue;
        // Text can be long: room for it first, then again for the rest of the row.
        pos = putText(formatText(c, v), p);
        if (pos + rowRoom > buf.length) buf = grow(rowRoom);
        p = pos;
        out = buf;
      }
    }
    out[p++] = NEWLINE;
    pos = p;
  }
  return buf.subarray(0, pos);
}
