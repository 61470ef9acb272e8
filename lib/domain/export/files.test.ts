import { createHash } from "node:crypto";
import { parquetReadObjects } from "hyparquet";
import { parse } from "csv-parse/sync";
import { describe, expect, test } from "vitest";
import { buildTrainingSet } from "./build";
import { defaultExportOptions, exampleRecords, exampleSources } from "./example-records";
import { exportFiles } from "./files";
import type { ExportOptions } from "./types";

const sha = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");
const text = (b: Uint8Array) => new TextDecoder().decode(b);

function filesFor(o: ExportOptions, n = 600) {
  const r = buildTrainingSet({ records: exampleRecords(n, 10, 4), sources: exampleSources(10), options: o });
  if (!r.ok) throw new Error(r.problem.message);
  return exportFiles(r.built, o, "0.1.0", sha);
}

const smote: ExportOptions = { ...defaultExportOptions(), balance: { method: "smote", k: 5, maxSyntheticMultiple: 5 } };

describe("export files", () => {
  test("CSV and Parquet per split, then the datasheet and the manifest", () => {
    expect(filesFor(smote).files.map((f) => f.name)).toEqual(["train.csv", "validation.csv", "test.csv", "train.parquet", "validation.parquet", "test.parquet", "DATASHEET.md", "manifest.json"]);
  });

  test("the same inputs and seed give byte-identical files", () => {
    const a = filesFor(smote).files;
    const b = filesFor(smote).files;
    expect(a.map((f) => sha(f.bytes))).toEqual(b.map((f) => sha(f.bytes)));
  });

  test("the manifest lists every other file with its SHA-256, the tool version and every column", () => {
    const { files } = filesFor(smote);
    const manifest = JSON.parse(text(files.at(-1)!.bytes));
    expect(manifest.tool).toEqual({ name: "meltledger", version: "0.1.0" });
    for (const f of files.slice(0, -1)) expect(manifest.files.find((e: { name: string }) => e.name === f.name).sha256).toBe(sha(f.bytes));
    const header = text(files[0]!.bytes).split("\n")[0]!.split(",");
    expect(manifest.columns.map((c: { name: string }) => c.name)).toEqual(header);
    for (const c of manifest.columns) expect(typeof c.definition).toBe("string");
    expect(manifest.counts.before_balancing.train).toBeDefined();
    expect(manifest.counts.after_balancing.train.success).toBe(manifest.counts.after_balancing.train.failure);
    expect(manifest.sources.length).toBeGreaterThan(0);
  });

  test("the datasheet answers the datasheet questions and lists the hashes", () => {
    const { files, entries } = filesFor(smote);
    const md = text(files.find((f) => f.name === "DATASHEET.md")!.bytes);
    for (const h of ["## Motivation", "## Composition", "## Collection process", "## Preprocessing, cleaning and labelling", "## Uses", "## Distribution", "## Maintenance", "## Warnings"]) expect(md).toContain(h);
    for (const e of entries.filter((x) => x.name.endsWith(".csv"))) expect(md).toContain(e.sha256);
    expect(md).toMatch(/https:\/\/doi\.org\/10\.5555\/export\.\d/);
    expect(md).toContain("meltledger 0.1.0");
  });

  // pandas cannot read Parquet here (neither pyarrow nor fastparquet is installed, nor packaged by
  // Debian), so the round trip uses hyparquet, the reader of the writer's own project.
  test("each Parquet file reads back equal to its CSV", async () => {
    const { files } = filesFor({ ...smote, label: { scheme: "multiclass", densityThresholdPct: 99 } }, 300);
    for (const name of ["train", "test"]) {
      const csv = parse(text(files.find((f) => f.name === `${name}.csv`)!.bytes), { columns: true }) as Record<string, string>[];
      const bytes = files.find((f) => f.name === `${name}.parquet`)!.bytes;
      const rows = (await parquetReadObjects({ file: bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer })) as Record<string, unknown>[];
      expect(rows).toHaveLength(csv.length);
      rows.forEach((row, i) => {
        for (const [key, cell] of Object.entries(csv[i]!)) {
          const v = row[key];
          if (cell === "") expect(v ?? null).toBeNull();
          else if (typeof v === "number") expect(v).toBe(Number(cell));
          else expect(String(v)).toBe(cell);
        }
      });
    }
  });
});
