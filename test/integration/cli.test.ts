// The `meltledger` command as a user runs it: a real process, DATABASE_URL pointing at a
// temporary file.
import { existsSync, readdirSync } from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, test } from "vitest";
import { cliFor } from "../support/cli";
import { useTempDatabase } from "../support/temp-db";

const tmp = useTempDatabase("cli");
const cli = cliFor(tmp.filePath);


afterAll(() => tmp.cleanup());

describe("meltledger CLI", () => {
  test("db migrate creates the database and is idempotent", async () => {
    const first = await cli("db", "migrate", "--json");
    expect(first.code).toBe(0);
    expect(JSON.parse(first.stdout).applied.length).toBeGreaterThan(0);
    const second = await cli("db", "migrate", "--json");
    expect(JSON.parse(second.stdout).applied).toEqual([]);
  });

  test("db seed fills an empty database with the demo scenario, --if-empty skips a full one", async () => {
    const r = await cli("db", "seed", "--json");
    expect(r.code).toBe(0);
    const summary = JSON.parse(r.stdout);
    expect(summary.sources).toBeGreaterThanOrEqual(8);
    expect(summary.records).toBeGreaterThanOrEqual(2500);
    const again = await cli("db", "seed", "--if-empty", "--json");
    expect(JSON.parse(again.stdout).skipped).toBe(true);
    const refused = await cli("db", "seed");
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/--reset/);
  }, 120_000);

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

  test("db seed --reset keeps the old database aside and seeds anew", async () => {
    const r = await cli("db", "seed", "--reset", "--json");
    expect(r.code).toBe(0);
    const summary = JSON.parse(r.stdout);
    expect(summary.previousDatabase).toBeTruthy();
    expect(existsSync(summary.previousDatabase)).toBe(true);
    expect(readdirSync(path.join(tmp.dir, "previous")).some((f) => f.endsWith(".db"))).toBe(true);
  }, 120_000);
});
