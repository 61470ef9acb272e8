import { describe, expect, test } from "vitest";
import { EXPORT_FILE_PATTERN, EXPORT_NAME_PATTERN, exportRequestSchema, requestFromOptions, toExportOptions } from "./export";

describe("exportRequestSchema", () => {
  test("defaults: accepted records, binary at 99 %, all groups, no balancing, source split", () => {
    const o = toExportOptions(exportRequestSchema.parse({}));
    expect(o).toMatchObject({ label: { scheme: "binary", densityThresholdPct: 99 }, balance: { method: "none", k: 5 }, split: { kind: "source", train: 0.7 }, filters: { includeUnreviewed: false, minQuality: null }, seed: 1 });
    expect(o.features).toHaveLength(6);
  });

  test("text as the CLI and a form send it", () => {
    const o = toExportOptions(exportRequestSchema.parse({ label: "multiclass", balance: "smote", k: "3", split: "folds:5", features: "process,meltpool", minQuality: "0.4", includeUnreviewed: "on", alloys: "IN718,316L", sources: "3,1", seed: "42" }));
    expect(o).toMatchObject({ split: { kind: "folds", k: 5 }, features: ["process", "meltpool"], filters: { minQuality: 0.4, includeUnreviewed: true, alloys: ["316L", "IN718"], sourceIds: [1, 3] }, seed: 42 });
  });

  test.each([
    [{ split: "source:0.7,0.2,0.2" }, "split", /sum to 1/],
    [{ features: "process,colour" }, "features.1", /Feature groups/],
    [{ label: "density", balance: "smote" }, "balance", /regression/],
    [{ seed: "-1" }, "seed", /0 to/],
    [{ enteredFrom: "2026-05-01", enteredTo: "2026-04-01" }, "enteredTo", /before/],
    [{ name: "../etc" }, "name", /lower-case/],
  ])("%j is refused at %s", (input, path, message) => {
    const r = exportRequestSchema.safeParse(input);
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues.find((i) => i.path.join(".") === path)?.message).toMatch(message);
  });

  test("options round-trip through a request (re-runs)", () => {
    const o = toExportOptions(exportRequestSchema.parse({ label: "density", split: "source:0.8,0.1,0.1", minQuality: 0.5, seed: 9 }));
    expect(toExportOptions(exportRequestSchema.parse(requestFromOptions(o)))).toEqual(o);
  });

  test.each([["smote-1", true], ["a", true], ["../x", false], ["UPPER", false], [".hidden", false]])("name %s allowed: %s", (name, ok) => {
    expect(EXPORT_NAME_PATTERN.test(name)).toBe(ok);
  });
  test.each([["train.csv", true], ["folds.parquet", true], ["manifest.json", true], ["DATASHEET.md", true], ["../train.csv", false], ["train.csv.bak", false]])("file %s allowed: %s", (file, ok) => {
    expect(EXPORT_FILE_PATTERN.test(file)).toBe(ok);
  });
});
