/**
 * Parquet for training sets, written with hyparquet-writer (pure JavaScript, no native code): one
 * row group, Snappy pages, INT32 for whole-number columns, DOUBLE for measures, UTF-8 strings for
 * text; every column nullable. No timestamps are written, so the same rows give the same bytes.
 */
import { parquetWriteBuffer } from "hyparquet-writer";
import type { Cell, TableColumn } from "./csv-writer";
import { ColumnarTable } from "./table";

const TYPE = { integer: "INT32", number: "DOUBLE", text: "STRING" } as const;

/**
 * The table as a Parquet file. Number columns without empty cells go in as typed arrays; text
 * columns are dictionary-encoded when that pays, numbers plain.
 *
 * @example writeParquet([{ name: "p_w", kind: "number" }], [[200]], "meltledger 0.1.0").byteLength; // > 0
 */
export function writeParquet(columns: readonly TableColumn[], data: ColumnarTable | readonly (readonly Cell[])[], createdBy: string): Uint8Array {
  return parquetFromColumns(parquetColumns(columns, data), createdBy);
}

/** What the Parquet writer is given for one table: each column's name, type and values. */
export interface ParquetInput {
  rowCount: number;
  columnData: ParquetColumnData[];
}

export type ParquetColumnData =
  | { name: string; data: (string | null)[]; type: "STRING"; nullable: true }
  | { name: string; data: Float64Array | Int32Array | (number | null)[]; type: "INT32" | "DOUBLE"; nullable: true; encoding: "PLAIN" };

/**
 * The columns of a table as the Parquet writer takes them. Number columns without empty cells go
 * in as typed arrays (the writer copies each row group itself, so a column is the table's own
 * array); whole-number columns become INT32 (ToInt32, as Int32Array.from converts).
 */
export function parquetColumns(columns: readonly TableColumn[], data: ColumnarTable | readonly (readonly Cell[])[]): ParquetInput {
  const table = data instanceof ColumnarTable ? data : toColumnar(columns, data);
  const columnData = columns.map((c, j): ParquetColumnData => {
    if (c.kind === "text") return { name: c.name, data: [...table.textColumn(j)], type: TYPE.text, nullable: true };
    const values = table.numberColumn(j);
    let hasEmpty = false;
    for (let i = 0; i < values.length; i++) if (Number.isNaN(values[i]!)) {
      hasEmpty = true;
      break;
    }
    const integer = c.kind === "integer";
    const out = hasEmpty ? Array.from(values, (v) => (Number.isNaN(v) ? null : integer ? v | 0 : v)) : integer ? Int32Array.from(values) : values;
    return { name: c.name, data: out, type: TYPE[c.kind], nullable: true, encoding: "PLAIN" };
  });
  return { rowCount: table.rowCount, columnData };
}

/** The Parquet bytes of prepared columns: one row group, no statistics (so the same rows give the same bytes). */
export function parquetFromColumns(input: ParquetInput, createdBy: string): Uint8Array {
  return new Uint8Array(parquetWriteBuffer(parquetWriteOptions(input, createdBy)));
}

/** The writer's options for prepared columns: the one place they are set (a worker thread is handed them whole). */
export function parquetWriteOptions(input: ParquetInput, createdBy: string) {
  return { columnData: input.columnData, createdBy, rowGroupSize: Math.max(input.rowCount, 1), statistics: false };
}

function toColumnar(columns: readonly TableColumn[], rows: readonly (readonly Cell[])[]): ColumnarTable {
  const t = new ColumnarTable(columns, rows.length);
  for (const r of rows) t.push(r);
  return t;
}
