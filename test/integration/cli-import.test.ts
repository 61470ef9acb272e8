// `meltledger import` as a user runs it: a real process on a temporary database, SQLite or PostgreSQL.
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, expect, test } from "vitest";
import { sql } from "@/lib/db/sql";
import { cliFor, type CliRun } from "../support/cli";
import { describeEachEngine } from "../support/engines";

const DATASET = path.resolve(import.meta.dirname, "../../../shared/datasets/lpbf-relative-density-2025/dataset.xlsx");
const work = mkdtempSync(path.join(os.tmpdir(), "meltledger-cli-import-"));

function file(name: string, text: string): string {
  const p = path.join(work, name);
  writeFileSync(p, text);
  return p;
}

// what the command wrote, read in this process from the same database
const recordCount = async () => (await sql().get<{ n: number }>(`SELECT COUNT(*) AS n FROM "BuildRecord"`))!.n;
const storedFileCount = async () => (await sql().get<{ n: number }>(`SELECT COUNT(*) AS n FROM "StoredFile"`))!.n;

afterAll(() => rmSync(work, { recursive: true, force: true }));

describeEachEngine("meltledger import", (current) => {
  let cli: (...args: string[]) => Promise<CliRun>;
  beforeAll(async () => {
    const at = current();
    cli = cliFor(at.engine === "sqlite" ? at.url.replace(/^file:/, "") : at.url);
    // already migrated: the command finds nothing to do on either engine
    expect((await cli("db", "migrate")).code).toBe(0);
  });

  test("the open dataset's workbook: every row, with its row number, sources from the DOI column", async () => {
    const r = await cli("import", DATASET, "--sheet", "data", "--json");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out).toMatchObject({ imported: 1579, excluded: 0, errors: [], unmapped: ["No.", "Density Measurement Method", "Printed Geom.", "Geometric Factor"] });
    expect(out.records).toHaveLength(1579);
    expect(out.records[0]).toEqual({ row: 1, id: expect.any(Number) });
    const sources = JSON.parse((await cli("sources", "list", "--json")).stdout) as { doi: string | null }[];
    expect(sources.some((s) => s.doi === "10.1016/j.msea.2019.138455")).toBe(true);
    expect(sources.every((s) => s.doi === null || (s.doi === s.doi.toLowerCase() && s.doi.startsWith("10.")))).toBe(true);
    expect(await storedFileCount()).toBe(1);
    const records = JSON.parse((await cli("records", "list", "--json", "--limit", "1")).stdout);
    expect(records[0]).toMatchObject({ hatch_spacing_um: 114, layer_thickness_um: 50, import_row: 1 });
  }, 120_000);

  test("rows with errors: nothing written, every problem listed, exit 2; --exclude-errors writes the rest", async () => {
    const csv = file("errors.csv", "Alloy;Power (W);Speed (mm/s)\n316L;200;800\n316L;-3;800\nIN718;250;oops\n");
    const before = await recordCount();
    const refused = await cli("import", csv, "--source-doi", "10.5555/cli.import", "--json");
    expect(refused.code).toBe(2);
    const out = JSON.parse(refused.stdout);
    expect(out.imported).toBe(0);
    expect(out.errors.map((e: { row: number; field: string }) => [e.row, e.field])).toEqual([[2, "laserPower"], [3, "scanSpeed"]]);
    expect(await recordCount()).toBe(before);

    const dry = JSON.parse((await cli("import", csv, "--source-doi", "10.5555/cli.import", "--exclude-errors", "--dry-run", "--json")).stdout);
    expect(dry).toMatchObject({ imported: 1, excluded: 2, records: [] });
    expect(await recordCount()).toBe(before);

    const kept = await cli("import", csv, "--source-doi", "10.5555/cli.import", "--exclude-errors", "--json");
    expect(kept.code).toBe(0);
    expect(JSON.parse(kept.stdout)).toMatchObject({ imported: 1, excluded: 2, records: [{ row: 1, id: expect.any(Number) }] });
    expect(await recordCount()).toBe(before + 1);
  }, 60_000);

  test("a mapping file names columns the headers do not", async () => {
    const csv = file("lab.csv", "Werkstoff,Leistung,Geschwindigkeit,Bemerkung\nAlSi10Mg,350,1.3,x\n");
    const mapping = file("mapping.json", JSON.stringify({ columns: { Werkstoff: { field: "alloy" }, Leistung: { field: "laserPower", unit: "W" }, Geschwindigkeit: { field: "scanSpeed", unit: "m/s" } } }));
    const r = await cli("import", csv, "--mapping", mapping, "--source-doi", "10.5555/cli.import", "--json");
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout)).toMatchObject({ imported: 1, unmapped: ["Bemerkung"] });
  }, 60_000);

  test.each([
    ["a file that is not what it claims", ["fake.xlsx", "Alloy,P\n316L,200\n"], /not an XLSX workbook/],
    ["an empty file", ["empty.csv", ""], /empty/],
    ["no header", ["nohead.csv", "316L,200,800\n316L,250,900\n"], /no header/],
    ["a column mapped twice", ["twice.csv", "Alloy,P (W),Laser power (kW),v (mm/s)\n316L,200,0.2,800\n"], /mapped from two columns/],
    ["a unit that cannot apply", ["unit.csv", "Alloy,Power (mm),v (mm/s)\n316L,200,800\n"], /cannot apply to laser power/],
  ])("%s: exit 2, a message with row and field, nothing written", async (_label, [name, text], message) => {
    const before = await recordCount();
    const storedBefore = await storedFileCount();
    const r = await cli("import", file(name!, text!), "--source-doi", "10.5555/cli.import", "--json");
    expect(r.code).toBe(2);
    const out = JSON.parse(r.stdout);
    expect(out.imported).toBe(0);
    expect(out.errors[0]).toMatchObject({ row: expect.any(Number), field: expect.any(String), message: expect.stringMatching(message) });
    expect(await recordCount()).toBe(before);
    expect(await storedFileCount()).toBe(storedBefore);
  }, 60_000);

  test("bad usage exits 2 with the usage line", async () => {
    const r = await cli("import", "--source-id", "1", "--source-doi", "10.5555/x", "a.csv");
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/not both/);
  });
});
