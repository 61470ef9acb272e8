// Training-set export through the server layer and the `meltledger export` command, on SQLite
// and on PostgreSQL with the same invented records: the same records give byte-identical files on
// both engines.
import { createHash } from "node:crypto";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { parse } from "csv-parse/sync";
import { beforeAll, describe, expect, test } from "vitest";
import type { DatabaseEngine } from "@/lib/db/location";
import { sql } from "@/lib/db/sql";
import { createPrng } from "@/lib/domain/prng";
import { localActor } from "@/lib/server/actor";
import { createExport, exportsDir, getExport, listExports, openExportFile, previewExport, rerunExport } from "@/lib/server/exports";
import { createSource } from "@/lib/server/sources";
import { acceptAllForTest, cliHere, writeRecordsForTest } from "../support/engine-records";
import { describeEachEngine } from "../support/engines";
import { mixedUnitRecord, sourceInput } from "../support/fixtures";

// On PostgreSQL the data folder (and so the exports) is MELTLEDGER_FILES_DIR; SQLite keeps it beside its file.
process.env.MELTLEDGER_FILES_DIR = mkdtempSync(path.join(os.tmpdir(), "meltledger-export-files-"));
const out = mkdtempSync(path.join(os.tmpdir(), "meltledger-export-out-"));
const sha = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");
const folderHashes = (dir: string) => Object.fromEntries(readdirSync(dir).sort().map((f) => [f, sha(readFileSync(path.join(dir, f)))]));
/** The hashes of every file each engine wrote, by what wrote them. */
const hashes = new Map<DatabaseEngine, Record<string, Record<string, string>>>();

const ALLOYS = ["316L", "IN718"];

