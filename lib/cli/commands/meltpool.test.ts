import { describe, expect, test } from "vitest";
import type { CliIo } from "../types";
import { meltpool } from "./meltpool";

function capture(): CliIo & { out: string; err: string } {
  const io = { out: "", err: "", stdout: (t: string) => { io.out += t; }, stderr: (t: string) => { io.err += t; } };
  return io;
}

describe("meltledger meltpool", () => {
  test("--json prints the report with the documented keys", async () => {
    const io = capture();
    const code = await meltpool(["--alloy", "316L", "--power", "200W", "--speed", "800mm/s", "--spot", "80um", "--hatch", "100um", "--layer", "30um", "--json"], io);
    expect(code).toBe(0);
    expect(io.err).toBe("");
    const report = JSON.parse(io.out) as Record<string, unknown>;
    for (const key of ["width_um", "depth_um", "length_um", "peak_temperature_k", "normalized_enthalpy", "energy_density_j_mm3", "criteria", "regime", "properties_source"]) {
      expect(report).toHaveProperty(key);
    }
    const criteria = report.criteria as { name: string; value: number | null; threshold: number; margin: number | null; fired: boolean }[];
    expect(criteria[0]).toMatchObject({ name: "lack_of_fusion_depth" });
    expect(criteria.every((c) => "value" in c && "threshold" in c && "margin" in c && typeof c.fired === "boolean")).toBe(true);
  });

  test("--spot-definition fwhm and --method direct are passed through", async () => {
    const a = capture();
    const b = capture();
    await meltpool(["--alloy", "316L", "--power", "200W", "--speed", "800mm/s", "--spot", "50um", "--spot-definition", "fwhm", "--json"], a);
    await meltpool(["--alloy", "316L", "--power", "200W", "--speed", "800mm/s", "--spot", "84.93um", "--method", "direct", "--json"], b);
    const ra = JSON.parse(a.out) as { width_um: number; method: string };
    const rb = JSON.parse(b.out) as { width_um: number; method: string };
    expect(rb.method).toBe("direct");
    expect(Math.abs(ra.width_um / rb.width_um - 1)).toBeLessThan(0.01);
  });

  test("with every property flag no alloy is needed", async () => {
    const io = capture();
    const code = await meltpool(["--power", "200W", "--speed", "800mm/s", "--spot", "80um", "--absorptivity", "0.35", "--density", "7900", "--cp", "500", "--k", "20", "--t-melt", "1700", "--t-boil", "3090", "--t0", "300", "--json"], io);
    expect(code).toBe(0);
    expect((JSON.parse(io.out) as { properties_source: { basis: string } }).properties_source.basis).toBe("overrides");
  });

  test("without --json a short table is printed", async () => {
    const io = capture();
    expect(await meltpool(["--alloy", "Ti64", "--power", "280W", "--speed", "1.2m/s", "--spot", "70um"], io)).toBe(0);
    expect(io.out).toMatch(/melt pool\s+width [\d.]+ µm, depth [\d.]+ µm, length [\d.]+ µm/);
    expect(io.out).toMatch(/regime/);
  });

  test.each([
    [["--power", "0W", "--speed", "800mm/s", "--spot", "80um", "--alloy", "316L"], /power/],
    [["--power", "200W", "--speed", "800mm/s", "--alloy", "316L"], /spot/],
    [["--power", "200W", "--speed", "800mm/s", "--spot", "80um"], /without --alloy/],
    [["--power", "200W", "--bogus"], /Unknown option|bogus/],
    [["--power", "200W", "--speed", "800mm/s", "--spot", "80um", "--alloy", "Xx-5Qq"], /alloy/],
  ])("bad input %j goes to stderr with exit code 2", async (argv, message) => {
    const io = capture();
    expect(await meltpool(argv, io)).toBe(2);
    expect(io.out).toBe("");
    expect(io.err).toMatch(message);
  });

  test("errors are JSON on stderr with --json", async () => {
    const io = capture();
    expect(await meltpool(["--power=-1W", "--speed", "800mm/s", "--spot", "80um", "--alloy", "316L", "--json"], io)).toBe(2);
    expect((JSON.parse(io.err) as { error: { code: string } }).error.code).toBe("invalid_input");
  });
});
