// Imports end to end, on SQLite and on PostgreSQL: the open dataset's workbook, CSV and pasted
// tables, all-or-nothing commits, cancellation, presets, and the bad inputs that must write nothing.
// What was written is read back with hand-written SQL through sql() (the rules of DEVELOPERS.md).
import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { sql, type SqlValue } from "@/lib/db/sql";
import { localActor, type Actor } from "@/lib/server/actor";
import { commitImport, listImportPresets, previewImport, saveImportPreset, type TableInput } from "@/lib/server/imports";
import { storeImportFile } from "@/lib/server/files";
import { IMPORT_QUANTITY_FIELDS } from "@/lib/domain/column-mapping";
import { RECORD_QUANTITY_FIELDS } from "@/lib/schemas/record";
import { newSourceId } from "../support/sources";
import { describeEachEngine } from "../support/engines";

const DATASET = path.resolve(import.meta.dirname, "../../../shared/datasets/lpbf-relative-density-2025/dataset.xlsx");
const work = mkdtempSync(path.join(os.tmpdir(), "meltledger-import-files-"));

const count = async (table: string) => (await sql().get<{ n: number }>(`SELECT COUNT(*) AS n FROM "${table}"`))!.n;
const all = <T = Record<string, unknown>>(text: string, params: SqlValue[] = []) => sql().all<T>(text, params);
const one = async <T = Record<string, unknown>>(text: string, params: SqlValue[] = []) => (await sql().get<T>(text, params))!;

function csvFile(name: string, text: string): TableInput {
  const p = path.join(work, name);
  writeFileSync(p, text);
  return { kind: "csv", path: p, fileName: name };
}

afterAll(() => rmSync(work, { recursive: true, force: true }));

test("the importer's quantity fields are the record schema's", () => {
  expect(IMPORT_QUANTITY_FIELDS).toEqual(RECORD_QUANTITY_FIELDS);
});

// Reference figures from pandas (python3-pandas with openpyxl) reading the same workbook.
const reference = JSON.parse(
  execFileSync("/usr/bin/python3", [
    "-c",
    `import json, re, pandas as pd
d = pd.read_excel(${JSON.stringify(DATASET)}, sheet_name="data")
def doi(x):
  s = str(x).strip()
  s = re.sub(r"^(https?://)?(dx\\.)?doi\\.org/", "", s, flags=re.I).lower()
  return s if s.startswith("10.") else None
print(json.dumps({"rows": len(d), "dois": sorted({doi(x) for x in d["DOI"] if doi(x)}), "machines": sorted(set(d["Printer Model"].astype(str).str.strip())),
"hatch0": float(d["Hatch space (mm)"].iloc[0]), "layer0": float(d["Layer thickness (mm)"].iloc[0]), "spot0": float(d["Spot size (mm)"].iloc[0]),
"alloys": d["Material"].value_counts().to_dict()}))`,
  ]).toString(),
) as { rows: number; dois: string[]; machines: string[]; hatch0: number; layer0: number; spot0: number; alloys: Record<string, number> };

