import { parquetReadObjects } from "hyparquet";
import { describe, expect, test } from "vitest";
import { parquetColumns, parquetFromColumns, writeParquet } from "./parquet";
import { ColumnarTable } from "./table";

const columns = [
  { name: "record_id", kind: "integer" as const },
  { name: "laser_power_w", kind: "number" as const },
  { name: "scan_speed_mm_s", kind: "number" as const },
  { name: "alloy", kind: "text" as const },
];
const rows = [
  [7, 200.5, 800, "316L"],
  [8, null, 1000, "IN718"],
  [9, 180, 950, null],
];

const arrayBuffer = (b: Uint8Array) => b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer;

describe("training-set Parquet", () => {
  test("columns go to the writer by kind: INT32 for whole numbers, DOUBLE for measures, strings; a column with empty cells as a list with nulls", () => {
    const { rowCount, columnData } = parquetColumns(columns, rows);
    expect(rowCount).toBe(3);
    expect(columnData.map((c) => [c.name, c.type])).toEqual([["record_id", "INT32"], ["laser_power_w", "DOUBLE"], ["scan_speed_mm_s", "DOUBLE"], ["alloy", "STRING"]]);
    expect(columnData[0]!.data).toBeInstanceOf(Int32Array);
    expect(columnData[1]!.data).toEqual([200.5, null, 180]);
    expect(columnData[2]!.data).toBeInstanceOf(Float64Array); // no empty cell: the table's own array
    expect(columnData[3]!.data).toEqual(["316L", "IN718", null]);
  });

  test("reads back (hyparquet) with the same values and nulls, from rows or from a columnar table alike", async () => {
    const table = new ColumnarTable(columns, 2);
    for (const r of rows) table.push(r);
    const fromRows = writeParquet(columns, rows, "meltledger test");
    expect(Buffer.from(writeParquet(columns, table, "meltledger test")).equals(Buffer.from(fromRows))).toBe(true);
    expect(Buffer.from(parquetFromColumns(parquetColumns(columns, rows), "meltledger test")).equals(Buffer.from(fromRows))).toBe(true);
    const back = await parquetReadObjects({ file: arrayBuffer(fromRows) });
    expect(back.map((r) => [Number(r.record_id), r.laser_power_w, r.scan_speed_mm_s, r.alloy])).toEqual([
      [7, 200.5, 800, "316L"],
      [8, null, 1000, "IN718"],
      [9, 180, 950, null],
    ]);
  });

  test("an empty table is still a valid file", async () => {
    const bytes = writeParquet(columns, [], "meltledger test");
    expect(await parquetReadObjects({ file: arrayBuffer(bytes) })).toEqual([]);
  });
});
