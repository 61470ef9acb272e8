// The `meltledger` command as a user runs it: a real process, DATABASE_URL pointing at the test
// database of each engine (a temporary SQLite file, a database on the PostgreSQL test server).
import { execFile } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, expect, test } from "vitest";
import { sql } from "@/lib/db/sql";
import type { CliRun } from "../support/cli";
import { describeEachEngine } from "../support/engines";

const run = promisify(execFile);
const BIN = path.resolve(import.meta.dirname, "../../bin/meltledger.mjs");
const scratch = mkdtempSync(path.join(os.tmpdir(), "meltledger-cli-"));
afterAll(() => rmSync(scratch, { recursive: true, force: true }));

describeEachEngine("meltledger CLI", (current) => {
  /** Runs the command against this block's database; never throws on a non-zero exit. */
  async function cli(...args: string[]): Promise<CliRun> {
    return cliWith({ DATABASE_URL: current().url }, ...args);
  }
  async function cliWith(env: Record<string, string>, ...args: string[]): Promise<CliRun> {
    try {
      const { stdout, stderr } = await run(process.execPath, [BIN, ...args], { env: { ...process.env, ...env }, maxBuffer: 64 * 1024 * 1024 });
      return { code: 0, stdout, stderr };
    } catch (error) {
      const e = error as CliRun;
      return { code: e.code, stdout: e.stdout, stderr: e.stderr };
    }
  }

  test("db migrate is idempotent and names the engine; on a new SQLite file it creates the database", async () => {
    const again = await cli("db", "migrate", "--json");
    expect(again.code).toBe(0);
    expect(JSON.parse(again.stdout)).toMatchObject({ engine: current().engine, applied: [] });
    expect(JSON.parse(again.stdout).alreadyApplied.length).toBeGreaterThan(0);
    if (current().engine === "sqlite") {
      const file = path.join(scratch, "fresh", "meltledger.db");
      const first = await cliWith({ DATABASE_URL: `file:${file}` }, "db", "migrate", "--json");
      expect(JSON.parse(first.stdout).applied.length).toBeGreaterThan(0);
      expect(existsSync(file)).toBe(true);
    }
  });

  test("db seed fills an empty database with the demo scenario, --if-empty skips a full one", async () => {
    const empty = await cli("db", "seed", "--if-empty", "--json");
    expect(empty.code).toBe(0);
    const summary = JSON.parse(empty.stdout);
    expect(summary.skipped).toBe(false);
    expect(summary.sources).toBeGreaterThanOrEqual(8);
    expect(summary.records).toBeGreaterThanOrEqual(2500);
    const counted = await sql().get<{ records: number; flags: number }>(`SELECT (SELECT COUNT(*) FROM "BuildRecord") AS "records", (SELECT COUNT(*) FROM "Flag") AS "flags"`);
    expect(counted?.records).toBe(summary.records);
    // the checks ran on the seeded records: the planted problems are flagged
    expect(counted?.flags).toBeGreaterThan(0);
    const again = await cli("db", "seed", "--if-empty", "--json");
    expect(JSON.parse(again.stdout).skipped).toBe(true);
    const refused = await cli("db", "seed");
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/--reset/);
  }, 180_000);

  test("records list --json prints every match with canonical snake_case keys", async () => {
    const all = await cli("records", "list", "--json");
    expect(all.code).toBe(0);
    const rows = JSON.parse(all.stdout) as Record<string, unknown>[];
    expect(rows.length).toBeGreaterThanOrEqual(2500);
    for (const key of ["laser_power_w", "scan_speed_mm_s", "hatch_spacing_um", "layer_thickness_um", "spot_diameter_um", "relative_density_pct", "outcome", "status", "source_id", "import_row"]) {
      expect(rows[0]).toHaveProperty(key);
    }
    const filtered = await cli("records", "list", "--json", "--alloy", "316L", "--power", "150-250", "--limit", "7");
    const some = JSON.parse(filtered.stdout) as { alloy: string; laser_power_w: number }[];
    expect(some).toHaveLength(7);
    expect(some.every((r) => r.alloy === "316L" && r.laser_power_w >= 150 && r.laser_power_w <= 250)).toBe(true);
  }, 60_000);

  test("sources list --json", async () => {
    const r = await cli("sources", "list", "--json");
    const sources = JSON.parse(r.stdout) as { doi: string | null; record_count: number }[];
    expect(sources.length).toBeGreaterThanOrEqual(8);
    expect(sources.filter((s) => s.doi).every((s) => s.doi!.startsWith("10.5555/"))).toBe(true);
    expect(sources.reduce((n, s) => n + s.record_count, 0)).toBeGreaterThanOrEqual(2500);
  });

  test.each([
    [["records", "list", "--limit", "zero"], /--limit/],
    [["records", "list", "--power", "fast"], /MIN-MAX/],
    [["records", "list", "--status", "lost"], /status/],
    [["records", "list", "--bogus"], /Unknown option/],
    [["frobnicate"], /Unknown command/],
  ])("bad usage %j is a message and exit code 2", async (args, message) => {
    const r = await cli(...args);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(message);
  });

  test("db seed --reset keeps the old SQLite file aside and seeds anew; on PostgreSQL it is refused and nothing changes", async () => {
    const before = await sql().get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "BuildRecord"`);
    const r = await cli("db", "seed", "--reset", "--json");
    if (current().engine === "postgresql") {
      expect(r.code).toBe(2);
      expect(JSON.parse(r.stderr).error).toMatchObject({ code: "conflict", message: expect.stringMatching(/never does.*new, empty database/) });
      expect(await sql().get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "BuildRecord"`)).toEqual(before);
      return;
    }
    expect(r.code).toBe(0);
    const summary = JSON.parse(r.stdout);
    expect(summary.previousDatabase).toBeTruthy();
    expect(existsSync(summary.previousDatabase)).toBe(true);
    expect(readdirSync(path.join(path.dirname(current().url.replace(/^file:/, "")), "previous")).some((f) => f.endsWith(".db"))).toBe(true);
  }, 120_000);
});