describeEachEngine("training-set export", (current) => {
  let recordCount = 0;
  const engineOut = (name: string) => path.join(out, current().engine, name);

  beforeAll(async () => {
    const actor = await localActor();
    const sourceIds: number[] = [];
    for (let i = 0; i < 8; i++) {
      const s = await createSource(sourceInput({ title: `Export study ${i}`, doi: `10.5555/export.it.${i}`, year: 2016 + i }), actor);
      if (!s.ok) throw new Error(s.error.message);
      sourceIds.push(s.data.id);
    }
    const rng = createPrng(12);
    const inputs = Array.from({ length: 480 }, (_, i) => {
      const p = rng.float(120, 380);
      const v = rng.float(400, 1800);
      const ev = p / (v * 0.1 * 0.03);
      const dense = ev > 45 && ev < 110;
      return mixedUnitRecord(sourceIds[i % sourceIds.length]!, {
        alloy: ALLOYS[i % 2]!,
        laserPower: { value: p.toFixed(1), unit: "W" },
        scanSpeed: { value: v.toFixed(0), unit: "mm/s" },
        spotDiameter: i % 7 === 0 ? undefined : { value: "80", unit: "um" },
        outcome: dense ? "dense" : ev <= 45 ? "lack_of_fusion" : "keyhole",
        relativeDensity: { value: (dense ? rng.float(99, 99.9) : rng.float(92, 98.5)).toFixed(2), unit: "%" },
      });
    });
    recordCount = (await writeRecordsForTest(inputs, { actorId: actor.id })).length;
  }, 120_000);

  describe("export use cases", () => {
    test("records awaiting review are not exported by default: a clear message and nothing written", async () => {
      const r = await createExport({ seed: 3 }, await localActor());
      expect(r.ok).toBe(false);
      if (!r.ok) {
        expect(r.error.code).toBe("invalid_input");
        expect(r.error.message).toMatch(new RegExp(`${recordCount} by status`));
        expect(r.error.message).toMatch(/Nothing was written/);
      }
      const p = await previewExport({ seed: 3, includeUnreviewed: true });
      expect(p.ok).toBe(true);
    });

    test("accepted records export; a re-run gives byte-identical files", async () => {
      expect(await acceptAllForTest()).toBe(recordCount);
      const actor = await localActor();
      const first = await createExport({ name: "binary-smote", balance: "smote", k: 3, seed: 5 }, actor);
      if (!first.ok) throw new Error(first.error.message);
      expect(first.data.files.map((f) => f.name)).toEqual(["train.csv", "validation.csv", "test.csv", "train.parquet", "validation.parquet", "test.parquet", "DATASHEET.md", "manifest.json"]);
      expect(readdirSync(first.data.folder).sort()).toEqual(first.data.files.map((f) => f.name).sort());
      // the hashes recorded with the run are those of the files on disk
      expect(Object.fromEntries(first.data.files.map((f) => [f.name, f.sha256]))).toEqual(folderHashes(first.data.folder));
      hashes.set(current().engine, { ...hashes.get(current().engine), "binary-smote": folderHashes(first.data.folder) });
      const again = await rerunExport("binary-smote", actor);
      if (!again.ok) throw new Error(again.error.message);
      expect(again.data.name).toBe("binary-smote-rerun");
      expect(again.data.identical).toBe(true);
      const file = await openExportFile("binary-smote", "train.csv");
      expect(file.ok).toBe(true);
      if (file.ok) expect(file.data.sha256).toBe(sha(readFileSync(file.data.path)));
    });

    test("a name already taken is a conflict; nothing more is recorded", async () => {
      const before = (await listExports()).ok;
      const r = await createExport({ name: "binary-smote", seed: 5 }, await localActor());
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.error.code).toBe("conflict");
      const runs = await listExports();
      expect(before && runs.ok && runs.data.map((x) => x.name)).toEqual(["binary-smote-rerun", "binary-smote"]);
    });

    test("a folder of the chosen name that is not a recorded run is left as it is, and the export is not recorded", async () => {
      const foreign = path.join(exportsDir(), "left-alone");
      mkdirSync(foreign, { recursive: true });
      writeFileSync(path.join(foreign, "note.txt"), "not an export");
      const r = await createExport({ name: "left-alone", seed: 5 }, await localActor());
      expect(r.ok).toBe(false);
      expect(readFileSync(path.join(foreign, "note.txt"), "utf8")).toBe("not an export");
      expect(readdirSync(foreign)).toEqual(["note.txt"]);
      expect((await getExport("left-alone")).ok).toBe(false);
      expect(readdirSync(exportsDir()).filter((f) => f.startsWith(".staging"))).toEqual([]);
    });

    test("a saved run reads back with its request, counts and canonical time; its audit event is written with it", async () => {
      const r = await getExport("binary-smote");
      if (!r.ok) throw new Error(r.error.message);
      expect(r.data.createdAt).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
      expect(r.data.request).toMatchObject({ balance: "smote", k: 3, seed: 5 });
      expect(r.data.files.map((f) => f.name)).toContain("manifest.json");
      expect((r.data.counts as { labelled: number }).labelled).toBe(recordCount);
      const events = await sql().all<{ entityId: string; after: string }>(`SELECT "entityId" AS "entityId", "after" FROM "AuditEvent" WHERE "action" = 'export' ORDER BY "id"`);
      expect(events).toHaveLength(2);
      expect(JSON.parse(events[0]!.after)).toMatchObject({ name: "binary-smote", seed: 5, labelled: recordCount });
    });

    test.each([["../binary-smote", "train.csv"], ["binary-smote", "../../meltledger.db"], ["binary-smote", "train.csv%00"], ["nope", "train.csv"]])("%s/%s is not served", async (name, file) => {
      const r = await openExportFile(name, file);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.error.code).toBe("not_found");
    });
  });

  describe("meltledger export", () => {
    const cli = cliHere;
    // folders of this engine's block (its database is ready from the block's hooks on)
    let dirA = "";
    let dirB = "";
    beforeAll(() => {
      dirA = engineOut("a");
      dirB = engineOut("b");
    });

    test("writes the files to --out; the same options and seed give identical bytes", async () => {
      const args = ["export", "--label", "binary", "--density-threshold", "99", "--balance", "smote", "--k", "3", "--split", "source:0.7,0.15,0.15", "--seed", "11", "--json"];
      const a = await cli(...args, "--out", dirA);
      expect(a.code, a.stderr).toBe(0);
      const b = await cli(...args, "--out", dirB);
      expect(b.code, b.stderr).toBe(0);
      for (const f of readdirSync(dirA)) expect(readFileSync(path.join(dirB, f)).equals(readFileSync(path.join(dirA, f))), f).toBe(true);
      hashes.set(current().engine, { ...hashes.get(current().engine), "--out": folderHashes(dirA) });
      const summary = JSON.parse(a.stdout);
      expect(summary.name).toBe("binary-smote-source-seed11");
      expect(JSON.parse(b.stdout).name).toBe("binary-smote-source-seed11-2");
    }, 120_000);

    test("columns, marks and rules in the CSV files", () => {
      const tables = Object.fromEntries(["train", "validation", "test"].map((s) => [s, parse(readFileSync(path.join(dirA, `${s}.csv`)), { columns: true }) as Record<string, string>[]]));
      const header = Object.keys(tables.train![0]!);
      for (const c of ["record_id", "source_id", "split", "is_synthetic", "label", "laser_power_w", "scan_speed_mm_s", "volumetric_energy_density_j_mm3", "meltpool_width_um", "mix_density_kg_m3", "fe_wt_pct"]) expect(header).toContain(c);
      const sourceSplit = new Map<string, string>();
      let real = 0;
      for (const [split, rows] of Object.entries(tables)) {
        for (const r of rows) {
          expect(r.split).toBe(split);
          if (r.is_synthetic === "1") {
            expect(split).toBe("train");
            expect(r.record_id).toBe("");
            continue;
          }
          real += 1;
          expect(sourceSplit.get(r.source_id!) ?? split).toBe(split);
          sourceSplit.set(r.source_id!, split);
        }
      }
      // nothing real is dropped: every accepted record has a label here (outcome given, density given)
      expect(real).toBe(recordCount);
      const manifest = JSON.parse(readFileSync(path.join(dirA, "manifest.json"), "utf8"));
      expect(manifest.counts.after_balancing.train.success).toBe(manifest.counts.after_balancing.train.failure);
      expect(manifest.missing_values_filled.find((f: { field: string }) => f.field === "spotDiameterUm").missing).toBeGreaterThan(0);
      expect(readFileSync(path.join(dirA, "DATASHEET.md"), "utf8")).toContain("https://doi.org/10.5555/export.it.0");
    });

    test("folds: one folds.csv with a fold column", async () => {
      const dir = engineOut("folds");
      const r = await cli("export", "--label", "multiclass", "--balance", "none", "--split", "folds:4", "--features", "process,energy", "--seed", "2", "--out", dir);
      expect(r.code, r.stderr).toBe(0);
      expect(readdirSync(dir).sort()).toEqual(["DATASHEET.md", "folds.csv", "folds.parquet", "manifest.json"]);
      const header = readFileSync(path.join(dir, "folds.csv"), "utf8").split("\n")[0]!.split(",");
      expect(header).toContain("fold");
      expect(header).not.toContain("meltpool_width_um");
    });

    test.each([
      [["--alloy", "CuCrZr"], /No record is left/],
      [["--split", "source:0.6,0.3,0.3"], /sum to 1/],
      [["--balance", "smote", "--k", "50", "--alloy", "316L", "--source", "1"], /needs at least 51 real rows/],
      [["--label", "density", "--balance", "smote"], /regression/],
    ])("bad input %j: a clear message, exit 2, nothing written", async (extra, message) => {
      const dir = engineOut(`bad-${Math.random().toString(36).slice(2)}`);
      const r = await cli("export", "--seed", "1", "--out", dir, ...extra);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(existsSync(dir)).toBe(false);
    }, 60_000);

    test("--seed and --out are required", async () => {
      const r = await cli("export", "--label", "binary");
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/--seed and --out are required/);
    });
  });

  test("the same records give the same bytes on both engines", () => {
    const mine = hashes.get(current().engine);
    expect(Object.keys(mine?.["binary-smote"] ?? {})).toHaveLength(8);
    expect(Object.keys(mine?.["--out"] ?? {})).toHaveLength(8);
    // the PostgreSQL block runs after the SQLite one and compares with what it wrote
    if (current().engine === "postgresql") expect(mine).toEqual(hashes.get("sqlite"));
  });
});
