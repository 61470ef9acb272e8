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
  const table = data instanceof ColumnarTable ? data : toColumnar(columns, data);
  const columnData = columns.map((c, j) => {
    if (c.kind === "text") return { name: c.name, data: [...table.textColumn(j)], type: TYPE.text, nullable: true };
    const values = table.numberColumn(j);
    let hasEmpty = false;
    for (let i = 0; i < values.length; i++) if (Number.isNaN(values[i]!)) {
      hasEmpty = true;
      break;
    }
    // The writer copies each row group itself: a number column goes in as the table's own array.
    // Whole-number columns become INT32 (ToInt32, as Int32Array.from converts).
    const integer = c.kind === "integer";
    const out = hasEmpty ? Array.from(values, (v) => (Number.isNaN(v) ? null : integer ? v | 0 : v)) : integer ? Int32Array.from(values) : values;
    return { name: c.name, data: out, type: TYPE[c.kind], nullable: true, encoding: "PLAIN" as const };
  });
  const buffer = parquetWriteBuffer({ columnData, createdBy, rowGroupSize: Math.max(table.rowCount, 1), statistics: false });
  return new Uint8Array(buffer);
}

function toColumnar(columns: readonly TableColumn[], rows: readonly (readonly Cell[])[]): ColumnarTable {
  const t = new ColumnarTable(columns, rows.length);
  for (const r of rows) t.push(r);
  return t;
}
