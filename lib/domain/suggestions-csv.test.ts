import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { parseCsvText } from "./csv";
import { SUGGESTION_CAUTION } from "./safety";
import { csvCell, suggestionsCsv, SUGGESTION_CSV_COLUMNS } from "./suggestions-csv";
import type { Suggestion } from "./suggestions";

const suggestion = (index: number, reason: string): Suggestion => ({
  index,
  laserPowerW: 200 + index,
  scanSpeedMmPerS: 900,
  hatchSpacingUm: 100,
  layerThicknessUm: 30,
  volumetricEnergyJMm3: 74.07,
  predictedRegime: "dense",
  criteriaPastThreshold: ["balling_aspect"],
  cell: { powerIndex: 3, speedIndex: 4, powerRangeW: [195, 225], speedRangeMmPerS: [800, 1000], records: 0 },
  reason,
});

describe("csvCell", () => {
  test.each<[string | number, string]>([
    [12, "12"],
    [Number.NaN, ""],
    ["dense", "dense"],
    ["a, b", '"a, b"'],
    ['say "hi"', '"say ""hi"""'],
    ["=1+1", "'=1+1"],
    ["+cmd", "'+cmd"],
    ["-2", "'-2"],
    ["@x", "'@x"],
    ["\tx", "'\tx"],
    ["line\nbreak", '"line\nbreak"'],
  ])("%j -> %j", (value, cell) => {
    expect(csvCell(value)).toBe(cell);
  });
});

describe("suggestionsCsv", () => {
  const text = suggestionsCsv({
    caution: SUGGESTION_CAUTION,
    about: ["Set 3, alloy 316L; seed 1", 'a "quoted" note'],
    alloy: "316L",
    spotDiameterUm: 80,
    suggestions: [suggestion(1, "Cell 195–225 W, thin"), suggestion(2, "=HYPERLINK(evil)")],
  });
  const lines = text.split("\r\n");

  test("the safety caution comes first, one comment line each, then what the set was made from", () => {
    expect(lines.slice(0, SUGGESTION_CAUTION.length)).toEqual(SUGGESTION_CAUTION.map((l) => `# ${l}`));
    expect(lines[0]).toMatch(/Class 4 lasers \(IEC 60825-1\)/);
    expect(lines.join(" ")).toMatch(/NFPA 484/);
    expect(lines[SUGGESTION_CAUTION.length]).toBe("# Set 3; alloy 316L; seed 1");
    expect(lines[SUGGESTION_CAUTION.length + 1]).toBe("# a 'quoted' note");
    expect(lines.filter((l) => l.startsWith("#")).every((l) => !l.includes(",") && !l.includes('"'))).toBe(true);
  });

  test("the table reads back with the project's own CSV reader, formulas defused", () => {
    const body = lines.filter((l) => !l.startsWith("#")).join("\r\n");
    const parsed = parseCsvText(body, ",");
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    expect(parsed.rows[0]).toEqual([...SUGGESTION_CSV_COLUMNS]);
    expect(parsed.rows[1]).toEqual(["1", "316L", "201", "900", "100", "30", "80", "74.07", "dense", "balling_aspect", "195–225", "800–1000", "0", "Cell 195–225 W, thin"]);
    expect(parsed.rows[2]![13]).toBe("'=HYPERLINK(evil)");
  });

  test("any reason text survives the round trip", () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 60 }), (reason) => {
        const csv = suggestionsCsv({ caution: [], about: [], alloy: "316L", spotDiameterUm: 80, suggestions: [suggestion(1, reason)] });
        const parsed = parseCsvText(csv, ",");
        expect(parsed.ok).toBe(true);
        if (!parsed.ok) return;
        const cell = parsed.rows[1]?.[13] ?? "";
        expect(/^[=+\-@\t\r]/.test(reason) ? cell === `'${reason}` : cell === reason).toBe(true);
      }),
      // White space at either end was once lost to the reader's trimming of bare fields.
      { examples: [[" "], [" leading"], ["trailing "]], numRuns: 500 },
    );
  });
});
