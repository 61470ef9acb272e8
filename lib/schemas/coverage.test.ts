import { describe, expect, test } from "vitest";
import { fieldErrorsOf } from "./issues";
import { coverageQuerySchema, suggestionRequestSchema } from "./coverage";

describe("coverageQuerySchema", () => {
  test("defaults: all alloys, every status but rejected and merged, k 3, 12 × 12 auto-scaled bins", () => {
    expect(coverageQuerySchema.parse({})).toEqual({
      alloy: null, status: ["draft", "needs_review", "accepted"], hatch: null, layer: null, spot: null, power: null, speed: null,
      windowHatch: null, windowLayer: null, windowSpot: null, k: 3, powerBins: 12, speedBins: 12, powerScale: "auto", speedScale: "auto",
    });
  });

  test.each<[Record<string, string>, Record<string, unknown>]>([
    [{ alloy: "316L", hatch: "80-120um", layer: "30um" }, { alloy: "316L", hatch: { min: 80, max: 120 }, layer: { min: 29, max: 31 } }],
    [{ alloy: "all", spot: "0.05-0.1mm" }, { alloy: null, spot: { min: 50, max: 100 } }],
    [{ power: "50-400W", speed: "0.2-2m/s", k: "5", powerScale: "log" }, { power: { min: 50, max: 400 }, speed: { min: 200, max: 2000 }, k: 5, powerScale: "log" }],
    [{ status: "accepted,accepted" }, { status: ["accepted"] }],
    [{ windowHatch: "0.1mm" }, { windowHatch: 100 }],
  ])("%j", (input, expected) => {
    expect(coverageQuerySchema.parse(input)).toMatchObject(expected);
  });

  test.each<[Record<string, string>, string, RegExp]>([
    [{ hatch: "120-80um" }, "hatch", /above the maximum/],
    [{ power: "-50-400W" }, "power", /greater than 0 W/],
    [{ power: "400W" }, "power", /MIN-MAX/],
    [{ k: "0" }, "k", /at least 1/],
    [{ status: "lost" }, "status.0", /Status is one of/],
    [{ speedScale: "cubic" }, "speedScale", /auto, linear or log/],
  ])("%j is refused at %s", (input, field, message) => {
    const r = coverageQuerySchema.safeParse(input);
    expect(r.success).toBe(false);
    if (!r.success) expect(fieldErrorsOf(r.error)[field]?.join(" ")).toMatch(message);
  });
});

describe("suggestionRequestSchema", () => {
  const ok = { alloy: "316L", n: "12", power: "50-400W", speed: "200-2000mm/s", hatch: "100um", layer: "30um", seed: "1" };

  test("reads the machine limits in any unit", () => {
    expect(suggestionRequestSchema.parse({ ...ok, power: "0.05-0.4kW", hatch: "0.08, 0.1mm" })).toMatchObject({
      alloy: "316L", n: 12, seed: 1, power: { min: 50, max: 400 }, speed: { min: 200, max: 2000 }, hatch: [80, 100], layer: [30], spot: null, k: 3,
    });
  });

  test.each<[Record<string, string | undefined>, string, RegExp]>([
    [{ power: "400-50W" }, "power", /minimum laser power \(400\) is above the maximum \(50\): swap them/],
    [{ power: "-50-400W" }, "power", /greater than 0 W; got -50 W/],
    [{ power: undefined }, "power", /Give the machine's power range/],
    [{ speed: "2000mm/s" }, "speed", /minimum below the maximum/],
    [{ hatch: "" }, "hatch", /Give the hatch spacings/],
    [{ layer: "30, -40um" }, "layer", /greater than 0 µm/],
    [{ n: "0" }, "n", /at least 1/],
    [{ seed: "-1" }, "seed", /0 or more/],
    [{ alloy: "" }, "alloy", /Choose the alloy/],
  ])("%j is refused at %s", (change, field, message) => {
    const r = suggestionRequestSchema.safeParse({ ...ok, ...change });
    expect(r.success).toBe(false);
    if (!r.success) expect(fieldErrorsOf(r.error)[field]?.join(" ")).toMatch(message);
  });

  test("too many hatch × layer combinations", () => {
    const r = suggestionRequestSchema.safeParse({ ...ok, hatch: "60,70,80,90,100,110,120um", layer: "20,30,40,50,60,70um" });
    expect(r.success).toBe(false);
    if (!r.success) expect(fieldErrorsOf(r.error).hatch?.join(" ")).toMatch(/At most 36/);
  });
});
