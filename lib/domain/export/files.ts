/**
 * The files of an export from a built training set: one CSV and one Parquet file per table
 * (train, validation, test — or folds), DATASHEET.md and manifest.json. Hashing is passed in so
 * the core stays pure.
 */
import type { BuiltExport } from "./build";
import { writeCsvBytes } from "./csv-writer";
import { renderDatasheet } from "./datasheet";
import { buildManifest, type ExportFileEntry } from "./manifest";
import { writeParquet } from "./parquet";
import type { ExportOptions } from "./types";

export interface ExportFile {
  name: string;
  bytes: Uint8Array;
}

const encoder = new TextEncoder();

/**
 * Every file of the export, data files first, then DATASHEET.md, then manifest.json.
 *
 * @example exportFiles(built, options, "0.1.0", sha256Hex).map((f) => f.name);
 * // ["train.csv", "validation.csv", "test.csv", "train.parquet", …, "DATASHEET.md", "manifest.json"]
 */
export function exportFiles(built: BuiltExport, options: ExportOptions, toolVersion: string, sha256Hex: (bytes: Uint8Array) => string): { files: ExportFile[]; entries: ExportFileEntry[] } {
  const files: ExportFile[] = [];
  const entries: ExportFileEntry[] = [];
  const add = (name: string, bytes: Uint8Array, rows: number | null) => {
    files.push({ name, bytes });
    entries.push({ name, rows, bytes: bytes.byteLength, sha256: sha256Hex(bytes) });
  };
  for (const t of built.tables) add(`${t.name}.csv`, writeCsvBytes(built.columns, t.table), t.table.rowCount);
  for (const t of built.tables) add(`${t.name}.parquet`, writeParquet(built.columns, t.table, `meltledger ${toolVersion}`), t.table.rowCount);
  add("DATASHEET.md", encoder.encode(renderDatasheet(built, options, toolVersion, entries)), null);
  const manifest = buildManifest(built, options, toolVersion, entries);
  files.push({ name: "manifest.json", bytes: encoder.encode(`${JSON.stringify(manifest, null, 2)}\n`) });
  return { files, entries };
}