describeEachEngine("imports", () => {
  let actor: Actor;
  let sourceId: number;

  beforeAll(async () => {
    actor = await localActor();
    sourceId = await newSourceId(actor, { doi: "10.5555/import.0001", title: "An invented study for import tests" });
  });

  describe("the open dataset (Barrionuevo et al., Sci. Data 12:375, 2025)", () => {
    test("imports every row, converts mm to µm, normalizes DOIs into sources, keeps printer names as entered", async () => {
      const before = await count("BuildRecord");
      const r = await commitImport({ kind: "xlsx", path: DATASET, fileName: "dataset.xlsx", sheet: "data" }, { mapping: null }, actor);
      if (!r.ok) throw new Error(JSON.stringify(r.error).slice(0, 2000));
      expect(r.data.status).toBe("committed");
      expect(r.data.imported).toBe(reference.rows);
      expect(r.data.imported).toBe(1579);
      expect(r.data.errors).toEqual([]);
      expect(r.data.unmapped).toEqual(["No.", "Density Measurement Method", "Printed Geom.", "Geometric Factor"]);
      expect(await count("BuildRecord") - before).toBe(1579);
      expect(r.data.records[0]).toEqual({ row: 1, id: expect.any(Number) });
      expect(r.data.records[1578]?.row).toBe(1579);

      const run = r.data.importRunId!;
      const first = await one(`SELECT * FROM "BuildRecord" WHERE "id" = ?`, [r.data.records[0]!.id]);
      expect(first.hatchSpacingUm).toBeCloseTo(reference.hatch0 * 1000, 9);
      expect(first.layerThicknessUm).toBeCloseTo(reference.layer0 * 1000, 9);
      expect(first.spotDiameterUm).toBeCloseTo(reference.spot0 * 1000, 9);
      expect(first.importRow).toBe(1);
      expect(first.importFile).toBe("dataset.xlsx");
      expect(first.importRunId).toBe(r.data.importRunId);
      expect(JSON.parse(String(first.enteredValues)).hatchSpacing).toEqual({ text: String(reference.hatch0), unit: "mm", provenance: "reported" });

      const dois = (await all<{ doi: string }>(`SELECT DISTINCT s."doi" FROM "BuildRecord" r JOIN "Source" s ON s."id" = r."sourceId" WHERE r."importRunId" = ? AND s."doi" IS NOT NULL ORDER BY s."doi"`, [run])).map((x) => x.doi);
      expect(dois).toEqual(reference.dois);
      expect(r.data.createdSources.filter((s) => s.doi)).toHaveLength(reference.dois.length);
      // the one row whose DOI cell holds a publisher's address gets a source known by that address
      expect(r.data.createdSources.filter((s) => s.url)).toEqual([{ doi: null, url: "http://www.scientific.net/AMM.698.333", id: expect.any(Number) }]);
      expect(r.data.warnings.filter((w) => w.field === "doi")).toHaveLength(1);

      const machines = (await all<{ machine: string }>(`SELECT DISTINCT "machine" FROM "BuildRecord" WHERE "importRunId" = ? ORDER BY "machine"`, [run])).map((x) => x.machine);
      expect([...machines].sort()).toEqual([...reference.machines].sort());
      expect(machines).toEqual(expect.arrayContaining(["LUMEX Avance-25", "Lumex Avance 25", "SLM-125HL", "SLM 125HL"]));

      const designations = Object.fromEntries((await all<{ d: string; n: number }>(`SELECT m."designation" AS d, COUNT(*) AS n FROM "BuildRecord" r JOIN "Material" m ON m."id" = r."materialId" WHERE r."importRunId" = ? GROUP BY m."designation"`, [run])).map((x) => [x.d, x.n]));
      expect(designations).toEqual(reference.alloys);
      const keys = (await all<{ alloyKey: string }>(`SELECT DISTINCT "alloyKey" AS "alloyKey" FROM "BuildRecord" WHERE "importRunId" = ? ORDER BY "alloyKey"`, [run])).map((x) => x.alloyKey);
      expect(keys).toEqual(["18Ni300", "316L", "AlSi10Mg", "CuCrZr", "IN718", "Ti-6Al-4V"]);
      const outcomes = await all(`SELECT DISTINCT "outcome" FROM "BuildRecord" WHERE "importRunId" = ?`, [run]);
      expect(outcomes).toEqual([{ outcome: "unknown" }]);
      // the checks ran on the committed records: SOURCE.md lists 9 rows that repeat another row but for "No."
      expect(r.data.checks).not.toBeNull();
      expect(r.data.checks!.openByCode["duplicate.exact"]).toBeGreaterThanOrEqual(9);
      expect(await one(`SELECT * FROM "ImportRun" WHERE "id" = ?`, [run])).toMatchObject({ format: "xlsx", sheet: "data", rowCount: 1579, importedCount: 1579, excludedCount: 0, status: "committed" });
    }, 120_000);

    test("a second import of the same workbook finds the sources it created instead of copying them", async () => {
      const sourcesBefore = await count("Source");
      const r = await commitImport({ kind: "xlsx", path: DATASET, fileName: "dataset.xlsx" }, { mapping: null, dryRun: true }, actor);
      expect(r.ok && r.data.status).toBe("dry_run");
      const preview = await previewImport({ kind: "xlsx", path: DATASET, fileName: "dataset.xlsx" }, { mapping: null });
      expect(preview.ok && preview.data.sources.every((s) => s.sourceId !== null)).toBe(true);
      expect(preview.ok && preview.data.head.sheets).toEqual(["data", "Cluster 1", "Cluster 2", "Cluster 3", "Cluster 4", "resumen"]);
      expect(await count("Source")).toBe(sourcesBefore);
    }, 120_000);
  });

  describe("CSV and pasted tables", () => {
    test("semicolons, decimal commas, BOM, quoted fields, header units; rows count from 1", async () => {
      const input = csvFile("trial.csv", '\uFEFFAlloy;Laser power (kW);Scan speed [m/s];Hatch (mm);Layer (µm);Outcome;Note\n316L;0,2;0,8;0,1;30;LOF;"a; b"\nIN718;0,25;1,0;0,12;40;desirable;x\n');
      const r = await commitImport(input, { mapping: null, sourceId }, actor);
      if (!r.ok) throw new Error(JSON.stringify(r.error));
      expect(r.data.imported).toBe(2);
      expect(r.data.unmapped).toEqual(["Note"]);
      const rows = await all(
        `SELECT "laserPowerW", "scanSpeedMmPerS", "hatchSpacingUm", "layerThicknessUm", "outcome", "outcomeText", "importRow" FROM "BuildRecord" WHERE "importRunId" = ? ORDER BY "id"`,
        [r.data.importRunId],
      );
      expect(rows).toEqual([
        { laserPowerW: 200, scanSpeedMmPerS: 800, hatchSpacingUm: 100, layerThicknessUm: 30, outcome: "lack_of_fusion", outcomeText: "LOF", importRow: 1 },
        { laserPowerW: 250, scanSpeedMmPerS: 1000, hatchSpacingUm: 120, layerThicknessUm: 40, outcome: "dense", outcomeText: "desirable", importRow: 2 },
      ]);
    });

    test("a pasted table copied from a PDF goes through the same mapping", async () => {
      const text = "Alloy   P (W)   v (mm/s)   h (µm)   Result\nTi-6Al-4V   280   1200   140   keyhole\nTi-6Al-4V   200   900   120   dense\n";
      const preview = await previewImport({ kind: "paste", text }, { mapping: null, sourceId });
      expect(preview.ok && preview.data.head.delimiter).toBe("spaces");
      expect(preview.ok && preview.data.sample.map((s) => s.values.laserPower)).toEqual([280, 200]);
      const r = await commitImport({ kind: "paste", text }, { mapping: null, sourceId }, actor);
      expect(r.ok && r.data.imported).toBe(2);
    });

    test("a table read from a PDF box keeps the page and box as the location", async () => {
      const r = await commitImport(
        { kind: "pdf_table", rows: [["Alloy", "P (W)", "v (mm/s)"], ["316L", "200", "800"]], fileName: "paper.pdf", page: 3, box: { x: 72, y: 400, width: 300, height: 120 }, label: "Table 2" },
        { mapping: null, sourceId },
        actor,
      );
      if (!r.ok) throw new Error(JSON.stringify(r.error));
      const rec = await one(`SELECT "locationPage", "locationLabel" FROM "BuildRecord" WHERE "id" = ?`, [r.data.records[0]!.id]);
      expect(rec).toEqual({ locationPage: 3, locationLabel: "Table 2 · box 72,400 300×120 pt" });
    });

    test("a DOI given for the import creates the source when it is missing", async () => {
      const r = await commitImport(csvFile("doi.csv", "Alloy,P (W),v (mm/s)\n316L,200,800\n"), { mapping: null, sourceDoi: "https://doi.org/10.5555/NEW.IMPORT" }, actor);
      if (!r.ok) throw new Error(JSON.stringify(r.error));
      expect(r.data.createdSources).toEqual([{ doi: "10.5555/new.import", url: null, id: expect.any(Number) }]);
    });
  });

  describe("all or nothing", () => {
    const withErrors = "Alloy,P (W),v (mm/s),h (mm)\n316L,200,800,0.1\n316L,-5,800,0.1\n316L,200,fast,0.1\n316L,210,820,0.1\n";

    test("rows with hard errors refuse the import, listing every row and field", async () => {
      const before = await count("BuildRecord");
      const r = await commitImport(csvFile("errors.csv", withErrors), { mapping: null, sourceId }, actor);
      expect(r.ok).toBe(false);
      if (r.ok) return;
      const rowErrors = r.error.details?.rowErrors as { row: number; field: string }[];
      expect(rowErrors.map((e) => [e.row, e.field])).toEqual([[2, "laserPower"], [3, "scanSpeed"]]);
      expect(await count("BuildRecord")).toBe(before);
    });

    test("with excludeErrors the good rows are written and the rest reported", async () => {
      const r = await commitImport(csvFile("errors2.csv", withErrors), { mapping: null, sourceId, excludeErrors: true }, actor);
      if (!r.ok) throw new Error(JSON.stringify(r.error));
      expect(r.data.imported).toBe(2);
      expect(r.data.excluded).toBe(2);
      expect(r.data.records.map((x) => x.row)).toEqual([1, 4]);
    });

    test("a cancelled import leaves no records, only a cancelled run", async () => {
      const lines = ["Alloy,P (W),v (mm/s)"];
      for (let i = 0; i < 12_000; i++) lines.push(`316L,${150 + (i % 100)},${600 + (i % 500)}`);
      const before = await count("BuildRecord");
      const controller = new AbortController();
      const seen: string[] = [];
      const r = await commitImport(csvFile("long.csv", lines.join("\n")), {
        mapping: null,
        sourceId,
        signal: controller.signal,
        onProgress: (p) => {
          seen.push(p.phase);
          if (p.rowsWritten > 0) controller.abort();
        },
      }, actor);
      if (!r.ok) throw new Error(JSON.stringify(r.error));
      expect(r.data.status).toBe("cancelled");
      expect(seen).toContain("reading");
      expect(await count("BuildRecord")).toBe(before);
      const run = await one(`SELECT "status", "importedCount" FROM "ImportRun" WHERE "id" = ?`, [r.data.importRunId]);
      expect(run).toEqual({ status: "cancelled", importedCount: 0 });
    }, 60_000);

    test("property: any CSV text either imports every valid row or writes nothing, and never throws", async () => {
      const cell = fc.constantFrom("316L", "IN718", "200", "0,1", "0.2", "-1", "abc", "", '"q"', "800", "1e3", "µm", " ");
      const line = fc.array(cell, { minLength: 0, maxLength: 5 }).map((cells) => cells.join(","));
      await fc.assert(
        fc.asyncProperty(fc.array(line, { maxLength: 6 }), fc.boolean(), async (lines, exclude) => {
          const text = ["Alloy,P (W),v (mm/s),h (mm),Outcome", ...lines].join("\n");
          const before = await count("BuildRecord");
          const r = await commitImport(csvFile("fuzz.csv", text), { mapping: null, sourceId, excludeErrors: exclude }, actor);
          const written = await count("BuildRecord") - before;
          if (!r.ok) expect(written).toBe(0);
          else expect(written).toBe(r.data.imported);
          if (r.ok && !exclude) expect(r.data.errors).toEqual([]);
        }),
        { numRuns: 40 },
      );
    }, 120_000);
  });

  describe("pasted text, fuzzed", () => {
    test("property: any pasted text either imports every valid row or writes nothing, and never throws", async () => {
      const cell = fc.constantFrom("316L", "Ti64", "200", "0,1", "0.2", "-1", "x", "", "LOF", "800", "1e3", "µm", "n/a");
      const sep = fc.constantFrom("\t", "  ", " ", ";", "|");
      const line = fc.tuple(fc.array(cell, { maxLength: 5 }), sep).map(([cells, d]) => cells.join(d));
      await fc.assert(
        fc.asyncProperty(fc.array(line, { maxLength: 6 }), fc.constantFrom("auto", "tab", "spaces", "whitespace", "semicolon", "pipe" as const), fc.boolean(), async (lines, splitter, exclude) => {
          const text = ["Alloy\tP (W)\tv (mm/s)\th (mm)\tOutcome", ...lines].join("\n");
          const before = await count("BuildRecord");
          const r = await commitImport({ kind: "paste", text, splitter }, { mapping: null, sourceId, excludeErrors: exclude, deferChecks: true }, actor);
          const written = await count("BuildRecord") - before;
          if (!r.ok) expect(written).toBe(0);
          else expect(written).toBe(r.data.imported);
        }),
        { numRuns: 40 },
      );
    }, 120_000);
  });

  describe("bad input writes nothing and says which row and field", () => {
    test.each([
      ["an empty file", "", /empty/, "file"],
      ["a header but no rows", "Alloy,P (W),v (mm/s)\n", /no data rows/, "file"],
      ["a table with no header", "316L,200,800\n316L,250,900\n", /no header/, "header"],
      ["a column mapped twice", "Alloy,P (W),Power (kW),v (mm/s)\n316L,200,0.2,800\n", /mapped from two columns/, "laserPower"],
      ["a unit that cannot apply", "Alloy,P (mm),v (mm/s)\n316L,200,800\n", /mm cannot apply to laser power/, "laserPower"],
      ["an unclosed quote", 'Alloy,P (W),v (mm/s)\n316L,"200,800\n', /never closed/, "file"],
    ])("%s", async (_label, text, message, field) => {
      const before = await count("BuildRecord");
      const r = await commitImport(csvFile("bad.csv", text), { mapping: null, sourceId }, actor);
      expect(r.ok).toBe(false);
      if (r.ok) return;
      expect(r.error.message).toMatch(message);
      const rowErrors = r.error.details?.rowErrors as { row: number; field: string; message: string }[];
      expect(rowErrors[0]).toMatchObject({ field, row: expect.any(Number) });
      expect(await count("BuildRecord")).toBe(before);
    });

    test("a sheet that is missing is named with the sheets there are", async () => {
      const r = await commitImport({ kind: "xlsx", path: DATASET, fileName: "dataset.xlsx", sheet: "nope" }, { mapping: null }, actor);
      expect(!r.ok && r.error.message).toMatch(/no sheet named "nope".*"data"/);
    });

    test("a file that is not what it claims is refused before anything is stored", async () => {
      const fake = readFileSync(DATASET).subarray(0, 0);
      const asXlsx = await storeImportFile([Buffer.from("Alloy,P\n316L,200\n")], "xlsx", "fake.xlsx", actor);
      expect(!asXlsx.ok && asXlsx.error.code).toBe("unsupported_type");
      const asCsv = await storeImportFile([readFileSync(DATASET)], "csv", "sheet.csv", actor);
      expect(!asCsv.ok && asCsv.error.message).toMatch(/not a CSV text file/);
      const empty = await storeImportFile([fake], "csv", "empty.csv", actor);
      expect(!empty.ok && empty.error.message).toMatch(/empty/);
      const real = await storeImportFile([readFileSync(DATASET)], "xlsx", "dataset.xlsx", actor);
      expect(real.ok).toBe(true);
    });
  });

  describe("presets", () => {
    test("a mapping saved by name and per source is listed and applies to another file", async () => {
      const mapping = { columns: { Werkstoff: { field: "alloy" }, Leistung: { field: "laserPower", unit: "W" }, Geschwindigkeit: { field: "scanSpeed", unit: "mm/s" } } };
      const named = await saveImportPreset({ name: "Invented lab sheet", mapping }, actor);
      expect(named.ok).toBe(true);
      const perSource = await saveImportPreset({ name: "last used", sourceId, mapping }, actor);
      expect(perSource.ok).toBe(true);
      const again = await saveImportPreset({ name: "Invented lab sheet", mapping }, actor);
      expect(again.ok && named.ok && again.data.id).toBe(named.ok && named.data.id);
      const list = await listImportPresets(sourceId);
      expect(list.ok && list.data.map((p) => [p.name, p.sourceId])).toEqual([["last used", sourceId], ["Invented lab sheet", null]]);
      const r = await commitImport(csvFile("lab.csv", "Werkstoff,Leistung,Geschwindigkeit\nAlSi10Mg,350,1300\n"), { mapping: list.ok ? (list.data[1]!.mapping as never) : null, sourceId }, actor);
      expect(r.ok && r.data.imported).toBe(1);
      const bad = await saveImportPreset({ name: "x", mapping: { columns: { a: { field: "nonsense" } } } }, actor);
      expect(bad.ok).toBe(false);
    });
  });
});
