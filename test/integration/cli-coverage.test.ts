// `meltledger coverage` and `meltledger suggest` as a user runs them: real processes on a
// database holding the hand-built coverage collection, on SQLite and on PostgreSQL.
import { mkdtempSync, readFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, test } from "vitest";
import { SUGGESTION_CAUTION } from "@/lib/domain/safety";
import { localActor } from "@/lib/server/actor";
import { coverageFixture, createSourceOrThrow } from "../support/coverage-fixture";
import { cliHere as cli, writeRecordsForTest } from "../support/engine-records";
import { describeEachEngine } from "../support/engines";

const out = mkdtempSync(path.join(os.tmpdir(), "meltledger-cli-coverage-"));

describeEachEngine("coverage on the command line", (current) => {
  beforeAll(async () => {
    const actor = await localActor();
    await writeRecordsForTest(coverageFixture(await createSourceOrThrow(actor)), { actorId: actor.id });
  });

  describe("meltledger coverage", () => {
    test("--json prints the grid, sparse cells, score and record count", async () => {
      const r = await cli("coverage", "--alloy", "316L", "--hatch", "80-120um", "--layer", "30um", "--k", "2", "--power", "100-400W", "--speed", "500-2000mm/s", "--power-bins", "3", "--speed-bins", "3", "--speed-scale", "linear", "--json");
      expect(r.stderr).toBe("");
      expect(r.code).toBe(0);
      const j = JSON.parse(r.stdout);
      expect(j.power_w_edges).toEqual([100, 200, 300, 400]);
      expect(j.speed_mm_s_edges).toEqual([500, 1000, 1500, 2000]);
      expect(j.counts).toEqual([
        [3, 0, 0],
        [1, 1, 0],
        [0, 0, 3],
      ]);
      expect(j.n_records).toBe(9);
      expect(j.sparse_cells).toHaveLength(7);
      expect(j.score).toMatchObject({ k: 2, over: "window" });
      expect(j.score.share === null || (j.score.share >= 0 && j.score.share <= 1)).toBe(true);
    }, 60_000);

    test("an empty selection exits 0 and says why", async () => {
      const r = await cli("coverage", "--alloy", "316L", "--layer", "90um", "--json");
      expect(r.code).toBe(0);
      const j = JSON.parse(r.stdout);
      expect(j).toMatchObject({ n_records: 0, empty: true, counts: [] });
      expect(j.note).toMatch(/No records match/);
    }, 60_000);

    test("bad input exits 2 and names the option", async () => {
      const r = await cli("coverage", "--hatch", "120-80um");
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/hatch: The minimum hatch spacing \(120\) is above the maximum \(80\): swap them/);
    }, 60_000);
  });

  describe("meltledger suggest", () => {
    test("writes the CSV with the caution at its head and prints the caution first", async () => {
      const file = path.join(out, `suggestions-${current().engine}.csv`);
      const r = await cli("suggest", "--alloy", "316L", "--n", "6", "--power", "50-400W", "--speed", "200-2000mm/s", "--hatch", "100um", "--layer", "30um", "--seed", "1", "--out", file);
      expect(r.stderr).toBe("");
      expect(r.code).toBe(0);
      expect(r.stdout.split("\n")[0]).toBe(SUGGESTION_CAUTION[0]);
      expect(r.stdout).toMatch(/not safety-checked/);
      const csv = readFileSync(file, "utf8").split("\r\n");
      expect(csv.slice(0, SUGGESTION_CAUTION.length)).toEqual(SUGGESTION_CAUTION.map((l) => `# ${l}`));
      expect(csv.filter((l) => /^\d+,316L,/.test(l))).toHaveLength(6);
    }, 60_000);

    test("--json: the same seed and inputs give the same suggestions", async () => {
      const args = ["suggest", "--alloy", "316L", "--n", "4", "--power", "50-400W", "--speed", "200-2000mm/s", "--hatch", "100um", "--layer", "30um", "--seed", "5", "--json"];
      const a = JSON.parse((await cli(...args)).stdout);
      const b = JSON.parse((await cli(...args)).stdout);
      expect(a.caution).toEqual([...SUGGESTION_CAUTION]);
      expect(a.suggestions).toHaveLength(4);
      expect(b.suggestions).toEqual(a.suggestions);
      expect(b.id).toBe(a.id + 1);
    }, 60_000);

    test.each([
      [["--power", "400-50W"], /power: The minimum laser power \(400\) is above the maximum \(50\): swap them/],
      [["--power=-50-400W"], /power: Laser power must be greater than 0 W; got -50 W/],
      [["--speed", "2000mm/s"], /speed: Give the machine's speed range as MIN-MAX/],
    ])("impossible limits %j exit 2 with a clear message", async (change, message) => {
      const base: Record<string, string> = { "--alloy": "316L", "--power": "50-400W", "--speed": "200-2000mm/s", "--hatch": "100um", "--layer": "30um" };
      const flag = change[0]!.split("=")[0]!;
      const args = Object.entries(base).flatMap(([k, v]) => (k === flag ? [] : [k, v]));
      const r = await cli("suggest", ...args, ...change);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(message);
    }, 60_000);
  });
});
