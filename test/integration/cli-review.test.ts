// `meltledger check` and `meltledger flags` as a script runs them: a real process on a temporary
// database, on both engines. The records are written through the db layer's Prisma functions (either
// engine) with their import file and row and without a check run, so that `meltledger check` is
// what raises the flags.
import { execFile } from "node:child_process";
import path from "node:path";
import { promisify } from "node:util";
import { beforeAll, expect, test } from "vitest";
import { prismaReady } from "@/lib/db/client";
import { findOrCreateMaterial } from "@/lib/db/materials";
import { insertRecord } from "@/lib/db/records";
import { localActor } from "@/lib/server/actor";
import { prepareRecord } from "@/lib/server/record-write";
import { createSource } from "@/lib/server/sources";
import { recordInputSchema } from "@/lib/schemas/record";
import { mixedUnitRecord, sourceInput } from "../support/fixtures";
import type { CliRun } from "../support/cli";
import { describeEachEngine } from "../support/engines";

const run = promisify(execFile);
const BIN = path.resolve(import.meta.dirname, "../../bin/meltledger.mjs");

interface FlagJson { id: number; record_id: number; import_file: string | null; import_row: number | null; code: string; severity: string; message: string; details: Record<string, unknown>; state: string; resolution: string | null; version: number }

describeEachEngine("meltledger check and flags", (current) => {
  const cli = async (...args: string[]): Promise<CliRun> => {
    try {
      const { stdout, stderr } = await run(process.execPath, [BIN, ...args], { env: { ...process.env, DATABASE_URL: current().url }, maxBuffer: 64 * 1024 * 1024 });
      return { code: 0, stdout, stderr };
    } catch (error) {
      const e = error as CliRun;
      return { code: e.code, stdout: e.stdout, stderr: e.stderr };
    }
  };
  const flagsJson = async (...filters: string[]) => {
    const r = await cli("flags", "list", "--json", ...filters);
    expect(r.code, r.stderr).toBe(0);
    return JSON.parse(r.stdout) as FlagJson[];
  };

  let ids: number[] = [];

  beforeAll(async () => {
    const actor = await localActor();
    const s = await createSource(sourceInput(), actor);
    if (!s.ok) throw new Error(s.error.message);
    const rows = [
      mixedUnitRecord(s.data.id, { laserPower: { value: "205", unit: "W" } }), // row 1: clean
      mixedUnitRecord(s.data.id, { laserPower: { value: "215", unit: "W" }, scanSpeed: { value: "0.75", unit: "mm/s" } }), // row 2: unit slip
      mixedUnitRecord(s.data.id, { laserPower: { value: "225", unit: "W" }, hatchSpacing: { value: "0.6", unit: "mm" } }), // row 3: hatch out of range
      mixedUnitRecord(s.data.id, { laserPower: { value: "235", unit: "W" }, layerThickness: { value: "0.3", unit: "mm" } }), // row 4: layer out of range
    ];
    const db = await prismaReady();
    ids = await db.$transaction(async (tx) => {
      const out: number[] = [];
      for (const [i, input] of rows.entries()) {
        const prepared = prepareRecord(recordInputSchema.parse(input));
        if (!prepared.ok) throw new Error(JSON.stringify(prepared.fieldErrors));
        const materialId = await findOrCreateMaterial(tx, prepared.material);
        out.push((await insertRecord(tx, { ...prepared.write, materialId, importFile: "trial-plan.csv", importRow: i + 1 }, actor.id)).id);
      }
      return out;
    });
  });

  test("check --all raises the flags and prints a summary", async () => {
    const r = await cli("check", "--all", "--json");
    expect(r.code, r.stderr).toBe(0);
    const s = JSON.parse(r.stdout);
    expect(s.records).toBe(4);
    expect(s.opened).toBeGreaterThanOrEqual(3);
    expect(s.open_by_code["unit_slip.scan_speed"]).toBe(1);
    const again = JSON.parse((await cli("check", "--all", "--json")).stdout);
    expect([again.opened, again.stale]).toEqual([0, 0]);
  });

  test("flags list --json carries record, import file and row, code, severity, message and details", async () => {
    const all = await flagsJson("--state", "open");
    const slip = all.find((f) => f.code === "unit_slip.scan_speed")!;
    expect(slip).toMatchObject({ record_id: ids[1], import_file: "trial-plan.csv", import_row: 2, severity: "warning" });
    expect(slip.message).toMatch(/m\/s/);
    expect(slip.details.suggestedFix).toMatchObject({ unit: "m/s" });
    expect(all.filter((f) => f.record_id === ids[0])).toEqual([]);
    const ranges = await flagsJson("--code", "range.");
    expect(ranges.length).toBeGreaterThanOrEqual(2);
    expect(ranges.every((f) => f.code.startsWith("range."))).toBe(true);
    const ofRecord = await flagsJson("--record", String(ids[2]));
    expect(ofRecord.every((f) => f.record_id === ids[2])).toBe(true);
  });

  test("flags resolve: waive with a reason, fix with the suggested fix, reject", async () => {
    const [hatch] = await flagsJson("--code", "range.hatch", "--state", "open");
    const waived = await cli("flags", "resolve", String(hatch!.id), "--action", "waive", "--reason", "wide hatch is the topic of the study", "--json");
    expect(waived.code, waived.stderr).toBe(0);
    expect(JSON.parse(waived.stdout)).toMatchObject({ state: "waived", resolution: "waive" });

    const [slip] = await flagsJson("--code", "unit_slip", "--state", "open");
    const fixed = await cli("flags", "resolve", String(slip!.id), "--action", "fix", "--reason", "the table gives m/s", "--json");
    expect(fixed.code, fixed.stderr).toBe(0);
    expect(JSON.parse(fixed.stdout)).toMatchObject({ state: "resolved", resolution: "fix", resolved: true });
    const records = JSON.parse((await cli("records", "list", "--json")).stdout) as { id: number; scan_speed_mm_s: number }[];
    expect(records.find((x) => x.id === ids[1])?.scan_speed_mm_s).toBe(750);

    const [layer] = await flagsJson("--code", "range.layer", "--state", "open");
    const rejected = await cli("flags", "resolve", String(layer!.id), "--action", "reject", "--reason", "layer misread from a figure");
    expect(rejected.code, rejected.stderr).toBe(0);
    expect(rejected.stdout).toMatch(/rejected/);
    expect(await flagsJson("--record", String(ids[3]), "--state", "open")).toEqual([]);
  });

  test.each([
    [["flags", "resolve", "999999", "--action", "waive", "--reason", "no such flag"], /no flag 999999/],
    [["flags", "resolve", "1", "--action", "waive"], /reason/],
    [["flags", "resolve", "1", "--action", "shrug", "--reason", "x"], /--action is waive, fix or reject/],
    [["flags", "resolve", "--action", "waive"], /one flag id/],
    [["flags", "list", "--state", "lost"], /--state is open, resolved or waived/],
    [["flags", "list", "--record", "abc"], /--record takes a record id/],
    [["check", "--record", "x"], /--record takes record ids/],
    [["check", "--settings-version", "999"], /no settings version 999/],
    [["flags"], /Unknown or missing subcommand/],
  ])("bad input %j is a clear message, exit code 2, and changes nothing", async (args, message) => {
    const before = await flagsJson();
    const r = await cli(...args);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(message);
    expect(await flagsJson()).toEqual(before);
  });
});
