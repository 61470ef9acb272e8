import { createHash } from "node:crypto";
import { parquetReadObjects } from "hyparquet";
import { describe, expect, test } from "vitest";
import { buildTrainingSet } from "@/lib/domain/export/build";
import { defaultExportOptions, exampleRecords, exampleSources } from "@/lib/domain/export/example-records";
import { exportFiles, exportFilesWith } from "@/lib/domain/export/files";
import { parquetColumns, writeParquet } from "@/lib/domain/export/parquet";
import type { ExportOptions } from "@/lib/domain/export/types";
import { parquetEncoder } from "@/lib/server/parquet-encoder";

const sha = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");
const columns = [
  { name: "record_id", kind: "integer" as const },
  { name: "laser_power_w", kind: "number" as const },
  { name: "alloy", kind: "text" as const },
];
const rows = [
  [1, 200.5, "316L"],
  [2, null, "IN718"],
  [3, 180, null],
];

describe("Parquet on a worker thread", () => {
  test("gives the same bytes as encoding in this thread, and hyparquet reads them back", async () => {
    const encoder = parquetEncoder();
    try {
      expect(encoder.threaded).toBe(true);
      const bytes = await encoder.encode(parquetColumns(columns, rows), "meltledger test");
      expect(sha(bytes)).toBe(sha(writeParquet(columns, rows, "meltledger test")));
      const back = await parquetReadObjects({ file: bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer });
      expect(back.map((r) => [Number(r.record_id), r.laser_power_w, r.alloy])).toEqual([[1, 200.5, "316L"], [2, null, "IN718"], [3, 180, null]]);
    } finally {
      await encoder.close();
    }
  });

  test("a whole export's files through the worker equal the in-thread ones, byte for byte, in the same order", async () => {
    const o: ExportOptions = { ...defaultExportOptions(), balance: { method: "smote", k: 5, maxSyntheticMultiple: 5 } };
    const r = buildTrainingSet({ records: exampleRecords(600, 10, 4), sources: exampleSources(10), options: o });
    if (!r.ok) throw new Error(r.problem.message);
    const encoder = parquetEncoder();
    const early: string[] = [];
    try {
      const threaded = await exportFilesWith(r.built, o, "0.1.0", sha, (input, createdBy) => encoder.encode(input, createdBy), (f) => early.push(f.name));
      const inThread = exportFiles(r.built, o, "0.1.0", sha);
      expect(threaded.files.map((f) => [f.name, sha(f.bytes)])).toEqual(inThread.files.map((f) => [f.name, sha(f.bytes)]));
      expect(threaded.entries).toEqual(inThread.entries);
      // Every data file is handed over before the datasheet and manifest exist.
      expect([...early].sort()).toEqual(["test.csv", "test.parquet", "train.csv", "train.parquet", "validation.csv", "validation.parquet"]);
    } finally {
      await encoder.close();
    }
  });

  test("a failed encoding rejects with the writer's message; a closed encoder refuses more work", async () => {
    const encoder = parquetEncoder();
    const bad = { rowCount: 1, columnData: [{ name: "x", data: [1], type: "NOT_A_TYPE", nullable: true }] } as never;
    await expect(encoder.encode(bad, "meltledger test")).rejects.toThrow(/Parquet encoding failed/);
    await encoder.close();
    await expect(encoder.encode(parquetColumns(columns, rows), "meltledger test")).rejects.toThrow(/stopped/);
  });
});
