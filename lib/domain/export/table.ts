/**
 * A column-stored table: numbers in Float64Arrays (NaN = empty), text in arrays. A training set of
 * 100k rows and 60 columns stays a few flat arrays instead of millions of boxed numbers, which
 * keeps building and writing it fast.
 */
import type { Cell, TableColumn } from "./csv-writer";

export class ColumnarTable {
  readonly columns: readonly TableColumn[];
  private numbers: (Float64Array | null)[];
  private texts: ((string | null)[] | null)[];
  private size = 0;
  private capacity: number;

  /** @example new ColumnarTable([{ name: "p_w", kind: "number" }]).rowCount; // 0 */
  constructor(columns: readonly TableColumn[], initialCapacity = 1024) {
    this.columns = columns;
    this.capacity = Math.max(16, initialCapacity);
    this.numbers = columns.map((c) => (c.kind === "text" ? null : new Float64Array(this.capacity).fill(NaN)));
    this.texts = columns.map((c) => (c.kind === "text" ? [] : null));
  }

  get rowCount(): number {
    return this.size;
  }

  private grow(): void {
    this.capacity *= 2;
    this.numbers = this.numbers.map((a) => {
      if (!a) return null;
      const b = new Float64Array(this.capacity).fill(NaN);
      b.set(a);
      return b;
    });
  }

  /** Appends a row; the first `cells.length` columns from `cells`, the rest from `numbers` (NaN = empty). */
  push(cells: readonly Cell[], numbers?: Float64Array): void {
    if (this.size === this.capacity) this.grow();
    const r = this.size++;
    const width = this.columns.length;
    const head = Math.min(cells.length, width);
    for (let c = 0; c < head; c++) this.put(c, r, cells[c]!);
    for (let c = head; c < width; c++) {
      const column = this.numbers[c];
      const v = numbers ? numbers[c - cells.length] : NaN;
      // Number columns from a Float64Array take the value as it is; anything else goes the general way.
      if (column && v !== undefined) column[r] = v;
      else this.put(c, r, v as Cell);
    }
  }

  private put(c: number, r: number, v: Cell): void {
    const text = this.texts[c];
    if (text) text.push(v === null || (typeof v === "number" && Number.isNaN(v)) ? null : String(v));
    else this.numbers[c]![r] = typeof v === "number" ? v : v === null ? NaN : Number(v);
  }

  /** One cell: a number, text or null. */
  value(row: number, col: number): Cell {
    const text = this.texts[col];
    if (text) return text[row] ?? null;
    const v = this.numbers[col]![row]!;
    return Number.isNaN(v) ? null : v;
  }

  /** A number column's values (NaN = empty), trimmed to the row count. */
  numberColumn(col: number): Float64Array {
    const a = this.numbers[col];
    if (!a) throw new TypeError(`ColumnarTable.numberColumn: column ${this.columns[col]?.name} holds text`);
    return a.subarray(0, this.size);
  }

  /** A text column's values. */
  textColumn(col: number): readonly (string | null)[] {
    const a = this.texts[col];
    if (!a) throw new TypeError(`ColumnarTable.textColumn: column ${this.columns[col]?.name} holds numbers`);
    return a;
  }

  /** The rows as arrays of cells (for tests and small tables). */
  rows(): Cell[][] {
    return Array.from({ length: this.size }, (_, r) => this.columns.map((_, c) => this.value(r, c)));
  }
}
