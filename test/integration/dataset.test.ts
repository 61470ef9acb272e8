// The open LPBF relative-density dataset (Barrionuevo, La Fé-Perdomo & Ramos-Grez, Scientific Data
// 12, 375, 2025, doi 10.1038/s41597-025-04576-x; see its SOURCE.md) pushed through the bulk insert:
// the quirks SOURCE.md lists must be flagged and ordinary rows must stay clean. The sheet is read
// with pandas (test/fixtures/lpbf-density-sheet.py), which also computes the reference sets.
import { execFileSync } from "node:child_process";
import { existsSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { sqlite } from "@/lib/db/connection";
import { normalizeDoi } from "@/lib/domain/doi";
import { migrate } from "@/lib/db/migrate";
import { localActor } from "@/lib/server/actor";
import { listFlags, type FlagJson } from "@/lib/server/flags";
import { insertRecordsBulk } from "@/lib/server/records-bulk";
import { createSource } from "@/lib/server/sources";
import type { RecordInput } from "@/lib/schemas/record";
import { useTempDatabase } from "../support/temp-db";

const DATASET = path.resolve(import.meta.dirname, "../../../shared/datasets/lpbf-relative-density-2025/dataset.xlsx");
const READER = path.resolve(import.meta.dirname, "../fixtures/lpbf-density-sheet.py");

interface SheetRow {
  no: number; material: string; densityMethod: string; atmosphere: string; geometry: string; powerW: number; speedMmS: number; hatchMm: number;
  layerMm: number; spotMm: number; d50Um: number; rdPct: number; printer: string; doi: string;
}
interface Sheet { rows: SheetRow[]; repeats: [number, number][]; repeats_stored: [number, number][]; out_of_range: Record<string, string[]>; shared: number[] }

const tmp = useTempDatabase("dataset");
let sheet: Sheet;
/** Flags by the sheet's `No.` of their record (import rows are 1-based positions in the sheet). */
const flagsByNo = new Map<number, FlagJson[]>();
let noOfRecord = new Map<number, number>();

const DENSITY_METHOD: Record<string, string> = { "Archimedes method": "archimedes", "Image analysis": "image_analysis", Other: "other" };

beforeAll(async () => {
  sheet = JSON.parse(execFileSync("/usr/bin/python3", [READER, DATASET], { encoding: "utf8", maxBuffer: 64 * 1024 * 1024 })) as Sheet;
  migrate(sqlite());
  const actor = await localActor();
  const sourceOf = new Map<string, number>();
  const doiKey = (doi: string) => doi.trim().toLowerCase(); // the sheet spells some DOIs with stray spaces
  for (const row of sheet.rows) {
    if (sourceOf.has(doiKey(row.doi))) continue;
    const s = await createSource(
      { kind: "journal_article", title: `Study behind ${doiKey(row.doi)} (open LPBF relative-density dataset)`, ...(normalizeDoi(row.doi) ? { doi: row.doi.trim() } : { url: row.doi.trim() }), densityMethod: DENSITY_METHOD[row.densityMethod] ?? "unknown", outcomeEvidence: "density_only", machineStated: true, powderReported: true, atmosphereReported: row.atmosphere !== "NI" },
      actor,
    );
    if (!s.ok) throw new Error(`${row.doi}: ${s.error.message}`);
    sourceOf.set(doiKey(row.doi), s.data.id);
  }
  const inputs: RecordInput[] = sheet.rows.map((r) => ({
    sourceId: sourceOf.get(doiKey(r.doi))!,
    alloy: r.material,
    machine: r.printer.trim(),
    atmosphere: r.atmosphere === "NI" ? null : r.atmosphere,
    laserPower: { value: String(r.powerW), unit: "W" },
    scanSpeed: { value: String(r.speedMmS), unit: "mm/s" },
    hatchSpacing: { value: String(r.hatchMm), unit: "mm" },
    layerThickness: { value: String(r.layerMm), unit: "mm" },
    spotDiameter: { value: String(r.spotMm), unit: "mm" },
    powderD50: { value: String(r.d50Um), unit: "µm" },
    relativeDensity: { value: String(r.rdPct), unit: "%" },
    outcome: "unknown",
  }));
  const inserted = await insertRecordsBulk(inputs, actor, { importFile: "dataset.xlsx" });
  if (!inserted.ok) throw new Error(JSON.stringify(inserted.error).slice(0, 2000));
  noOfRecord = new Map(inserted.data.ids.map((id, i) => [id, sheet.rows[inserted.data.rows[i]! - 1]!.no]));
  const flags = await listFlags({ state: "open" });
  if (!flags.ok) throw new Error(flags.error.message);
  for (const f of flags.data) {
    const no = noOfRecord.get(f.record_id!)!;
    flagsByNo.set(no, [...(flagsByNo.get(no) ?? []), f]);
  }
}, 300_000);
afterAll(() => tmp.cleanup());

const FIELD_CODE: Record<string, string> = {
  laserPower: "laser_power", scanSpeed: "scan_speed", hatchSpacing: "hatch_spacing", layerThickness: "layer_thickness",
  spotDiameter: "spot_diameter", powderD50: "powder_d50", relativeDensity: "relative_density",
};

describe.skipIf(!existsSync(DATASET))("open LPBF relative-density dataset", () => {
  test("every row went in, with its file and row", () => {
    expect(noOfRecord.size).toBe(1579);
    const anyFlag = [...flagsByNo.values()][0]![0]!;
    expect(anyFlag.import_file).toBe("dataset.xlsx");
    expect(anyFlag.import_row).toBe(noOfRecord.get(anyFlag.record_id!));
  });

  test("the 9 repeated rows are exact duplicates of their first occurrence", () => {
    expect(sheet.repeats).toHaveLength(9); // SOURCE.md
    const exact = [...flagsByNo.entries()].flatMap(([no, fs]) => fs.filter((f) => f.code === "duplicate.exact").map((f) => [no, noOfRecord.get(f.related_record_id!)!]));
    const byNo = (a: number[], b: number[]) => a[0]! - b[0]!;
    for (const pair of sheet.repeats) expect(exact).toContainEqual(pair);
    for (const [no] of sheet.repeats) expect(flagsByNo.get(no)!.find((f) => f.code === "duplicate.exact")?.severity).toBe("error");
    // Exactly the rows that repeat another in every column a record keeps: one more pair (1048 and
    // 1053) differs only in the density method, which is an attribute of the source here.
    expect(exact.sort(byNo)).toEqual([...sheet.repeats_stored].sort(byNo));
    expect(sheet.repeats_stored.length - sheet.repeats.length).toBe(1);
  });

  test.each([
    ["layers of 0.35–0.46 mm with speeds near 20 mm/s", (r: SheetRow) => r.layerMm >= 0.35, ["layer_thickness", "scan_speed"]],
    ["hatch spacings up to 0.8 mm", (r: SheetRow) => r.hatchMm > 0.3, ["hatch_spacing"]],
    ["the speed of 10,000 mm/s", (r: SheetRow) => r.speedMmS >= 10_000, ["scan_speed"]],
  ])("the out-of-range group with %s is flagged", (_label, pick, fields) => {
    const group = sheet.rows.filter(pick);
    expect(group.length).toBeGreaterThan(0);
    for (const row of group) {
      const codes = (flagsByNo.get(row.no) ?? []).map((f) => f.code);
      for (const field of fields) {
        expect(codes.some((c) => c === `range.${field}` || c === `unit_slip.${field}`), `row ${row.no}: ${field} in ${codes.join(", ")}`).toBe(true);
      }
    }
  });

  test("every value outside its plausible range is flagged for that field, and no value inside one is", () => {
    for (const row of sheet.rows) {
      const bad = new Set(sheet.out_of_range[String(row.no)] ?? []);
      const flagged = new Set((flagsByNo.get(row.no) ?? []).map((f) => f.code).filter((c) => /^(range|unit_slip)\./.test(c)).map((c) => c.split(".")[1]));
      const expected = new Set([...bad].filter((f) => FIELD_CODE[f]).map((f) => FIELD_CODE[f]));
      expect([...flagged].sort(), `row ${row.no}`).toEqual([...expected].sort());
    }
  });

  test("ordinary rows stay clean", () => {
    const repeats = new Set(sheet.repeats.map(([no]) => no));
    const shared = new Set(sheet.shared);
    const ordinary = sheet.rows.filter((r) => !repeats.has(r.no) && !shared.has(r.no) && !sheet.out_of_range[String(r.no)]);
    expect(ordinary.length).toBeGreaterThan(900);
    const noisy = ordinary.filter((r) => (flagsByNo.get(r.no) ?? []).some((f) => f.severity !== "info")).map((r) => `${r.no}: ${(flagsByNo.get(r.no) ?? []).map((f) => f.code).join(", ")}`);
    expect(noisy).toEqual([]);
  });

  test("same parameters across two studies with the same densities are reported as republished (near duplicates)", () => {
    const near = [...flagsByNo.values()].flat().filter((f) => f.code === "duplicate.near");
    expect(near.length).toBeGreaterThan(0);
    for (const f of near) {
      const a = sheet.rows.find((r) => r.no === noOfRecord.get(f.record_id!))!;
      const b = sheet.rows.find((r) => r.no === noOfRecord.get(f.related_record_id!))!;
      expect(Math.abs(a.rdPct - b.rdPct)).toBeLessThanOrEqual(0.1 + 1e-9);
      expect(a.material).toBe(b.material);
    }
  });
});
