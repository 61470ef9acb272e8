/**
 * The files of an export from a built training set: one CSV and one Parquet file per table
 * (train, validation, test — or folds), DATASHEET.md and manifest.json. Hashing is passed in so
 * the core stays pure.
 */
import type { BuiltExport } from "./build";
import { writeCsvBytes } from "./csv-writer";
import { renderDatasheet } from "./datasheet";
import { buildManifest, type ExportFileEntry } from "./manifest";
import { parquetColumns, writeParquet, type ParquetInput } from "./parquet";
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
  const parquet = built.tables.map((t) => writeParquet(built.columns, t.table, `meltledger ${toolVersion}`));
  return assemble(built, options, toolVersion, sha256Hex, parquet);
}

/**
 * The same files, with the Parquet encoding handed to `encodeParquet` (a worker thread, say): it
 * is started for every table first, the CSV files are written meanwhile, and the datasheet and
 * manifest follow once all are done. Same bytes as `exportFiles`.
 */
export async function exportFilesWith(
  built: BuiltExport,
  options: ExportOptions,
  toolVersion: string,
  sha256Hex: (bytes: Uint8Array) => string,
  encodeParquet: (input: ParquetInput, createdBy: string) => Promise<Uint8Array>,
  /** Called with each data file as soon as it is ready (to start writing it to disk early). */
  onDataFile: (file: ExportFile) => void = () => undefined,
): Promise<{ files: ExportFile[]; entries: ExportFileEntry[] }> {
  const pending = built.tables.map((t) =>
    encodeParquet(parquetColumns(built.columns, t.table), `meltledger ${toolVersion}`).then((bytes) => {
      onDataFile({ name: `${t.name}.parquet`, bytes });
      return bytes;
    }),
  );
  // A rejected encoding is awaited below; until then it must not count as unhandled.
  for (const p of pending) p.catch(() => undefined);
  const csv = built.tables.map((t) => {
    const bytes = writeCsvBytes(built.columns, t.table);
    onDataFile({ name: `${t.name}.csv`, bytes });
    return bytes;
  });
  return assemble(built, options, toolVersion, sha256Hex, await Promise.all(pending), csv);
}

function assemble(
  built: BuiltExport,
  options: ExportOptions,
  toolVersion: string,
  sha256Hex: (bytes: Uint8Array) => string,
  parquet: readonly Uint8Array[],
  csv: readonly Uint8Array[] = built.tables.map((t) => writeCsvBytes(built.columns, t.table)),
): { files: ExportFile[]; entries: ExportFileEntry[] } {
  const files: ExportFile[] = [];
  const entries: ExportFileEntry[] = [];
  const add = (name: string, bytes: Uint8Array, rows: number | null) => {
    files.push({ name, bytes });
    entries.push({ name, rows, bytes: bytes.byteLength, sha256: sha256Hex(bytes) });
  };
  built.tables.forEach((t, i) => add(`${t.name}.csv`, csv[i]!, t.table.rowCount));
  built.tables.forEach((t, i) => add(`${t.name}.parquet`, parquet[i]!, t.table.rowCount));
  add("DATASHEET.md", encoder.encode(renderDatasheet(built, options, toolVersion, entries)), null);
  const manifest = buildManifest(built, options, toolVersion, entries);
  files.push({ name: "manifest.json", bytes: encoder.encode(`${JSON.stringify(manifest, null, 2)}\n`) });
  return { files, entries };
}
